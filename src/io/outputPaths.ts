/**
 * Checks of output paths given on the command line (`--out DIR`, `--html FILE`),
 * made before any work starts, so that a run never computes for minutes and
 * then fails to write, or writes somewhere unexpected. Nothing is left behind:
 * the only write is a probe folder made and removed at once in the deepest
 * existing folder (permissions alone do not tell, e.g. for root or on /proc).
 */
import { accessSync, constants, mkdtempSync, rmdirSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { InputError } from '../scenario/errors.js';

type Kind = 'dir' | 'file' | 'missing' | 'notdir' | { error: string };

function kindOf(path: string): Kind {
  try {
    return statSync(path).isDirectory() ? 'dir' : 'file';
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') return 'missing';
    if (code === 'ENOTDIR') return 'notdir'; // a component of the path is a file
    return { error: code ?? String(e) };
  }
}

/** The deepest existing folder on the way to `abs`, or why there is none. */
function nearestExisting(abs: string): { dir: string } | { problem: string } {
  let p = abs;
  for (;;) {
    const k = kindOf(p);
    if (k === 'dir') return { dir: p };
    if (k === 'file') return { problem: `${p} is a file, so no folder can be made under it` };
    if (typeof k === 'object') return { problem: `cannot look at ${p} (${k.error})` };
    const parent = dirname(p);
    if (parent === p) return { problem: 'no existing folder on the path' };
    p = parent;
  }
}

/** Null when files can be made in `dir`, else the reason (an errno code). */
function cannotWriteIn(dir: string): string | null {
  try {
    accessSync(dir, constants.W_OK | constants.X_OK);
    rmdirSync(mkdtempSync(join(dir, '.moonsieve-probe-')));
    return null;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code ?? String(e);
  }
}

function placeProblem(abs: string): string | null {
  const near = nearestExisting(abs);
  if ('problem' in near) return near.problem;
  const w = cannotWriteIn(near.dir);
  return w === null ? null : `cannot write in ${near.dir} (${w})`;
}

/**
 * `dir` (given as option `option`, e.g. "--out") must be a folder, or a path
 * where one can be made: not empty, not a file, not under a file, and the
 * deepest existing folder on the way writable. Throws InputError otherwise.
 */
export function checkOutputDir(option: string, dir: string): void {
  const fail = (allowed: string): never => {
    throw new InputError([{ path: option, value: dir, allowed }]);
  };
  if (dir.trim() === '') fail('expected a folder name (an empty one would write into the current folder); leave the option out for the default folder');
  const abs = resolve(dir);
  if (kindOf(abs) === 'file') fail('this is a file, not a folder: name a folder (it is made when missing)');
  const p = placeProblem(abs);
  if (p !== null) fail(`${p}: name a folder you can write to`);
}

/**
 * `file` (given as option `option`, e.g. "--html") must name a file that can
 * be written: not empty, not a folder, in a folder that exists or can be made
 * and is writable. Throws InputError otherwise.
 */
export function checkOutputFile(option: string, file: string): void {
  const fail = (allowed: string): never => {
    throw new InputError([{ path: option, value: file, allowed }]);
  };
  if (file.trim() === '') fail('expected a file name, e.g. page.html');
  const abs = resolve(file);
  if (/[\\/]$/.test(file) || kindOf(abs) === 'dir') fail(`this is a folder: name a file, e.g. ${join(file, 'page.html')}`);
  const p = placeProblem(dirname(abs));
  if (p !== null) fail(`${p}: name a file in a folder you can write to`);
}
