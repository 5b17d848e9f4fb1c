/**
 * The package manifest: runtime dependencies are exactly the packages the
 * program (src/) imports, benchmark- and test-only packages are devDependencies,
 * and a pack holds the compiled program and its entry points, nothing else.
 */
import { describe, it, expect } from 'vitest';
import { execFileSync } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { builtinModules } from 'node:module';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as {
  main: string;
  types: string;
  bin: Record<string, string>;
  exports: Record<string, unknown>;
  files: string[];
  dependencies: Record<string, string>;
  devDependencies: Record<string, string>;
};

function tsFiles(dir: string): string[] {
  return readdirSync(join(root, dir), { withFileTypes: true, recursive: true })
    .filter((e) => e.isFile() && e.name.endsWith('.ts'))
    .map((e) => join(e.parentPath, e.name));
}

/** Packages a file loads: import/export … from, import(), require(), require.resolve(), createRequire(…)(…). */
function importedPackages(files: string[]): Set<string> {
  const found = new Set<string>();
  const spec = /(?:\bfrom\s+|\bimport\s*\(\s*|\brequire(?:\.resolve)?\s*\(\s*|\bcreateRequire\([^)]*\)\s*\(\s*)'([^'.\/][^']*)'/g;
  for (const f of files) {
    for (const m of readFileSync(f, 'utf8').matchAll(spec)) {
      const id = m[1];
      if (id.startsWith('node:') || builtinModules.includes(id)) continue;
      const parts = id.split('/');
      found.add(id.startsWith('@') ? parts.slice(0, 2).join('/') : parts[0]);
    }
  }
  return found;
}

describe('package.json', () => {
  it('lists as dependencies exactly what src/ loads, and everything bench/ and test/ load besides as devDependencies', () => {
    const runtime = importedPackages(tsFiles('src'));
    expect([...runtime].sort()).toEqual(Object.keys(pkg.dependencies).sort());
    const devOnly = importedPackages([...tsFiles('bench'), ...tsFiles('test')]);
    for (const name of devOnly) {
      if (runtime.has(name)) continue;
      expect(pkg.devDependencies[name], `${name} (imported by bench/ or test/ only)`).toBeDefined();
    }
    // The three the benchmark compares against (bench/noise.ts) must not be installed for users.
    for (const name of ['seedrandom', 'fft-js', 'pure-rand']) expect(pkg.dependencies[name], name).toBeUndefined();
  });

  it('exports the compiled library root only', () => {
    expect(pkg.exports['.']).toEqual({ types: `./${pkg.types}`, import: `./${pkg.main}` });
  });

  it('packs the compiled program, its command and the README, and no sources, tests, benchmarks or source maps', () => {
    // npm lists what a pack would hold from `files` (without --ignore-scripts, pack would rebuild dist/ first).
    const out = execFileSync(process.platform === 'win32' ? 'npm.cmd' : 'npm', ['pack', '--dry-run', '--json', '--ignore-scripts'], { cwd: root, encoding: 'utf8' });
    const paths = (JSON.parse(out) as Array<{ files: Array<{ path: string }> }>)[0].files.map((f) => f.path);
    for (const needed of ['package.json', 'README.md', pkg.bin.moonsieve, pkg.main, pkg.types, 'dist/src/app/sweep/worker.js', 'dist/src/sweep/runCell.js']) {
      expect(paths, needed).toContain(needed);
    }
    const stray = paths.filter((p) => !/^(dist\/src\/.*\.(js|d\.ts)|bin\/[^/]+\.js|schemas\/.*|README\.md|LICENSE|package\.json)$/.test(p) || p.startsWith('dist/src/docs/'));
    expect(stray).toEqual([]);
  });
});
