/**
 * `rank --detail`: each listed planet's detail scenario is written under
 * details/ in a folder its name cannot escape, the top planets' sweeps are
 * run and linked from rank.json and rank.html, and the others show the
 * command that makes theirs.
 */
import { describe, it, expect } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve, sep } from 'node:path';
import { main } from '../../src/cli/main.js';
import { parseYamlWithLines } from '../../src/scenario/loadScenario.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import type { ScenarioDocument } from '../../src/scenario/types.js';
import { demoPlanetCsv } from '../../src/rank/demoPlanets.js';
import { detailDir, detailFolderName, detailMassRange, detailCommand, DETAIL_MASSES, DETAIL_SEPARATIONS } from '../../src/rank/detailSweep.js';
import type { RankJson } from '../../src/rank/rankJson.js';
import { M_EARTH_KG } from '../../src/physics/constants.js';

const root = new URL('../../', import.meta.url).pathname;
const scenarioPath = join(root, 'scenarios/demo-rank.yaml');

function run(args: string[]) {
  let out = '';
  let err = '';
  const io = { out: (t: string) => { out += t; }, err: (t: string) => { err += t; } };
  return main(['node', 'moonsieve', ...args], io).then((code) => ({ code, out, err }));
}

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
    const bad = await run(['rank', scenarioPath, list, '--out', join(dir, 'c'), '--shard', '1/2', '--detail', '2']);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--detail: got 2; the detail sweeps are for the top of the whole list/);
  }, 120_000);
});
