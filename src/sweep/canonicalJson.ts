/**
 * Canonical JSON (object keys sorted, no whitespace) and the scenario hash
 * built on it, so that the same scenario written with its keys in another
 * order, or re-indented, hashes the same.
 */
import { createHash } from 'node:crypto';

/** JSON text with object keys sorted at every level; undefined members dropped as JSON.stringify does. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortKeys(value));
}

function sortKeys(v: unknown): unknown {
  if (v === null || typeof v !== 'object') return v;
  if (v instanceof Date) return v.toISOString();
  if (Array.isArray(v)) return v.map(sortKeys);
  const out: Record<string, unknown> = {};
  for (const k of Object.keys(v as Record<string, unknown>).sort()) out[k] = sortKeys((v as Record<string, unknown>)[k]);
  return out;
}

/** sha256 (hex) of the canonical JSON of a scenario document (plain values parsed from YAML). */
export function scenarioHash(doc: unknown): string {
  return createHash('sha256').update(canonicalJson(doc)).digest('hex');
}
