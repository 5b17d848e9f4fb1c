/**
 * `rank --resume`: an interrupted run (its checkpoint written as the forecast
 * tier goes) continues without recomputing its finished planets, and writes
 * the same files as an uninterrupted run, byte for byte.
 */
import { describe, it, expect } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli as run } from '../helpers/runCli.js';
import { readRankInputs, rankListText } from '../../src/app/rankList.js';
import { openRankCheckpoint, rankIdentity, RANK_CHECKPOINT_FILE } from '../../src/app/rankCheckpoint.js';
import { demoPlanetCsv } from '../../src/rank/demoPlanets.js';
import type { RankJson } from '../../src/rank/rankJson.js';

const root = new URL('../../', import.meta.url).pathname;
const scenarioPath = join(root, 'scenarios/demo-rank.yaml');

/** Rank until `stopAfter` planets are done, then stop as a kill would (the checkpoint written every `every` planets stays). */
function interrupted(out: string, list: string, stopAfter: number, every: number): void {
  const { doc, listText } = readRankInputs(scenarioPath, list);
  const settings = { probability: 0.9, calendar: false };
  const cp = openRankCheckpoint(out, rankIdentity({ doc, listText, settings, shard: null }), false, every);
  let n = 0;
  expect(() => rankListText(doc, listText, list, {
    settings,
    onRanked: (p) => {
      cp.record(p);
      if (++n === stopAfter) throw new Error('killed');
    },
  })).toThrow('killed');
}

describe('rank --resume', () => {
  it('continues an interrupted run and writes the uninterrupted run\'s files byte for byte; a checkpoint is never silently overwritten', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-rank-resume-'));
    const list = join(dir, 'list.csv');
    writeFileSync(list, demoPlanetCsv(14, 21) + 'Broken-9 b,1,1,5800,10,V,0.5,0.9,-3,0.2,10,10\n');
    const args = (out: string) => ['rank', scenarioPath, list, '--out', out, '--confirm', '0', '--bound', '0', '--detail', '0', '--no-calendar'];
    const whole = await run(args(join(dir, 'whole')));
    expect(whole.code, whole.err).toBe(0);

    const b = join(dir, 'b');
    interrupted(b, list, 9, 4); // 9 done, 8 saved (every 4): the 9th is lost, as in a kill
    const cp = JSON.parse(readFileSync(join(b, RANK_CHECKPOINT_FILE), 'utf8')) as { planets: unknown[] };
    expect(cp.planets.length).toBe(8);
    const refused = await run(args(b));
    expect(refused.code).toBe(2);
    expect(refused.err).toMatch(/--resume: .*holds an interrupted rank run: pass --resume/);
    const resumed = await run([...args(b), '--resume']);
    expect(resumed.code, resumed.err).toBe(0);
    expect(resumed.err).toMatch(/resuming: 8 planets/);
    for (const f of ['rank.json', 'rank.ecsv', 'rank.html']) {
      expect(readFileSync(join(b, f), 'utf8'), f).toBe(readFileSync(join(dir, 'whole', f), 'utf8'));
    }
    expect(existsSync(join(b, RANK_CHECKPOINT_FILE))).toBe(false);
  }, 120_000);

  it('takes the checkpoint\'s planets as they are (not recomputed), and refuses one of another run', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-rank-resume-'));
    const list = join(dir, 'list.csv');
    writeFileSync(list, demoPlanetCsv(6, 8));
    const c = join(dir, 'c');
    interrupted(c, list, 3, 1);
    const path = join(c, RANK_CHECKPOINT_FILE);
    const cp = JSON.parse(readFileSync(path, 'utf8')) as { planets: Array<{ notes: string[] }> };
    cp.planets[0].notes = ['marker: from the checkpoint'];
    writeFileSync(path, JSON.stringify(cp));
    const args = ['rank', scenarioPath, list, '--out', c, '--confirm', '0', '--bound', '0', '--detail', '0', '--no-calendar', '--resume'];
    const other = await run([...args, '--probability', '0.8']);
    expect(other.code).toBe(2);
    expect(other.err).toMatch(/a checkpoint of this scenario, list, settings and shard/);
    const res = await run(args);
    expect(res.code, res.err).toBe(0);
    const r = JSON.parse(readFileSync(join(c, 'rank.json'), 'utf8')) as RankJson;
    expect(r.planets.filter((p) => p.notes.includes('marker: from the checkpoint')).length).toBe(1);
  }, 120_000);
});
