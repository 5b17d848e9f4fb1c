/**
 * `rank --detail`: each listed planet's detail scenario is written under
 * details/ in a folder its name cannot escape, the top planets' sweeps are
 * run and linked from rank.json and rank.html, and the others show the
 * command that makes theirs.
 */
import { describe, it, expect } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve, sep } from 'node:path';
import { runCli as run } from '../helpers/runCli.js';
import { parseYamlWithLines } from '../../src/scenario/loadScenario.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import type { ScenarioDocument } from '../../src/scenario/types.js';
import { demoPlanetCsv } from '../../src/rank/demoPlanets.js';
import { detailDir, detailFolderName, detailMassRange, detailCommand, DETAIL_MASSES, DETAIL_SEPARATIONS } from '../../src/rank/detailSweep.js';
import type { RankJson } from '../../src/rank/rankJson.js';
import { M_EARTH_KG } from '../../src/physics/constants.js';

const root = new URL('../../', import.meta.url).pathname;
const scenarioPath = join(root, 'scenarios/demo-rank.yaml');

describe('rank details: folder names', () => {
  it('no planet name leads outside details/ (common practice, no source)', () => {
    const names = ['../../etc/passwd', '..', '.hidden b', 'a/b\\c d', '/abs/x', 'C:\\win', '♃♄', '', 'Tovren b', '-x-', `${'q'.repeat(200)} b`];
    const base = resolve('/tmp/rankout');
    for (const [i, n] of names.entries()) {
      const f = detailFolderName(i + 1, n);
      expect(f).toMatch(/^row\d+(-[a-z0-9._-]+)?$/);
      expect(f.length).toBeLessThanOrEqual(60);
      const abs = resolve(base, detailDir(i + 1, n));
      expect(abs.startsWith(base + sep + 'details' + sep), n).toBe(true);
    }
    expect(detailFolderName(7, 'Tovren b')).toBe('row7-tovren-b');
    expect(detailFolderName(3, '../../etc/passwd')).toBe('row3-etc-passwd');
    expect(detailFolderName(4, '♃♄')).toBe('row4');
    // Two names that slug alike keep their rows apart.
    expect(detailFolderName(1, 'A b')).not.toBe(detailFolderName(2, 'a-b'));
    expect(detailCommand('details/row7-tovren-b')).toBe('moonsieve sweep details/row7-tovren-b/scenario.yaml --out details/row7-tovren-b');
  });

  it('the mass axis brackets the forecast\'s smallest moon (a quarter to eight times it; common practice, no source)', () => {
    expect(detailMassRange(M_EARTH_KG)).toEqual(['0.25 Mearth', '8 Mearth']);
    expect(detailMassRange(null)).toEqual(['0.1 Mearth', '10 Mearth']);
  });
});

describe('rank details: the command line', () => {
  it('--detail 1 runs the top planet\'s sweep and links its report; every other planet gets a scenario and the command', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-rank-detail-'));
    const list = join(dir, 'list.csv');
    writeFileSync(list, demoPlanetCsv(4, 11));
    const out = join(dir, 'r');
    const res = await run(['rank', scenarioPath, list, '--out', out, '--confirm', '0', '--bound', '0', '--detail', '1', '--detail-forecast-only', '--workers', '1', '--no-calendar']);
    expect(res.code, res.err).toBe(0);
    expect(res.err).toMatch(/detail sweep 1\/1: .* in \d+\.\d s/);
    const r = JSON.parse(readFileSync(join(out, 'rank.json'), 'utf8')) as RankJson;
    expect(readdirSync(join(out, 'details')).length).toBe(r.planets.length);
    const html = readFileSync(join(out, 'rank.html'), 'utf8');
    for (const p of r.planets) {
      const d = detailDir(p.row, p.name);
      expect(p.detail_scenario).toBe(`${d}/scenario.yaml`);
      const doc = parseYamlWithLines(readFileSync(join(out, p.detail_scenario!), 'utf8'), 'detail').value as ScenarioDocument;
      // The planet's own scenario: its name and period are the row's.
      const s = parseScenario(doc, 'detail');
      expect(s.name).toBe(p.name);
      expect(s.planet.periodS).toBeCloseTo(p.period_s, 3);
      const axes = (doc.sweep as { axes: Array<{ field: string; count: number }> }).axes;
      expect(axes.map((a) => [a.field, a.count])).toEqual([['moon.mass', DETAIL_MASSES], ['moon.separation', DETAIL_SEPARATIONS]]);
      if (p.rank === 1) {
        expect(p.detail_report).toBe(`${d}/report.html`);
        expect(existsSync(join(out, p.detail_report!))).toBe(true);
        expect(html).toContain(`<a href="${d}/report.html">`);
      } else {
        expect(p.detail_report).toBeNull();
        expect(html).toContain(detailCommand(d));
      }
    }
  }, 120_000);

  it('shards run with --detail N hold their own top N sweeps; merge copies the whole list\'s, links them, and writes what an unsharded --detail N run writes', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-rank-detail-merge-'));
    const list = join(dir, 'list.csv');
    writeFileSync(list, demoPlanetCsv(5, 11));
    const common = ['--detail-forecast-only', '--workers', '1', '--no-calendar'];
    const ok = async (args: string[]) => {
      const res = await run(args);
      expect(res.code, res.err).toBe(0);
      return res;
    };
    await ok(['rank', scenarioPath, list, '--out', join(dir, 'whole'), '--confirm', '0', '--bound', '0', '--detail', '2', ...common]);
    const a = await ok(['rank', scenarioPath, list, '--out', join(dir, 'a'), '--shard', '1/2', '--detail', '2', ...common]);
    expect(a.err).toMatch(/give every shard the same --detail 2/);
    await ok(['rank', scenarioPath, list, '--out', join(dir, 'b'), '--shard', '2/2', '--detail', '2', ...common]);
    const m = await ok(['merge', join(dir, 'b'), join(dir, 'a'), '--out', join(dir, 'merged')]);
    expect(m.out).toMatch(/copied 5 detail folders into .*details \(2 with a sweep report, linked from rank\.html\)/);
    // The same three files as the unsharded run, byte for byte (common practice, no source: shards must not change the answer).
    for (const f of ['rank.json', 'rank.ecsv', 'rank.html']) {
      expect(readFileSync(join(dir, 'merged', f), 'utf8'), f).toBe(readFileSync(join(dir, 'whole', f), 'utf8'));
    }
    const r = JSON.parse(readFileSync(join(dir, 'merged', 'rank.json'), 'utf8')) as RankJson;
    expect(r.detail_top).toBe(2);
    const folders = readdirSync(join(dir, 'whole', 'details')).sort();
    expect(readdirSync(join(dir, 'merged', 'details')).sort()).toEqual(folders);
    const html = readFileSync(join(dir, 'merged', 'rank.html'), 'utf8');
    for (const p of r.planets) {
      const d = detailDir(p.row, p.name);
      expect(readFileSync(join(dir, 'merged', d, 'scenario.yaml'), 'utf8')).toBe(readFileSync(join(dir, 'whole', d, 'scenario.yaml'), 'utf8'));
      if (p.rank <= 2) {
        expect(p.detail_report).toBe(`${d}/report.html`);
        expect(html).toContain(`<a href="${d}/report.html">`);
        // The copied sweep is the one the unsharded run made (same file, same seeding).
        expect(readFileSync(join(dir, 'merged', d, 'cells.json'), 'utf8')).toBe(readFileSync(join(dir, 'whole', d, 'cells.json'), 'utf8'));
        expect(existsSync(join(dir, 'merged', d, 'report.html'))).toBe(true);
      } else {
        expect(p.detail_report).toBeNull();
        expect(readdirSync(join(dir, 'merged', d))).toEqual(['scenario.yaml']);
      }
    }
    // A shard whose top sweep did not finish: merge says so, and the page shows the command instead of a dead link.
    const topRow = r.planets[0];
    const topDir = detailDir(topRow.row, topRow.name);
    const holder = existsSync(join(dir, 'a', topDir, 'report.html')) ? 'a' : 'b';
    rmSync(join(dir, holder, topDir, 'report.html'));
    const m2 = await ok(['merge', join(dir, 'a'), join(dir, 'b'), '--out', join(dir, 'merged2')]);
    expect(m2.err).toContain(`detail not copied: ${topRow.name}: its shard's detail sweep did not finish (no ${topDir}/report.html)`);
    const r2 = JSON.parse(readFileSync(join(dir, 'merged2', 'rank.json'), 'utf8')) as RankJson;
    expect(r2.planets[0].detail_report).toBeNull();
    expect(readFileSync(join(dir, 'merged2', 'rank.html'), 'utf8')).toContain(detailCommand(topDir));
    // Shards run with different --detail are refused: the whole list's top N would not be among them.
    await ok(['rank', scenarioPath, list, '--out', join(dir, 'c'), '--shard', '2/2', '--detail', '1', ...common]);
    const bad = await run(['merge', join(dir, 'a'), join(dir, 'c'), '--out', join(dir, 'merged3')]);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/DIR: got "--detail 2, 1 \(shards 1\/2, 2\/2\)"; shards run with the same --detail N/);
    expect(existsSync(join(dir, 'merged3', 'rank.json'))).toBe(false);
  }, 180_000);
});
