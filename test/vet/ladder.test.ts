/**
 * The verdict ladder (issue 19): noise is "no_signal" at the stated false-alarm rate, strong moons
 * are "consistent", an Earth–Moon-like signal gives the Moon's mass, decisive contradictions are
 * "implausible" with their reason first, a near-resonant perturber is not taken for a moon, and
 * the exclusion map contains the moons that injections detect. Every system here is invented.
 */
import { describe, it, expect } from 'vitest';
import { parseClaimText } from '../../src/vet/loadClaim.js';
import { vetClaim } from '../../src/vet/vetClaim.js';
import { decideSignal } from '../../src/vet/signalDetection.js';
import { createRng } from '../../src/noise/rng.js';
import { timingSignals } from '../../src/physics/timingSignals.js';
import { transitAveraging } from '../../src/physics/transitAveraging.js';
import { AU_M, DAY_S, M_EARTH_KG, M_JUP_KG, M_SUN_KG } from '../../src/physics/constants.js';
import type { Claim, TimingTable } from '../../src/vet/claimTypes.js';

const NO_MAP = { exclusionGrid: null };

/** An invented system: a Saturn-mass planet on a 120-day orbit around a K dwarf. */
const system = (claimBlock: string, planet = '{mass: 0.3 Mjup, radius: 0.85 Rjup, period: 120 d, impact_parameter: 0.2}') => parseClaimText(`
name: invented
seed: 3
star: {mass: 0.8 Msun, radius: 0.78 Rsun, teff: 5000 K, limb_darkening: {u1: 0.5, u2: 0.2}}
planet: ${planet}
claim:
${claimBlock}`, 'ladder.yaml');

/** A timing table in SI (no file): epochs with one gap, given TTV/TDV series plus white noise. */
function table(n: number, errS: number, durErrS: number, periodS: number, durationS: number, seed: number, signal?: (e: number) => [number, number]): TimingTable {
  const epochs = new Float64Array(n);
  for (let i = 0; i < n; i++) epochs[i] = i + (i >= n / 2 ? 2 : 0);
  const rng = createRng(seed, 0, 0);
  const timeS = new Float64Array(n);
  const durS = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const [ttv, tdv] = signal ? signal(epochs[i]) : [0, 0];
    timeS[i] = epochs[i] * periodS + ttv + errS * rng.normal();
    durS[i] = durationS + tdv + durErrS * rng.normal();
  }
  return {
    source: 'invented.csv', timeStandard: 'BJD_TDB', epochs, epochsInferred: false, timeS, timeErrS: new Float64Array(n).fill(errS),
    referenceBjdTdb: 2460000, durationS: durS, durationErrS: new Float64Array(n).fill(durErrS),
  };
}

/** A table claim built on the system's claim (amplitudes replaced by the table). */
function tableClaim(c: Claim, t: TimingTable, falseAlarm = 0.05): Claim {
  return { ...c, ttv: null, tdv: null, table: t, transits: t.epochs.length, falseAlarm };
}

/** Observed TTV/TDV semi-amplitudes and period of a coplanar circular moon (physics/timingSignals.ts forward model, transit-averaged). */
function moonSignal(c: Claim, durationS: number, moonMassKg: number, separationM: number) {
  const f = timingSignals({
    planetMassKg: c.planet.massKg, moonMassKg, moonSeparationM: separationM, moonEccentricity: 0, moonInclinationRad: 0, moonNodeRad: 0, moonPeriapsisRad: 0,
    barycentreSemiMajorAxisM: c.planet.semiMajorAxisM, barycentrePeriodS: c.planet.periodS, barycentreEccentricity: c.planet.eccentricity, barycentreOmegaRad: c.planet.omegaRad,
    durationS,
  });
  const a = transitAveraging(durationS, f.moonPeriodS);
  return { ttvSemiS: Math.SQRT2 * f.ttvRmsS * a.ttvFactor, tdvSemiS: Math.SQRT2 * f.tdvRmsS * a.tdvFactor, periodS: f.moonPeriodS };
}

const amplitudeBlock = '  ttv: {amplitude: 1 s, uncertainty: 1 s, kind: rms}\n  transits: 20';

describe('vet verdict ladder (issue 19)', () => {
  it('noise-only tables are "no_signal" in ≥ 95 % of 300 seeds at α = 5 % (definition of a false-alarm level; common practice)', () => {
    const c = system(amplitudeBlock);
    const dur = vetClaim({ ...c, draws: 200 }, NO_MAP).system.durationS;
    let quiet = 0;
    const seeds = 300;
    for (let s = 0; s < seeds; s++) {
      const r = vetClaim(tableClaim(c, table(16, 40, 90, c.planet.periodS, dur, 1000 + s)), NO_MAP);
      if (r.verdict === 'no_signal') {
        quiet++;
        expect(r.implied).toBeNull(); // no implied moon is checked as if it were a signal
      }
    }
    expect(quiet / seeds).toBeGreaterThanOrEqual(0.95);
  });

  it('moons injected well above the noise are "consistent" (forward model physics/timingSignals.ts, Kipping 2009a)', () => {
    const c = system(amplitudeBlock);
    const dur = vetClaim({ ...c, draws: 200 }, NO_MAP).system.durationS;
    const rp = c.planet.radiusM;
    const m = moonSignal(c, dur, 0.05 * M_EARTH_KG, 8 * rp); // mass ratio 5e-4, well inside the stable band
    for (let s = 0; s < 5; s++) {
      const sig = (e: number): [number, number] => {
        const th = (2 * Math.PI * e * c.planet.periodS) / m.periodS + s;
        return [m.ttvSemiS * Math.sin(th), m.tdvSemiS * Math.cos(th)];
      };
      // Errors a tenth of the amplitudes: the signal stands far above the noise.
      const r = vetClaim({ ...tableClaim(c, table(30, 0.1 * m.ttvSemiS, 0.1 * m.tdvSemiS, c.planet.periodS, dur, 50 + s, sig)), orientation: 'coplanar', draws: 1000 }, NO_MAP);
      expect(r.verdict, r.reasons.join('\n')).toBe('consistent');
      expect(r.implied!.massKg.median! / (0.05 * M_EARTH_KG)).toBeGreaterThan(0.7);
      expect(r.implied!.massKg.median! / (0.05 * M_EARTH_KG)).toBeLessThan(1.4);
    }
  });

  it('an Earth–Moon-like signal is "consistent" with an implied moon within 20 % of the Moon\'s mass', () => {
    // Sartoretti & Schneider 1999 (A&AS 134, 553): TTV semi-amplitude a_PB/v_P with a_PB = a_S M_S/(M_P + M_S).
    // Moon 7.342e22 kg at 384 400 km, Earth 5.972e24 kg at 1 AU (standard planetary data, from memory):
    // a_PB = 4671 km, v_P = 2π AU/yr = 29.8 km/s → 157 s = 2.6 min (Fox & Wiegert 2021 quote ≈ 2.6 min seen from afar).
    const moonKg = 7.342e22;
    const aS = 3.844e8;
    const aPB = (aS * moonKg) / (M_EARTH_KG + moonKg);
    const vP = (2 * Math.PI * AU_M) / (365.25 * DAY_S);
    const ttvSemi = aPB / vP;
    expect(ttvSemi / 60).toBeCloseTo(2.6, 1);
    const c0 = system('  ttv: {amplitude: 1 s, uncertainty: 1 s, kind: rms}\n  transits: 30\n  orientation: coplanar', '{mass: 1 Mearth, radius: 1 Rearth, period: 365.25 d, impact_parameter: 0}');
    const c = { ...c0, star: { ...c0.star, massKg: M_SUN_KG, radiusM: 6.957e8 } };
    const dur = vetClaim({ ...c, draws: 200 }, NO_MAP).system.durationS;
    // Matching TDV: A_TDV = τ̄ v_PB / v_B, v_PB = 2π a_PB / P_S (Kipping 2009a, MNRAS 392, 181, eqs. for the velocity TDV), sidereal month 27.32 d.
    const tdvSemi = (dur * 2 * Math.PI * aPB) / (27.32 * DAY_S) / vP;
    const r = vetClaim({
      ...c,
      ttv: { valueS: ttvSemi, errorS: 0.05 * ttvSemi, kind: 'semi-amplitude' },
      tdv: { valueS: tdvSemi, errorS: 0.05 * tdvSemi, kind: 'semi-amplitude' },
    }, NO_MAP);
    expect(r.verdict, r.reasons.join('\n')).toBe('consistent');
    // Coplanar median within 20 % of the Moon's mass (the tolerance).
    expect(Math.abs(r.implied!.massKg.median! / moonKg - 1)).toBeLessThan(0.2);
  });

  it('a moon heavier than its planet is "implausible", with that reason first (a satellite is the lighter body)', () => {
    const c = system(amplitudeBlock, '{mass: 1 Mjup, radius: 1 Rjup, period: 300 d, impact_parameter: 0.2}');
    const dur = vetClaim({ ...c, draws: 200 }, NO_MAP).system.durationS;
    const m = moonSignal(c, dur, 3 * M_JUP_KG, 6 * c.planet.radiusM);
    const r = vetClaim({ ...c, orientation: 'coplanar', ttv: { valueS: m.ttvSemiS, errorS: 0.03 * m.ttvSemiS, kind: 'semi-amplitude' }, tdv: { valueS: m.tdvSemiS, errorS: 0.03 * m.tdvSemiS, kind: 'semi-amplitude' } }, NO_MAP);
    expect(r.verdict).toBe('implausible');
    expect(r.reasons[0]).toMatch(/^FAIL \(decisive\) moon lighter than its planet/);
    expect(r.checks.find((k) => k.id === 'barycentre')!.status).toBe('fail');
    // Claimed as a binary planet, the barycentre outside the planet is no contradiction (common practice, no source).
    const binary = vetClaim({ ...c, companion: 'binary_planet', orientation: 'coplanar', ttv: { valueS: m.ttvSemiS, errorS: 0.03 * m.ttvSemiS, kind: 'semi-amplitude' }, tdv: { valueS: m.tdvSemiS, errorS: 0.03 * m.tdvSemiS, kind: 'semi-amplitude' } }, NO_MAP);
    expect(binary.checks.find((k) => k.id === 'barycentre')!.status).toBe('not tested');
  });

  it('claim.false_alarm and claim.companion are read, and a bad value names the key and what is allowed', () => {
    expect(system(amplitudeBlock + '\n  false_alarm: 0.05\n  companion: binary_planet').falseAlarm).toBe(0.05);
    expect(system(amplitudeBlock).falseAlarm).toBe(0.01);
    expect(() => system(amplitudeBlock + '\n  false_alarm: 2')).toThrow(/claim\.false_alarm.*1e-6 to 0\.5/);
    expect(() => system(amplitudeBlock + '\n  companion: planet')).toThrow(/claim\.companion/);
  });

  it('a near-resonant perturbing planet\'s TTV (Lithwick, Xie & Wu 2012) is not "consistent", and the perturber ranks first', () => {
    // Lithwick, Xie & Wu 2012, ApJ 761, 122, eqs. 5–8 with no free eccentricity: TTV = |V| sin λ^j,
    // |V| = P μ′ |f| / (π j^{2/3} (j−1)^{1/3} |Δ|), Δ = (P′/P)(j−1)/j − 1, super-period 1/|j/P′ − (j−1)/P|,
    // f ≈ −1.19 for 2:1 (their Table/eq. values, from memory). Inner transiting planet P = 20 d; a 10 Mearth
    // perturber at Δ = 0.05 outside 2:1 around a 1 Msun star.
    const c = system(amplitudeBlock, '{mass: 20 Mearth, radius: 4 Rearth, period: 20 d, impact_parameter: 0.3}');
    const P = c.planet.periodS;
    const j = 2;
    const delta = 0.05;
    const Pp = (P * j * (1 + delta)) / (j - 1);
    const mu = (10 * M_EARTH_KG) / c.star.massKg;
    const V = (P * mu * 1.19) / (Math.PI * Math.pow(j, 2 / 3) * Math.pow(j - 1, 1 / 3) * delta);
    const superPeriod = 1 / Math.abs(j / Pp - (j - 1) / P);
    expect(P / superPeriod).toBeLessThan(0.2); // ν = (j−1)|Δ| in cycles per epoch
    const dur = vetClaim({ ...c, draws: 200 }, NO_MAP).system.durationS;
    const sig = (e: number): [number, number] => [V * Math.sin((2 * Math.PI * e * P) / superPeriod + 0.7), 0];
    const r = vetClaim({ ...tableClaim(c, table(60, 0.15 * V, 60, P, dur, 77, sig), 0.01), draws: 1000 }, NO_MAP);
    expect(r.signal.detected).toBe(true);
    expect(r.verdict, r.reasons.join('\n')).not.toBe('consistent');
    expect(r.alternatives![0].id).toBe('perturbing_planet');
  });

  it('exclusion map: moons that injections detect ≥ 95 % of the time lie inside the excluded region (Kipping 2009a forward model, same detection rule)', () => {
    const c = system(amplitudeBlock);
    const dur = vetClaim({ ...c, draws: 200 }, NO_MAP).system.durationS;
    const t = table(16, 40, 90, c.planet.periodS, dur, 4242);
    const r = vetClaim(tableClaim(c, t), { exclusionGrid: { separations: 4, masses: 16, realizations: 50 } });
    expect(r.verdict).toBe('no_signal');
    const ex = r.exclusion!;
    let checked = 0;
    for (let jj = 0; jj < ex.separationM.length; jj++) {
      const lim = ex.upperLimitKg[jj];
      if (lim === null) continue;
      for (const k of [0.5, 0.8, 1.25, 2]) {
        const mass = k * lim;
        // Independent injections: the physics forward model, a random phase and an isotropic orbit normal.
        const m = moonSignal(c, dur, mass, ex.separationM[jj]);
        let hits = 0;
        const R = 400;
        for (let q = 0; q < R; q++) {
          const rng = createRng(99, jj * 10 + Math.round(10 * k), q);
          const ph = 2 * Math.PI * rng.uniform();
          const u = 2 * rng.uniform() - 1;
          const phi = Math.sqrt(1 - u * u);
          const timeS = new Float64Array(t.epochs.length);
          const durS = new Float64Array(t.epochs.length);
          for (let i = 0; i < t.epochs.length; i++) {
            const th = (2 * Math.PI * t.epochs[i] * c.planet.periodS) / m.periodS + ph;
            timeS[i] = t.epochs[i] * c.planet.periodS + phi * m.ttvSemiS * Math.sin(th) + 40 * rng.normal();
            durS[i] = dur + phi * m.tdvSemiS * Math.cos(th) + 90 * rng.normal();
          }
          if (decideSignal({ epochs: t.epochs, timeS, timeErrS: t.timeErrS, durationS: durS, durationErrS: t.durationErrS }, 0.05).detected) hits++;
        }
        // "Detected ≥ 95 %" with a 2σ binomial margin on the test's own R injections (Monte Carlo error).
        if (hits / R >= 0.95 + 2 * Math.sqrt((0.95 * 0.05) / R)) {
          checked++;
          expect(mass, `separation ${ex.separationM[jj]}, detected ${hits / R}`).toBeGreaterThanOrEqual(lim);
        }
      }
    }
    expect(checked).toBeGreaterThan(0);
  });
});
