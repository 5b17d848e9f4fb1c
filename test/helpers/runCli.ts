/**
 * `moonsieve ARGS` in this process, as the tests run the CLI: its exit code and what it wrote to
 * stdout and stderr (main's io), collected as text.
 */
import { main } from '../../src/cli/main.js';

export function runCli(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const io = { out: (t: string) => { out += t; }, err: (t: string) => { err += t; } };
  return main(['node', 'moonsieve', ...args], io).then((code) => ({ code, out, err }));
}
