/**
 * The forecast side of the budget (no Monte Carlo; milliseconds). Expected
 * values come from `computeLimits` (which evaluates the noncentral chi-square
 * forecast of src/physics/detectionForecast.ts for the scenario as given) and
 * from brute-force scans of it; monotonicity follows from the noncentral
 * chi-square survival function rising with the noncentrality λ (Johnson,
 * Kotz & Balakrishnan 1995, ch. 29), with λ ∝ (δ_TTV/σ_tc)² rising with the
 * moon's mass and falling with the noise.
 */
import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { parse } from 'yaml';
import { planBudget } from '../../src/app/planBudget.js';
import { forecastProbability, forecastTransitsNeeded, moonSignal, valuePrecision } from '../../src/budget/budgetForecast.js';
import { solvedQuantity, GEOMETRIC_STEP, MIN_CADENCE_S } from '../../src/budget/solvedQuantity.js';
import { computeLimits } from '../../src/limits/computeLimits.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import { scenarioDurations } from '../../src/photometry/transitWindows.js';
import type { BudgetResult, BudgetTarget, PlanBudgetOptions } from '../../src/budget/budgetTypes.js';

/** planBudget of a scenario document, parsed first as a library caller does. */
const planDoc = (doc: unknown, target?: BudgetTarget, options?: PlanBudgetOptions): BudgetResult => planBudget(parseScenario(doc), target, options);

/** A Sun-like star with a Jupiter at 1 au and a dense, small moon (negligible photocentric TTV), Kepler long cadence. */
function doc(moonMass: string, separation = '10 Rp', noise = '30 ppm per 6.5 h', transits = 8): Record<string, unknown> {
  return parse(`
name: forecast budget test (invented)
seed: 4242
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, age: 4.6 Gyr, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 365.25 d, impact_parameter: 0.2}
moon: {mass: ${moonMass}, radius: 0.1 Rearth, separation: ${separation}}
instrument: {cadence: 29.4244 min, noise: ${noise}}
observation: {transits: ${transits}, baseline: 5 h}
detection: {false_alarm: 0.05}
`) as Record<string, unknown>;
}

const needed = (d: unknown, channel: 'ttv' | 'combined' = 'ttv', probability = 0.9): number => {
  const r = planDoc(d, { forecastOnly: true, channel, probability });
  return r.answer.reached ? r.answer.value! : Number.POSITIVE_INFINITY;
};

describe('budget forecast', () => {
  it('the forecast along the transits grid is computeLimits\' forecast for that many transits', () => {
    const r = planDoc(doc('0.8 Mearth'), { forecastOnly: true, channel: 'ttv' });
    for (const n of [3, 5, 12, 30]) {
      const l = computeLimits(parseScenario(doc('0.8 Mearth', '10 Rp', '30 ppm per 6.5 h', n)));
      expect(r.forecast.probability[r.quantity.values.indexOf(n)]).toBeCloseTo(l.pdet_forecast_ttv!, 12);
    }
    // ...and the joint TTV+TDV forecast for the combined channel.
    const c = planDoc(doc('0.8 Mearth'), { forecastOnly: true, channel: 'combined' });
    const l8 = computeLimits(parseScenario(doc('0.8 Mearth')));
    expect(c.forecast.probability[c.quantity.values.indexOf(8)]).toBeCloseTo(l8.pdet_forecast_joint!, 12);
  });

  it('forecast-only answer = the first n whose computeLimits forecast reaches the target (brute-force scan)', () => {
    const r = planDoc(doc('0.8 Mearth'), { forecastOnly: true, channel: 'ttv', probability: 0.9 });
    let scan = -1;
    for (let n = 3; n <= 50 && scan < 0; n++) {
      if (computeLimits(parseScenario(doc('0.8 Mearth', '10 Rp', '30 ppm per 6.5 h', n))).pdet_forecast_ttv! >= 0.9) scan = n;
    }
    expect(r.answer.reached).toBe(true);
    expect(r.answer.value).toBe(scan);
    expect(r.forecast.applies).toBe(true); // dense moon: photocentric ratio well below 0.2
    // Hours: n × (T14 + 2 × 5 h baseline), T14 from Winn (2010) via scenarioDurations.
    const t14 = scenarioDurations(parseScenario(doc('0.8 Mearth'))).t14S;
    expect(r.answer.hours).toBeCloseTo((scan * (t14 + 2 * 5 * 3600)) / 3600, 9);
  });

  it('forecastTransitsNeeded agrees with a linear scan of the forecast', () => {
    const s = parseScenario(doc('0.3 Mearth'));
    const l = computeLimits(s);
    const sig = moonSignal(l);
    const p = valuePrecision(l);
    let scan: number | null = null;
    for (let n = 3; n <= 2000 && scan === null; n++) if (forecastProbability('ttv', sig, { ...p, transits: n })! >= 0.9) scan = n;
    expect(scan).not.toBeNull();
    expect(forecastTransitsNeeded('ttv', sig, p, 0.9, 3, 2000)).toBe(scan);
    expect(forecastTransitsNeeded('ttv', sig, p, 0.9, 3, scan! - 1)).toBeNull();
  });

  it('monotone (property): a heavier moon on the same orbital period, or lower noise, never needs more transits', () => {
    // The moon's period sets its TTV alias frequency (once-per-transit sampling; Kipping 2009a), and the
    // alias-specific forecast is not monotone in it at small N (see the aliasing test below). So the
    // heavier moon is put on the same period: a ∝ (M_P + M_S)^{1/3} (Kepler III), making its TTV
    // (∝ M_S a_S, Kipping 2009a) strictly larger at the same alias frequency.
    const mp = 317.83; // Jupiter in Earth masses (IAU 2015 nominal GM ratio, from memory to 5 digits)
    fc.assert(
      fc.property(fc.double({ min: 0.3, max: 1.7, noNaN: true }), fc.double({ min: 1.01, max: 3, noNaN: true }), (m, k) => {
        const heavy = m * k;
        const sepHeavy = 10 * Math.cbrt((mp + heavy) / (mp + m));
        const light = computeLimits(parseScenario(doc(`${m} Mearth`)));
        const heavyL = computeLimits(parseScenario(doc(`${heavy} Mearth`, `${sepHeavy} Rp`)));
        expect(heavyL.ttv_alias_frequency_per_epoch!).toBeCloseTo(light.ttv_alias_frequency_per_epoch!, 3);
        expect(needed(doc(`${heavy} Mearth`, `${sepHeavy} Rp`))).toBeLessThanOrEqual(needed(doc(`${m} Mearth`)));
        const noise = 30 * m; // ppm per 6.5 h; k > 1 makes it better
        expect(needed(doc('0.6 Mearth', '10 Rp', `${noise / k} ppm per 6.5 h`))).toBeLessThanOrEqual(needed(doc('0.6 Mearth', '10 Rp', `${noise} ppm per 6.5 h`)));
      }),
      { numRuns: 6, seed: 7 },
    );
  });

  it('monotone: a wider moon (larger TTV, Kipping 2009) never needs more transits at comparable alias frequencies', () => {
    // Pairs whose TTV alias frequencies (once-per-transit sampling, Kipping 2009 MNRAS 392, 181) both lie
    // in 0.15–0.41 cycles/epoch, away from 0 (absorbed by the ephemeris) and ½ (sampled near its zeros).
    for (const [a, b] of [['12 Rp', '24 Rp'], ['10 Rp', '22 Rp'], ['16 Rp', '32 Rp'], ['9 Rp', '19 Rp']]) {
      const la = computeLimits(parseScenario(doc('0.5 Mearth', a)));
      const lb = computeLimits(parseScenario(doc('0.5 Mearth', b)));
      for (const l of [la, lb]) expect(l.ttv_alias_frequency_per_epoch!).toBeGreaterThan(0.15), expect(l.ttv_alias_frequency_per_epoch!).toBeLessThan(0.41);
      expect(lb.ttv_rms_s!).toBeGreaterThan(la.ttv_rms_s!);
      expect(needed(doc('0.5 Mearth', b))).toBeLessThanOrEqual(needed(doc('0.5 Mearth', a)));
    }
  });

  it('...but aliasing can reverse it: a moon whose TTV aliases to ~0 cycles/epoch needs more transits, and the budget says why', () => {
    // At 30 Rp the moon period is nearly a whole fraction of the planet's: ν ≈ 0.012 cycles/epoch, so over
    // tens of transits the TTV looks like an ephemeris drift (detectionForecast.ts, mode 2).
    const wide = planDoc(doc('0.5 Mearth', '30 Rp'), { forecastOnly: true, channel: 'ttv' });
    const narrow = planDoc(doc('0.5 Mearth', '15 Rp'), { forecastOnly: true, channel: 'ttv' });
    expect(wide.answer.value!).toBeGreaterThan(narrow.answer.value!);
    expect(wide.notes.join(' ')).toMatch(/alias/);
  });

  it('an unreachable target gives a clear statement with the reasons, not a loop or a crash', () => {
    const r = planDoc(doc('0.05 Mearth'), { forecastOnly: true, channel: 'ttv', probability: 0.9, maxTransits: 20 });
    expect(r.answer.reached).toBe(false);
    expect(r.answer.value).toBeNull();
    expect(r.answer.statement).toMatch(/cannot be reached/);
    expect(r.answer.reasons.join(' ')).toMatch(/forecast (needs about \d+ transits|does not reach it within)/);
    expect(r.answer.reasons.join(' ')).toMatch(/below the noise/);
  });

  it('cadence and noise grids: the scenario value included, cheapest first, steps of 2^(1/4), cadence within [10 s, T14/3]', () => {
    const d = doc('0.8 Mearth');
    const s = parseScenario(d);
    const c = solvedQuantity('cadence', d, s, 50);
    expect(c.values).toContain(s.instrument.cadenceS);
    for (let i = 1; i < c.values.length; i++) expect(c.values[i - 1] / c.values[i]).toBeCloseTo(GEOMETRIC_STEP, 12);
    expect(c.values[c.values.length - 1]).toBeGreaterThanOrEqual(MIN_CADENCE_S);
    expect(c.values[0]).toBeLessThanOrEqual(scenarioDurations(s).t14S / 3);
    const n = solvedQuantity('noise', d, s, 50);
    expect(n.values).toContain(s.instrument.noiseFraction);
    expect(n.values[0]).toBeGreaterThan(n.values[n.values.length - 1]);
  });
});
