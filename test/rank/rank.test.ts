/**
 * `moonsieve rank`: the list's rows become scenarios, bad rows are reported
 * and skipped, the minimum detectable mass is the one `moonsieve limits`
 * confirms, and shards merge into the unsharded output byte for byte.
 */
import { parseScenario } from '../../src/scenario/parseScenario.js';
import { withoutSkyBlocks } from '../../src/scenario/readSky.js';
import { describe, it, expect } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli as run } from '../helpers/runCli.js';
import { parseYamlWithLines } from '../../src/scenario/loadScenario.js';
import type { ScenarioDocument } from '../../src/scenario/types.js';
import { readPlanetTable, planetRows, chenKippingMassFromRadius } from '../../src/rank/planetTable.js';
import { rankPlanet, moonScenario, RANK_PDET, RANK_PDET_TOLERANCE } from '../../src/rank/rankPlanet.js';
import { scenarioDocumentOf } from '../../src/scenario/scenarioDocument.js';
import { knownTemplateBound } from '../../src/timing/knownTemplateBound.js';
import { withoutMoon } from '../../src/sweep/applyAxes.js';
import { scenarioMoonDensity } from '../../src/budget/targetMoon.js';
import { demoPlanetCsv } from '../../src/rank/demoPlanets.js';
import { rankListText, mergeRankOutputs, writeRankOutputs, rankEcsv } from '../../src/app/rankList.js';
import { chenKippingRadius } from '../../src/physics/massRadius.js';
import { renderRankPage } from '../../src/report/rankPage.js';
import { M_EARTH_KG } from '../../src/physics/constants.js';
import { computeLimits } from '../../src/limits/computeLimits.js';

const root = new URL('../../', import.meta.url).pathname;
const scenarioPath = join(root, 'scenarios/demo-rank.yaml');
const baseDoc = parseYamlWithLines(readFileSync(scenarioPath, 'utf8'), 'demo-rank').value as ScenarioDocument;
const noCalendar = { probability: 0.9, calendar: false };

const HEADER = 'name,star_mass_msun,star_radius_rsun,star_teff_k,magnitude,band,planet_mass_mjup,planet_radius_rjup,period_d,impact_parameter,ra_deg,dec_deg';
const GOOD = 'Tovren b,0.8,0.78,5000,10.5,V,0.3,0.8,60,0.2,120.5,-20.25';

describe('rank: one planet agrees with the single-planet limits', () => {
  it('the list\'s minimum detectable mass at 0.3 Hill radii is the mass at which `moonsieve limits` forecasts pdet 0.5, and 1 % less falls short', async () => {
    const rows = planetRows(baseDoc, readPlanetTable(`${HEADER}\n${GOOD}\n`));
    expect(rows[0].problems).toEqual([]);
    const r = rankPlanet(rows[0].scenario!, 1, [], noCalendar);
    const at = r.reach.find((x) => x.separation_hill === 0.3)!;
    expect(at.min_mass_kg).not.toBeNull();
    const dir = mkdtempSync(join(tmpdir(), 'ms-rank-'));
    const yaml = (massKg: number) => readFileSync(scenarioPath, 'utf8')
      .replace(/^star:\n(?:  .*\n)+/m, 'star: {mass: 0.8 Msun, radius: 0.78 Rsun, teff: 5000 K, age: 4 Gyr, limb_darkening: {u1: 0.45, u2: 0.2}}\n')
      .replace(/^planet:\n(?:  .*\n)+/m, 'planet: {mass: 0.3 Mjup, radius: 0.8 Rjup, period: 60 d, impact_parameter: 0.2}\n')
      .replace(/^moon:\n(?:  .*\n)+/m, `moon: {mass: ${massKg} kg, density: 4 g/cm^3, separation: 0.3 hill}\n`)
      .replace(/magnitude: 11 .*$/m, 'magnitude: 10.5\n    band: V')
      .replace(/^site:.*\n|^campaign:.*\n|^constraints:.*\n/gm, '');
    const limitsAt = async (massKg: number) => {
      const f = join(dir, `m${massKg}.yaml`);
      writeFileSync(f, yaml(massKg));
      const res = await run(['limits', f, '--json']);
      expect(res.code, res.err).toBe(0);
      return JSON.parse(res.out).pdet_forecast_combined as number;
    };
    // Source: `moonsieve limits` (computeLimits) on the same planet, the single-planet command.
    expect(Math.abs((await limitsAt(at.min_mass_kg!)) - RANK_PDET)).toBeLessThan(RANK_PDET_TOLERANCE);
    expect(await limitsAt(at.min_mass_kg! * 0.99)).toBeLessThan(RANK_PDET);
  });
});

describe('rank: bad rows', () => {
  it('reports each bad row (row number and field) and ranks the rest', () => {
    const text = [
      HEADER,
      GOOD,
      'Tovren c,0.8,0.78,5000,10.5,V,0.3,0.8,-4,0.2,120.5,-20.25', // row 2: negative period
      'Tovren b,0.9,0.8,5200,11,V,0.2,0.7,40,0.1,120.5,-20.25', // row 3: duplicated name
      'Tovren d,0.8,,5000,10.5,V,0.3,0.8,60,0.2,120.5,-20.25', // row 4: missing star radius
      'Tovren e,0.8,0.78,5000,10.5,V,0.3,0.8,60,abc,120.5,-20.25', // row 5: not a number
      'Tovren f,0.8,0.78,5000,10.5,V,0.3,0.8,60,3.5,120.5,-20.25', // row 6: no transit (b > 1 + p)
      'Tovren g,0.8,0.78,5000,10.5,V,,1.2,60,0.2,120.5,-20.25', // row 7: Jovian radius without a mass
      'Tovren h,0.8,0.78,5000,10.5,V,0.05,,25,0.4,200,10', // row 8: good, radius from mass (flagged)
    ].join('\n');
    const r = rankListText(baseDoc, text, 'list.csv', { settings: noCalendar });
    expect(r.planets.map((p) => p.name).sort()).toEqual(['Tovren b', 'Tovren h']);
    expect(r.planets.find((p) => p.name === 'Tovren h')!.flags).toEqual(['radius_from_mass']);
    const byRow = new Map(r.skipped.map((s) => [s.row, s.problems.join(' | ')]));
    expect([...byRow.keys()]).toEqual([2, 3, 4, 5, 6, 7]);
    expect(byRow.get(2)).toMatch(/^row 2: planet\.period/);
    expect(byRow.get(3)).toMatch(/row 3: name: got "Tovren b"; each planet name once \(already in row 1\)/);
    expect(byRow.get(4)).toMatch(/row 4: star_radius_rsun: got \(missing\); required in every row/);
    expect(byRow.get(5)).toMatch(/row 5: impact_parameter: got "abc"; a finite number/);
    expect(byRow.get(6)).toMatch(/row 6: planet\.impact_parameter/);
    expect(byRow.get(7)).toMatch(/row 7: planet_mass_mjup/);
    expect(r.skipped.find((s) => s.row === 3)!.line).toBe(4);
    // The page lists the ranked planets and each skipped row with its problem, escaped.
    const page = renderRankPage(r);
    expect(page).toContain('<td>Tovren h <small>(radius_from_mass)</small></td>');
    expect(page).toContain('<li>row 5 (line 6, Tovren e): row 5: impact_parameter: got &quot;abc&quot;; a finite number</li>');
  });

  it('a stated noise replaces the ground budget for its row; a column the list does not know is named in the notes', () => {
    const text = `${HEADER},noise_ppm_per_hour,colour\n${GOOD},,red\n${GOOD.replace('Tovren b', 'Tovren q')},50,blue\n`;
    const rows = planetRows(baseDoc, readPlanetTable(text));
    expect(rows.map((r) => r.problems)).toEqual([[], []]);
    expect(rows[0].scenario!.instrument.ground).toBeTruthy();
    expect(rows[1].scenario!.instrument.ground ?? null).toBeNull();
    // Source: white noise scaled by √t (the scenario's `noise` field): 50 ppm per hour is 50·√(3600/120) ppm per 2-min exposure.
    expect(rows[1].scenario!.instrument.noiseFraction * Math.sqrt(rows[1].scenario!.instrument.noiseTimescaleS / 120)).toBeCloseTo(50e-6 * Math.sqrt(30), 12);
    const r = rankListText(baseDoc, text, 'list.csv', { settings: noCalendar });
    expect(r.notes).toEqual(['columns not read (not planet-list columns, see docs/rank.md): colour']);
  });

  it('a missing required column is an error of the whole input: exit 2, one line per column, nothing written', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-rank-'));
    const list = join(dir, 'list.csv');
    writeFileSync(list, `${HEADER.replace('period_d,', '')}\n${GOOD.replace(',60,', ',')}\n`);
    const res = await run(['rank', scenarioPath, list, '--out', join(dir, 'out')]);
    expect(res.code).toBe(2);
    expect(res.err).toMatch(/column period_d: got \(missing\); required column/);
    expect(res.err).not.toMatch(/at .*\.ts:/);
    expect(() => readFileSync(join(dir, 'out', 'rank.json'))).toThrow();
  });
});

describe('rank: shards', () => {
  it('any shard split merges into the unsharded rank.json and rank.ecsv, byte for byte', () => {
    const text = demoPlanetCsv(9, 77) + 'Broken-1 b,1,1,5800,10,V,0.5,0.9,-3,0.2,10,10\n';
    const settings = { probability: 0.9, calendar: true };
    const whole = rankListText(baseDoc, text, 'list.csv', { settings });
    expect(whole.skipped.map((s) => s.row)).toEqual([10]);
    const dir = mkdtempSync(join(tmpdir(), 'ms-rank-'));
    writeRankOutputs(join(dir, 'whole'), whole);
    for (const n of [2, 4]) {
      const dirs: string[] = [];
      for (let k = 1; k <= n; k++) {
        const d = join(dir, `s${k}of${n}`);
        writeRankOutputs(d, rankListText(baseDoc, text, 'list.csv', { settings, shard: { k, n } }));
        dirs.push(d);
      }
      const merged = mergeRankOutputs(dirs.reverse());
      expect(JSON.stringify(merged, null, 2)).toBe(readFileSync(join(dir, 'whole', 'rank.json'), 'utf8').trimEnd());
      expect(rankEcsv(merged)).toBe(readFileSync(join(dir, 'whole', 'rank.ecsv'), 'utf8'));
      expect(renderRankPage(merged)).toBe(readFileSync(join(dir, 'whole', 'rank.html'), 'utf8'));
    }
    expect(() => mergeRankOutputs([join(dir, 's1of2')])).toThrow(/every shard of one run exactly once/);
  }, 120_000);
});

describe('rank: the command line', () => {
  it('`rank --shard` twice and `merge` write the same three files as one `rank --confirm 0 --bound 0 --detail 0`', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-rank-'));
    const list = join(dir, 'list.csv');
    writeFileSync(list, demoPlanetCsv(5, 3));
    const ok = async (args: string[]) => {
      const res = await run(args);
      expect(res.code, res.err).toBe(0);
      return res;
    };
    await ok(['rank', scenarioPath, list, '--out', join(dir, 'whole'), '--confirm', '0', '--bound', '0', '--detail', '0', '--no-calendar']);
    await ok(['rank', scenarioPath, list, '--out', join(dir, 'a'), '--shard', '1/2', '--no-calendar']);
    await ok(['rank', scenarioPath, list, '--out', join(dir, 'b'), '--shard', '2/2', '--no-calendar']);
    const m = await ok(['merge', join(dir, 'b'), join(dir, 'a'), '--out', join(dir, 'merged')]);
    expect(m.out).toMatch(/merged 2 rank folders, 5 of 5 planets ranked/);
    for (const f of ['rank.json', 'rank.ecsv', 'rank.html']) {
      expect(readFileSync(join(dir, 'merged', f), 'utf8'), f).toBe(readFileSync(join(dir, 'whole', f), 'utf8'));
    }
    const bad = await run(['rank', scenarioPath, list, '--out', join(dir, 'c'), '--shard', '1/2', '--confirm', '2']);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--confirm: got 2; the Monte Carlo confirms the top of the whole list/);
  }, 120_000);
});

describe('rank: the demo list and the mass–radius inversion', () => {
  it('scenarios/demo-planets.csv is the seeded generator\'s output (npm run demo:planets)', () => {
    expect(readFileSync(join(root, 'scenarios/demo-planets.csv'), 'utf8')).toBe(demoPlanetCsv(300));
  });

  it('chenKippingMassFromRadius inverts chenKippingRadius in the Terran and Neptunian regimes and refuses Jovian radii', () => {
    // Source: Chen & Kipping (2017, ApJ 834, 17), the forward relation in src/physics/massRadius.ts; a round trip.
    for (const me of [0.5, 1.5, 3, 10, 60]) {
      const m = me * M_EARTH_KG;
      expect(chenKippingMassFromRadius(chenKippingRadius(m)) / m).toBeCloseTo(1, 10);
    }
    expect(chenKippingMassFromRadius(chenKippingRadius(200 * M_EARTH_KG))).toBeNaN(); // a radius the Jovian branch also reaches
    expect(chenKippingMassFromRadius(chenKippingRadius(2000 * M_EARTH_KG))).toBeNaN();
  });
});

describe('rank: the known-template bound', () => {
  it('for the top planets, the bound\'s mass at each separation is where knownTemplateBound itself gives pdet 0.5; a disagreement with the forecast is said in the notes', () => {
    const r = rankListText(baseDoc, demoPlanetCsv(6), 'list.csv', { settings: noCalendar, bound: 2 });
    expect(r.bound_computed).toBe(2);
    const rows = planetRows(baseDoc, readPlanetTable(demoPlanetCsv(6)));
    for (const p of r.planets.slice(0, 2)) {
      const s = rows.find((x) => x.row === p.row)!.scenario!;
      // The bound sees whole transits, as the forecast it brackets does: the sky blocks are left out.
      const base = withoutSkyBlocks(scenarioDocumentOf(s));
      const planetOnly = withoutMoon(parseScenario(base, s.name));
      p.bound_min_moon_mass_kg!.forEach((b, k) => {
        if (b === null) return;
        const at = (m: number) => knownTemplateBound(moonScenario(base, m, r.separations_hill[k], scenarioMoonDensity(s), s.name), { planetOnly }).probability;
        // Source: knownTemplateBound (src/timing/knownTemplateBound.ts, after Kay 1998) on the same planet and moon.
        expect(Math.abs(at(b) - RANK_PDET)).toBeLessThan(RANK_PDET_TOLERANCE);
        expect(at(b * 0.99)).toBeLessThan(RANK_PDET);
      });
      const above = p.min_moon_mass_kg.some((m, k) => m !== null && p.bound_min_moon_mass_kg![k] !== null && p.bound_min_moon_mass_kg![k]! > 1.01 * m);
      expect(p.notes.some((n) => n.startsWith('the known-template bound needs a heavier moon')), p.name).toBe(above);
      // The bound is the best any analysis can do: it never needs a heavier moon than the timing forecast (Kay 1998).
      expect(above, p.name).toBe(false);
    }
    expect(r.planets.slice(2).every((p) => p.bound_min_moon_mass_kg === null)).toBe(true);
  }, 120_000);
});

describe('rank: the Monte Carlo tier', () => {
  it('confirms the top planet: the Monte Carlo needs no more transits than the forecast (a lower estimate), and its pdet interval reaches the target', () => {
    const text = demoPlanetCsv(7);
    const r = rankListText(baseDoc, text, 'list.csv', { settings: { probability: 0.9, calendar: false }, confirm: 1, confirmRealizations: 20, confirmNoMoonRealizations: 200 });
    expect(r.mc_confirmed).toBe(1);
    const top = r.planets.find((p) => p.mc_realizations !== null)!;
    expect(top.target_transits_needed).not.toBeNull();
    // Source: the forecast covers the TTV and TDV channels only (computeLimits' assumptions), the Monte Carlo adds the
    // moon dip and the template search, so its count is at most the forecast's (common practice, no source).
    expect(top.mc_transits_needed).not.toBeNull();
    expect(top.mc_transits_needed!).toBeLessThanOrEqual(top.target_transits_needed!);
    expect(top.mc_pdet_upper!).toBeGreaterThanOrEqual(0.9);
    expect(r.planets.filter((p) => p.mc_realizations !== null)).toHaveLength(1);
    expect(() => rankListText(baseDoc, text, 'list.csv', { shard: { k: 1, n: 2 }, confirm: 1 })).toThrow(/--confirm/);
  }, 120_000);
});

describe('rank: detectable moons that cannot survive', () => {
  it('a planet whose smallest detectable moon is heavier than any moon surviving tidal migration says so, and `limits` places that moon the same way', () => {
    const text = demoPlanetCsv(40);
    const r = rankListText(baseDoc, text, 'list.csv', { settings: noCalendar });
    const rows = planetRows(baseDoc, readPlanetTable(text));
    let said = 0;
    for (const p of r.planets) {
      const above = p.min_moon_mass_kg.map((m, k) => (m !== null && m > p.tidal_max_moon_mass_kg ? r.separations_hill[k] : null)).filter((f) => f !== null);
      const note = p.notes.find((n) => n.includes('survives tidal migration'));
      expect(note !== undefined, p.name).toBe(above.length > 0);
      if (!note) continue;
      said++;
      expect(note).toContain(`at ${above.join(', ')} Hill radii`);
      // Source: computeLimits' placement (`moonsieve limits`, Barnes & O'Brien 2002) of that moon on the same planet.
      const s = rows.find((x) => x.row === p.row)!.scenario!;
      const k = r.separations_hill.indexOf(above[0]!);
      const l = computeLimits(moonScenario(scenarioDocumentOf(s), p.min_moon_mass_kg[k]!, above[0]!, scenarioMoonDensity(s), s.name));
      expect(l.moon_placement).toContain('would not survive tidal migration');
    }
    // The invented list has both kinds (the test would be empty otherwise).
    expect(said).toBeGreaterThan(0);
    expect(said).toBeLessThan(r.planets.length);
  }, 60_000);
});
