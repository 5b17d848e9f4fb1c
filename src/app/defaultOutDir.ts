/** Default output folders: `reports/<scenario name as a file-safe slug>/`. */
import { join } from 'node:path';

export function slugify(name: string): string {
  const slug = name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 80);
  return slug || 'scenario';
}

export function defaultOutDir(scenarioName: string): string {
  return join('reports', slugify(scenarioName));
}
