/**
 * The ranking's uncertainty: mass_from_radius rows get a planet-mass range
 * from the Chen & Kipping (2017) radius scatter, a range of the smallest
 * moon, and a rank interval against the others.
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseYamlWithLines } from '../../src/scenario/loadScenario.js';
import type { ScenarioDocument } from '../../src/scenario/types.js';
import { chenKippingRadius } from '../../src/physics/massRadius.js';
import { massFromRadiusRange, rankIntervals, CHEN_KIPPING_RADIUS_SCATTER } from '../../src/rank/rankInterval.js';
import { rankListText } from '../../src/app/rankList.js';
import { M_EARTH_KG, R_EARTH_M } from '../../src/physics/constants.js';

const root = new URL('../../', import.meta.url).pathname;
const baseDoc = parseYamlWithLines(readFileSync(join(root, 'scenarios/demo-rank.yaml'), 'utf8'), 'demo-rank').value as ScenarioDocument;

describe('rank interval: the planet-mass range', () => {
  it('the masses at radius ∓ 1 σ_R give back those radii through the forward relation (Chen & Kipping 2017, Table 1: σ_R 14.6 % Neptunian, 4.03 % Terran)', () => {
    const neptune = 4 * R_EARTH_M;
    const m = 15 * M_EARTH_KG; // only its regime matters
    const [lo, hi] = massFromRadiusRange(neptune, m);
    expect(chenKippingRadius(lo!) / neptune).toBeCloseTo(1 - CHEN_KIPPING_RADIUS_SCATTER.neptunian, 6);
    expect(chenKippingRadius(hi!) / neptune).toBeCloseTo(1 + CHEN_KIPPING_RADIUS_SCATTER.neptunian, 6);
    const earth = 1.1 * R_EARTH_M;
    const [tlo, thi] = massFromRadiusRange(earth, 1.4 * M_EARTH_KG);
    expect(chenKippingRadius(tlo!) / earth).toBeCloseTo(1 - CHEN_KIPPING_RADIUS_SCATTER.terran, 6);
    expect(chenKippingRadius(thi!) / earth).toBeCloseTo(1 + CHEN_KIPPING_RADIUS_SCATTER.terran, 6);
  });
});

describe('rank interval: ranks from intervals (common practice, no source)', () => {
  it('counts planets surely and possibly ahead', () => {
    const p = (rank: number, m: number | null, lo?: number, hi?: number | null) => ({
      rank, best_min_moon_mass_kg: m, flags: lo === undefined ? [] : ['mass_from_radius'],
      best_min_moon_mass_low_kg: lo ?? null, best_min_moon_mass_high_kg: hi === undefined ? null : hi,
    });
    // A: 1 (exact); B: 2 in [1.5, 4]; C: 3 (exact); D: 5 in [4.5, none found]; E: no moon found.
    const r = rankIntervals([p(1, 1), p(2, 2, 1.5, 4), p(3, 3), p(4, 5, 4.5, null), p(5, null)]);
    expect(r).toEqual([[1, 1], [2, 3], [2, 3], [4, 4], [5, 5]]);
    // Without any interval every planet keeps its rank.
    expect(rankIntervals([p(1, 1), p(2, 1), p(3, 2)])).toEqual([[1, 1], [2, 2], [3, 3]]);
  });
});

describe('rank interval: in the list', () => {
  it('a planet without a mass gets a range containing its nominal smallest moon, and a stated-mass planet none', () => {
    const text = 'name,star_mass_msun,star_radius_rsun,star_teff_k,magnitude,band,planet_mass_mjup,planet_radius_rjup,period_d,impact_parameter,ra_deg,dec_deg\n'
      + 'Vessa b,0.8,0.78,5000,10.5,V,,0.35,60,0.2,120.5,-20.25\n'
      + 'Tovren b,0.8,0.78,5000,10.5,V,0.3,0.8,60,0.2,120.5,-20.25\n';
    const r = rankListText(baseDoc, text, 'list.csv', { settings: { probability: 0.9, calendar: false } });
    const v = r.planets.find((p) => p.name === 'Vessa b')!;
    const t = r.planets.find((p) => p.name === 'Tovren b')!;
    expect(v.flags).toContain('mass_from_radius');
    expect(v.planet_mass_low_kg!).toBeLessThan(v.planet_mass_kg);
    expect(v.planet_mass_high_kg!).toBeGreaterThan(v.planet_mass_kg);
    expect(v.best_min_moon_mass_low_kg!).toBeLessThanOrEqual(v.best_min_moon_mass_kg!);
    expect(v.best_min_moon_mass_high_kg!).toBeGreaterThanOrEqual(v.best_min_moon_mass_kg!);
    // The interval is not empty: the smallest moon moves with the planet mass (TTV amplitude ∝ moon mass / planet mass at a fixed separation, Kipping 2009a).
    expect(v.best_min_moon_mass_high_kg!).toBeGreaterThan(1.01 * v.best_min_moon_mass_low_kg!);
    expect([t.planet_mass_low_kg, t.best_min_moon_mass_low_kg, t.best_min_moon_mass_high_kg]).toEqual([null, null, null]);
    for (const p of r.planets) expect(p.rank_best <= p.rank && p.rank <= p.rank_worst).toBe(true);
  }, 60_000);
});

describe('rank interval: what else could enter it (docs/rank.md, "The ranking\'s uncertainty")', () => {
  const H = 'name,star_mass_msun,star_radius_rsun,star_teff_k,noise_ppm_per_hour,planet_mass_mjup,planet_radius_rjup,period_d,impact_parameter,t0_error_min,period_error_d';
  const rows = [
    'Kessa-1 b,0.8,0.78,5000,400,0.3,0.8,60,0.2,2,1e-5',
    'Kessa-2 b,0.8,0.78,5000,400,0.3,0.8,60,0.2,200,1e-3', // ephemeris errors × 100
    'Kessa-3 b,0.8,0.78,5000,420,0.3,0.8,60,0.2,2,1e-5', // noise + 5 %
    'Kessa-4 b,0.8,0.78,5000,400,0.375,0.8,60,0.2,2,1e-5', // planet mass + 25 %
  ];
  const r = rankListText(baseDoc, [H, ...rows].join('\n'), 'list.csv', { settings: { probability: 0.9, calendar: false } });
  const best = (row: number) => r.planets.find((p) => p.row === row)!.best_min_moon_mass_kg!;

  it('the ephemeris errors do not move the reach: the recovery fits t0 and the period from the transits themselves', () => {
    // Source: the TTV test is about the least-squares ephemeris of the observed transits (detectionForecast.ts; Seber & Lee 2003 §2.4),
    // so a prior ephemeris only places the observing windows (the calendar's mid_time_sigma_s).
    expect(best(2)).toBe(best(1));
    expect(r.planets.find((p) => p.row === 2)!.target_transits_needed).toBe(r.planets.find((p) => p.row === 1)!.target_transits_needed);
  });

  it('the smallest moon scales as the noise (TTV ∝ moon mass, Kipping 2009a; λ ∝ (δ/σ)²) and as the planet mass to the 2/3 (a ∝ R_H ∝ M_P^1/3)', () => {
    // Source: derived here from the forecast's noncentrality at fixed pdet: δ_TTV ∝ M_S a_S / M_P with a_S ∝ M_P^{1/3} (Hill radius).
    expect(best(3) / best(1)).toBeCloseTo(1.05, 2);
    expect(best(4) / best(1)).toBeCloseTo(1.25 ** (2 / 3), 2);
  });
});
