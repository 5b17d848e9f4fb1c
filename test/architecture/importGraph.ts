// The import graph of src/: every relative import (static, `import type`,
// `export … from` and dynamic imports) of every src/**/*.ts file,
// resolved to the file it names. Used by layers.test.ts.
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, normalize, relative, sep } from 'node:path';

export interface ImportEdge {
  from: string; // path relative to src/, with forward slashes
  to: string;
}

function listTs(dir: string, out: string[]): string[] {
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) listTs(path, out);
    else if (entry.name.endsWith('.ts')) out.push(path);
  }
  return out;
}

const IMPORT_RE = /(?:^|[\s;])(?:import|export)\s+(?:type\s+)?(?:[^'";]*?\sfrom\s*)?['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)/g;

/** Removes comments so that an example in a comment is not read as an import. */
function stripComments(text: string): string {
  return text.replace(/\/\*[\s\S]*?\*\//g, '').replace(/(^|[^:'"`])\/\/.*$/gm, '$1');
}

export interface ImportGraph {
  files: string[];
  /** Imports of files under src/. */
  edges: ImportEdge[];
  /** Imports of packages and Node built-ins ('node:fs', 'yaml', …), with the specifier in `to`. */
  packages: ImportEdge[];
}

export function readImportGraph(srcDir: string): ImportGraph {
  const files = listTs(srcDir, []).map((p) => relative(srcDir, p).split(sep).join('/')).sort();
  const known = new Set(files);
  const edges: ImportEdge[] = [];
  const packages: ImportEdge[] = [];
  for (const file of files) {
    const text = stripComments(readFileSync(join(srcDir, file), 'utf8'));
    for (const m of text.matchAll(IMPORT_RE)) {
      const spec = m[1] ?? m[2];
      if (!spec.startsWith('.')) {
        packages.push({ from: file, to: spec });
        continue;
      }
      const to = normalize(join(dirname(file), spec)).split(sep).join('/').replace(/\.js$/, '.ts');
      if (!known.has(to)) throw new Error(`${file} imports ${spec}, which is not a file under src/`);
      edges.push({ from: file, to });
    }
  }
  return { files, edges, packages };
}

/** Strongly connected components with more than one file, or a file importing itself (Tarjan 1972, SIAM J. Comput. 1, 146). */
export function importCycles(files: string[], edges: ImportEdge[]): string[][] {
  const next = new Map<string, string[]>(files.map((f) => [f, []]));
  for (const e of edges) next.get(e.from)!.push(e.to);
  let counter = 0;
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const cycles: string[][] = [];
  const visit = (v: string): void => {
    index.set(v, counter);
    low.set(v, counter);
    counter++;
    stack.push(v);
    onStack.add(v);
    for (const w of next.get(v)!) {
      if (!index.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) {
        low.set(v, Math.min(low.get(v)!, index.get(w)!));
      }
    }
    if (low.get(v) === index.get(v)) {
      const component: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        onStack.delete(w);
        component.push(w);
      } while (w !== v);
      if (component.length > 1 || next.get(v)!.includes(v)) cycles.push(component.sort());
    }
  };
  for (const f of files) if (!index.has(f)) visit(f);
  return cycles.sort((a, b) => a[0].localeCompare(b[0]));
}
