/**
 * `moonsieve rank` on an ECSV planet list: the lists astropy wrote once
 * (test/fixtures/planetList_astropy.py: space- and comma-delimited ECSV and
 * the same table as plain CSV) rank identically; a unit the column name does
 * not state is refused per column, with nothing written.
 */
import { describe, it, expect } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli as run } from '../helpers/runCli.js';
import { parseYamlWithLines } from '../../src/scenario/loadScenario.js';
import type { ScenarioDocument } from '../../src/scenario/types.js';
import { rankListText, readPlanetList } from '../../src/app/rankList.js';

const root = new URL('../../', import.meta.url).pathname;
const scenarioPath = join(root, 'scenarios/demo-rank.yaml');
const baseDoc = parseYamlWithLines(readFileSync(scenarioPath, 'utf8'), 'demo-rank').value as ScenarioDocument;
const fixture = (f: string) => join(root, 'test/fixtures', f);
const settings = { probability: 0.9, calendar: true };

describe('rank: ECSV planet lists', () => {
  it('the space- and comma-delimited ECSV lists rank exactly as the same table in CSV (astropy wrote all three)', () => {
    const csv = rankListText(baseDoc, readFileSync(fixture('planetList.csv'), 'utf8'), 'planetList.csv', { settings });
    // The fixture's masked mass (Quildo-3 "d") comes from its radius; its masked t0 error keeps the scenario's.
    expect(csv.planets.find((p) => p.name === 'Quildo-3 "d"')!.flags).toEqual(['mass_from_radius']);
    expect(csv.planets_ranked).toBe(5);
    expect(csv.skipped).toEqual([]);
    for (const f of ['planetList_space.ecsv', 'planetList_comma.ecsv']) {
      const text = readFileSync(fixture(f), 'utf8');
      const ecsv = rankListText(baseDoc, text, f, { settings });
      // Same planets, same numbers, same order; the rows' file lines differ (the ECSV header), which the ranking does not hold.
      expect(JSON.stringify(ecsv), f).toBe(JSON.stringify(csv));
      expect(readPlanetList(text, f).rows.map((r) => r.name)).toEqual(['Ostrel-1 b', 'Vanmor 7 c', 'Quildo-3 "d"', 'Tessar-9 b', 'Ambrel-12 c']);
    }
  }, 60_000);

  it('a byte-order mark before the header (as spreadsheets write) is not part of the first column\'s name', () => {
    for (const f of ['planetList.csv', 'planetList_space.ecsv']) {
      const t = readPlanetList('\uFEFF' + readFileSync(fixture(f), 'utf8'), f);
      expect(t.header[0], f).toBe('name');
      expect(t.rows).toHaveLength(5);
    }
  });

  it('a column whose ECSV unit is not the one its name states is refused: exit 2, one line per column, nothing written', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-rank-ecsv-'));
    const list = join(dir, 'list.ecsv');
    const text = readFileSync(fixture('planetList_space.ecsv'), 'utf8')
      .replace('{name: period_d, unit: d,', '{name: period_d, unit: h,')
      .replace('{name: impact_parameter, datatype', '{name: impact_parameter, unit: deg, datatype');
    writeFileSync(list, text);
    const res = await run(['rank', scenarioPath, list, '--out', join(dir, 'out'), '--no-calendar']);
    expect(res.code).toBe(2);
    expect(res.err).toMatch(/column period_d unit: got "h"; the unit its name states, d \(also written day\), or no unit; the list does not convert units/);
    expect(res.err).toMatch(/column impact_parameter unit: got "deg"; no unit/);
    expect(res.err).not.toMatch(/at .*\.ts:/);
    expect(existsSync(join(dir, 'out', 'rank.json'))).toBe(false);
  });

  it('a header row that differs from the ECSV header is refused; a malformed row is skipped with its line', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-rank-ecsv-'));
    const good = readFileSync(fixture('planetList_comma.ecsv'), 'utf8');
    const renamed = join(dir, 'renamed.ecsv');
    writeFileSync(renamed, good.replace('\nname,star_mass_msun,', '\nname,star_mass,'));
    const res = await run(['rank', scenarioPath, renamed, '--out', join(dir, 'out'), '--no-calendar']);
    expect(res.code).toBe(2);
    expect(res.err).toMatch(/renamed\.ecsv line 23: got "column 2 named star_mass"; the row of column names repeats the YAML header's names in order; column 2 there is star_mass_msun/);
    const broken = good.replace('\nTessar-9 b,', '\n"Tessar-9 b,');
    const r = rankListText(baseDoc, broken, 'broken.ecsv', { settings: { probability: 0.9, calendar: false } });
    expect(r.planets_ranked).toBe(4);
    expect(r.skipped.map((s) => [s.row, s.line])).toEqual([[4, 27]]);
    expect(r.skipped[0].problems[0]).toMatch(/row 4: got "value 1 opens a double quote that the line does not close"/);
  });
});
