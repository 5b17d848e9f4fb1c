/**
 * The checkpoint of an interrupted `rank` run: `rank.partial.json` in the
 * output folder, holding the forecast tier's finished planets, written
 * atomically every CHECKPOINT_EVERY planets (a kill loses at most that many)
 * and removed once the outputs are written. `rank --resume` reads it and
 * ranks only the others; every planet's value is a pure function of its row
 * and the scenario, so the outputs are byte-identical to an uninterrupted
 * run. The bound, the Monte Carlo tier and the detail sweeps run after the
 * forecast tier and are not checkpointed (they are redone on resume).
 */
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { createHash } from 'node:crypto';
import { InputError } from '../scenario/errors.js';
import { writeFileAtomic } from '../io/atomicWrite.js';
import type { RankedPlanetJson } from '../rank/rankJson.js';

export const RANK_CHECKPOINT_FILE = 'rank.partial.json';
const CHECKPOINT_SCHEMA = 'moonsieve/rank-checkpoint/1';
/** Planets between two checkpoint writes. */
export const CHECKPOINT_EVERY = 10;

interface CheckpointDoc {
  schema: string;
  identity: string;
  planets: RankedPlanetJson[];
}

/** What the run's results depend on: the scenario document, the list's text, the settings and the shard. */
export function rankIdentity(parts: unknown): string {
  return createHash('sha256').update(JSON.stringify(parts)).digest('hex');
}

export interface RankCheckpoint {
  /** Finished planets read from the checkpoint, by row (empty when starting afresh). */
  done: Map<number, RankedPlanetJson>;
  /** Record a planet this run ranked (written every `every` planets). */
  record(p: RankedPlanetJson): void;
  /** Write what is unsaved (at the end of the forecast tier). */
  flush(): void;
  /** Remove the checkpoint (after the outputs are written). */
  remove(): void;
}

/**
 * Open the checkpoint of `outDir` for a run of `identity`. Without `resume` an
 * existing checkpoint is refused (InputError: pass --resume, or delete it); with
 * it, a checkpoint of another run (other scenario, list, settings or shard) is refused.
 */
export function openRankCheckpoint(outDir: string, identity: string, resume: boolean, every = CHECKPOINT_EVERY): RankCheckpoint {
  const path = join(outDir, RANK_CHECKPOINT_FILE);
  const done = new Map<number, RankedPlanetJson>();
  if (existsSync(path)) {
    if (!resume) throw new InputError([{ path: '--resume', value: undefined, allowed: `${path} holds an interrupted rank run: pass --resume to continue it, or delete the file to start afresh` }]);
    let doc: CheckpointDoc;
    try {
      doc = JSON.parse(readFileSync(path, 'utf8')) as CheckpointDoc;
    } catch {
      throw new InputError([{ path: '--resume', value: path, allowed: 'a checkpoint written by moonsieve rank (this one cannot be read: delete it to start afresh)' }]);
    }
    if (doc.schema !== CHECKPOINT_SCHEMA || doc.identity !== identity || !Array.isArray(doc.planets)) {
      throw new InputError([{ path: '--resume', value: path, allowed: 'a checkpoint of this scenario, list, settings and shard (it is of another run: delete it or choose another --out)' }]);
    }
    for (const p of doc.planets) done.set(p.row, p);
  }
  const all: RankedPlanetJson[] = [...done.values()];
  let unsaved = 0;
  const save = () => {
    mkdirSync(outDir, { recursive: true });
    writeFileAtomic(path, JSON.stringify({ schema: CHECKPOINT_SCHEMA, identity, planets: all } satisfies CheckpointDoc) + '\n');
    unsaved = 0;
  };
  return {
    done,
    record(p) {
      all.push(p);
      if (++unsaved >= every) save();
    },
    flush() {
      if (unsaved > 0) save();
    },
    remove() {
      rmSync(path, { force: true });
    },
  };
}
