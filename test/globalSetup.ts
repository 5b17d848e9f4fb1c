/**
 * Builds dist/ once before the tests: the sweep's worker threads run the
 * compiled JavaScript (worker pools cannot load .ts files).
 */
import { execFileSync } from 'node:child_process';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export default function setup(): void {
  const root = join(dirname(fileURLToPath(import.meta.url)), '..');
  const require = createRequire(import.meta.url);
  const tsc = require.resolve('typescript/bin/tsc');
  try {
    execFileSync(process.execPath, [tsc, '-p', join(root, 'tsconfig.build.json')], { cwd: root, stdio: 'pipe' });
  } catch (e) {
    // Type errors still emit JavaScript; `npm run build` (and `npm ci`) fail on them, so CI catches them there.
    const out = (e as { stdout?: Buffer }).stdout?.toString() ?? String(e);
    process.stderr.write(`globalSetup: tsc reported errors (dist/ was still written):\n${out}\n`);
  }
}
