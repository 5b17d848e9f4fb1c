/**
 * One sweep per output folder:
 *
 * - A lock file `<dir>/.moonsieve.lock` (pid, host, start time, command) is
 *   held while a sweep, merge or report writes into the folder. It is made
 *   whole by hard-linking a fully written temporary file (link fails when the
 *   lock exists), so a reader never sees half a lock. A lock whose process is
 *   gone (same host; pid not running, or running but started at another time,
 *   i.e. a reused pid) is stale and taken over: renamed aside, checked to be
 *   the one judged stale (else put back), removed.
 * - A folder that holds another sweep (a different scenario hash) or files
 *   moonsieve did not write is refused unless forced.
 * - Outputs are written into `<dir>/.moonsieve-staging/`, then a manifest is
 *   written there, then the files are renamed into place and the staging
 *   folder removed. A kill before the manifest leaves the previous set
 *   untouched (the staging folder is dropped later); a kill after it is
 *   completed (rolled forward) by the next moonsieve command on the folder,
 *   so the folder holds one sweep's complete set or its previous one.
 */
import {
  existsSync, linkSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, unlinkSync, writeFileSync,
} from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { writeFileAtomic } from '../../io/atomicWrite.js';
import { InputError } from '../../scenario/errors.js';

export const LOCK_FILE = '.moonsieve.lock';
export const STAGING_DIR = '.moonsieve-staging';
export const NULLSET_DIR = '.moonsieve-nullsets';
const MANIFEST = 'manifest.json';

/** What `moonsieve simulate` writes into the same default folder (reports/<scenario slug>/): not foreign to a sweep there. */
export const SIMULATE_FILES = ['lightcurve.ecsv', 'lightcurve.csv', 'transits.ecsv', 'transits.csv', 'simulate.html'];

/** Files a sweep folder may hold besides the outputs (checkpoint, lock, staging, no-moon sets, simulate's files). */
export function isOwnFile(name: string, outputs: readonly string[], checkpoint: string): boolean {
  if (outputs.includes(name) || name === checkpoint || name === LOCK_FILE || name === STAGING_DIR || name === NULLSET_DIR) return true;
  if (SIMULATE_FILES.includes(name)) return true;
  // What file browsers leave in a folder someone opened: not a user's data.
  if (name === '.DS_Store' || name === 'Thumbs.db' || name === 'desktop.ini') return true;
  // Temporary files of writeFileAtomic and of the lock, and the probe of the path check, left by a kill.
  return /^\..+\.\d+\.\d+\.tmp$/.test(name) || /^\.moonsieve\.lock\..+$/.test(name) || /^\.moonsieve-probe-/.test(name);
}

export interface LockInfo {
  pid: number;
  host: string;
  /** ISO time the lock was taken. */
  started: string;
  /** The process start time (Linux: /proc/<pid>/stat field 22), to tell a reused pid; null when unknown. */
  proc_start: string | null;
  command: string;
  /** Random token: the holder releases only its own lock. */
  token: string;
}

function procStart(pid: number): string | null {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // Fields after the command name (which is in parentheses and may hold spaces).
    const rest = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return rest[19] ?? null; // field 22 overall
  } catch {
    return null;
  }
}

/** Whether the process of a lock on this host still runs (and is the same process). */
function holderAlive(info: LockInfo): boolean {
  try {
    process.kill(info.pid, 0);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ESRCH') return false;
  }
  if (info.proc_start !== null) {
    const now = procStart(info.pid);
    if (now !== null && now !== info.proc_start) return false; // the pid was reused
  }
  return true;
}

function readLock(path: string): { text: string; info: LockInfo | null } | null {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch {
    return null;
  }
  try {
    const v = JSON.parse(text) as LockInfo;
    return { text, info: v && Number.isSafeInteger(v.pid) && typeof v.host === 'string' ? v : null };
  } catch {
    return { text, info: null };
  }
}

export interface FolderLock {
  path: string;
  info: LockInfo;
  release(): void;
}

/**
 * Take the lock of folder `dir` (made when missing) for `command`. Throws
 * InputError when a live process holds it, naming it and how to proceed.
 */
export function acquireFolderLock(dir: string, command: string): FolderLock {
  mkdirSync(dir, { recursive: true });
  const path = join(dir, LOCK_FILE);
  const info: LockInfo = {
    pid: process.pid,
    host: hostname(),
    started: new Date().toISOString(),
    proc_start: procStart(process.pid),
    command,
    token: `${process.pid}-${Date.now()}-${Math.random().toString(36).slice(2)}`,
  };
  const text = JSON.stringify(info) + '\n';
  const tmp = `${path}.${info.token}`;
  writeFileSync(tmp, text);
  try {
    for (let attempt = 0; attempt < 5; attempt++) {
      try {
        linkSync(tmp, path);
        return { path, info, release: () => releaseLock(path, info.token) };
      } catch (e) {
        if ((e as NodeJS.ErrnoException).code !== 'EEXIST') throw e;
      }
      const held = readLock(path);
      if (held === null) continue; // released meanwhile
      if (held.info === null) {
        throw new InputError([{
          path: path, value: held.text.slice(0, 60),
          allowed: 'the folder\'s lock file is not one moonsieve wrote: if no moonsieve run uses this folder, delete the file and run again',
        }]);
      }
      const h = held.info;
      if (h.host === info.host && !holderAlive(h)) {
        // Stale: move it aside, check that what moved is the lock judged stale, then drop it.
        const aside = `${path}.stale-${info.token}`;
        try {
          renameSync(path, aside);
        } catch {
          continue; // someone else moved it first
        }
        const moved = readLock(aside);
        if (moved !== null && moved.text !== held.text) {
          try {
            linkSync(aside, path); // a live lock taken meanwhile: put it back
          } catch {
            // another lock is in place again; the next attempt judges it
          }
        }
        rmSync(aside, { force: true });
        continue;
      }
      const where = `pid ${h.pid} on host ${h.host}`;
      throw new InputError([{
        path: 'output folder',
        value: dir,
        allowed: `in use by ${where} since ${h.started} (${h.command}); one run at a time per output folder: wait for that run to finish` +
          (h.command.startsWith('moonsieve sweep') ? ', or stop it (Ctrl-C keeps its checkpoint) and then run "moonsieve sweep SCENARIO --resume" with this --out' : '') +
          '; or choose another --out' +
          (h.host !== info.host ? `. If that run is gone (e.g. its node was lost), delete ${path} and run again` : ''),
      }]);
    }
    throw new InputError([{ path: dir, value: 'lock contended', allowed: 'other runs keep taking this folder\'s lock: choose another --out' }]);
  } finally {
    rmSync(tmp, { force: true });
  }
}

/** The live holder of folder `dir`'s lock, or null (no lock, or a stale one). A lock on another host counts as live. */
export function liveLockHolder(dir: string): LockInfo | null {
  const held = readLock(join(dir, LOCK_FILE));
  if (held === null || held.info === null) return null;
  if (held.info.host === hostname() && !holderAlive(held.info)) return null;
  return held.info;
}

/**
 * Make a folder another command only reads (a shard to merge) consistent:
 * refused while a run writes it, else an interrupted commit is finished.
 */
export function settleForReading(dir: string, option: string): void {
  const h = liveLockHolder(dir);
  if (h !== null) {
    throw new InputError([{
      path: option, value: dir,
      allowed: `a run is writing this folder now (pid ${h.pid} on host ${h.host} since ${h.started}: ${h.command}); wait for it to finish`,
    }]);
  }
  settleStaging(dir);
}

function releaseLock(path: string, token: string): void {
  const held = readLock(path);
  if (held?.info?.token === token) {
    try {
      unlinkSync(path);
    } catch {
      // already gone
    }
  }
}

/**
 * Finish or drop an interrupted commit: with a manifest, complete its renames
 * (and removals); without, drop the staging folder. Returns what was done.
 */
export function settleStaging(dir: string): 'completed' | 'dropped' | null {
  const staging = join(dir, STAGING_DIR);
  if (!existsSync(staging)) return null;
  const manifestPath = join(staging, MANIFEST);
  let manifest: { files: string[]; remove: string[] } | null = null;
  try {
    const v = JSON.parse(readFileSync(manifestPath, 'utf8')) as { files?: unknown; remove?: unknown };
    if (Array.isArray(v.files) && Array.isArray(v.remove)) manifest = { files: v.files.map(String), remove: v.remove.map(String) };
  } catch {
    manifest = null;
  }
  if (manifest === null) {
    rmSync(staging, { recursive: true, force: true });
    return 'dropped';
  }
  for (const name of manifest.files) {
    if (existsSync(join(staging, name))) renameSync(join(staging, name), join(dir, name));
  }
  for (const name of manifest.remove) rmSync(join(dir, name), { force: true });
  rmSync(staging, { recursive: true, force: true });
  return 'completed';
}

/**
 * Write `files` ([name, text]) into `dir` as one set: staged, manifest, renamed.
 * `remove`: other names of the set to delete (outputs of the previous set that
 * this one does not have). Returns the paths written.
 */
export function commitOutputs(dir: string, files: ReadonlyArray<readonly [string, string]>, remove: readonly string[] = []): string[] {
  settleStaging(dir);
  const staging = join(dir, STAGING_DIR);
  mkdirSync(staging, { recursive: true });
  for (const [name, text] of files) writeFileSync(join(staging, name), text);
  writeFileAtomic(join(staging, MANIFEST), JSON.stringify({ files: files.map(([n]) => n), remove: remove.filter((r) => !files.some(([n]) => n === r)) }) + '\n');
  settleStaging(dir);
  return files.map(([n]) => join(dir, n));
}

export interface FolderContents {
  /** Scenario hashes found in the folder's cells.json, run.json and checkpoint header (with the shard, "K/N" or "all", where recorded). */
  hashes: Array<{ file: string; hash: string; scenario: string; shard?: string }>;
  /** Files moonsieve did not write (names), including unreadable sweep files. */
  foreign: string[];
  checkpoint: boolean;
}

/** What folder `dir` holds (nothing when it does not exist). */
export function inspectFolder(dir: string, outputs: readonly string[], checkpoint: string): FolderContents {
  const out: FolderContents = { hashes: [], foreign: [], checkpoint: false };
  let names: string[];
  try {
    if (!statSync(dir).isDirectory()) return out;
    names = readdirSync(dir);
  } catch {
    return out;
  }
  for (const name of names.sort()) {
    if (!isOwnFile(name, outputs, checkpoint)) {
      out.foreign.push(name);
      continue;
    }
    if (name === checkpoint) out.checkpoint = true;
    if (name !== 'cells.json' && name !== 'run.json' && name !== checkpoint) continue;
    try {
      const text = readFileSync(join(dir, name), 'utf8');
      const v = JSON.parse(name === checkpoint ? text.slice(0, text.indexOf('\n') >>> 0) : text) as Record<string, unknown>;
      const m = (name === 'run.json' ? v : (v.meta as Record<string, unknown> | undefined)) ?? {};
      if (typeof m.scenario_hash !== 'string') throw new Error('no scenario hash');
      const entry: FolderContents['hashes'][number] = { file: name, hash: m.scenario_hash, scenario: String(m.scenario ?? '') };
      if (name !== 'cells.json') entry.shard = shardKey(v.shard);
      out.hashes.push(entry);
    } catch {
      out.foreign.push(name);
    }
  }
  return out;
}

function shardKey(v: unknown): string {
  const sh = v as { k?: unknown; n?: unknown } | null | undefined;
  return sh && typeof sh === 'object' ? `${String(sh.k)}/${String(sh.n)}` : 'all';
}

function listSome(xs: readonly string[], max = 5): string {
  const head = xs.slice(0, max).join(', ');
  return xs.length > max ? `${head} and ${xs.length - max} more` : head;
}

/**
 * Refuse, unless `force`, a folder that holds another sweep than the one of
 * scenario hash `hash`, or files moonsieve did not write. `option` names the
 * folder in the message (default "--out").
 */
export function checkFolderOwner(
  dir: string, hash: string, outputs: readonly string[], checkpoint: string, force: boolean,
  opts: { option?: string; resume?: boolean; shard?: { k: number; n: number } | null } = {},
): FolderContents {
  const option = opts.option ?? '--out';
  const c = inspectFolder(dir, outputs, checkpoint);
  if (force) return c;
  // On --resume a checkpoint of another sweep is refused by readCheckpoint, which names what differs.
  const other = c.hashes.find((h) => h.hash !== hash && !(opts.resume === true && h.file === checkpoint));
  if (other) {
    throw new InputError([{
      path: option,
      value: dir,
      allowed: `holds the results of another sweep ("${other.scenario}", scenario hash ${other.hash.slice(0, 12)}…; this one's is ${hash.slice(0, 12)}…, from ${other.file}): ` +
        'choose another --out (the default folder comes from the scenario name, so two scenarios whose names give the same folder need their own --out), or pass --force to replace those results',
    }]);
  }
  if (opts.shard !== undefined && opts.shard !== null) {
    // Another shard of the same sweep (or the whole grid) would be replaced by this run's part.
    // (A whole-grid run or a merge holds every cell of a shard, so it may replace one.)
    const mine = shardKey(opts.shard);
    const part = c.hashes.find((h) => h.shard !== undefined && h.shard !== mine && !(opts.resume === true && h.file === checkpoint));
    if (part) {
      const what = (k: string): string => (k === 'all' ? 'the whole grid' : `shard ${k}`);
      throw new InputError([{
        path: option,
        value: dir,
        allowed: `holds ${what(part.shard as string)} of this sweep (${part.file}) and this run is ${what(mine)}: give each shard its own --out (then merge them), or pass --force to replace it`,
      }]);
    }
  }
  if (c.foreign.length > 0) {
    throw new InputError([{
      path: option,
      value: dir,
      allowed: `holds files that are not this sweep's (${listSome(c.foreign)}): choose a new or empty folder, or pass --force to write the outputs beside them (they are left as they are)`,
    }]);
  }
  return c;
}
