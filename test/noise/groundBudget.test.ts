import { describe, it, expect } from 'vitest';
import {
  groundNoiseBudget,
  scintillationOsborn,
  scintillationYoung,
  V_BAND_ZERO_POINT_PHOTONS_PER_S_M2,
  type GroundBudgetInput,
} from '../../src/noise/groundBudget.js';

const base: GroundBudgetInput = {
  apertureDiameterM: 1,
  magnitude: 10,
  zeroPointPhotonsPerSM2: 8.47e9,
  throughput: 0.5,
  exposureS: 60,
  sky: { surfaceBrightnessMagPerArcsec2: 21, apertureRadiusArcsec: 5 },
  readNoise: { electronsPerPixel: 10, pixels: 25 },
  scintillation: { model: 'osborn2015', airmass: 1.2, altitudeM: 2400 },
  floor: { fraction: 60e-6, timescaleS: 3600 },
};

describe('groundNoiseBudget: a hand-computed case', () => {
  // Expected values computed by hand (python3, double precision) from the formulas in groundBudget.ts:
  // N* = 8.47e9·10^(−4)·(π/4)·0.5·60 = 19956967.33 e⁻; photon = 1/√N*; sky = √(8.47e9·10^(−8.4)·π·25·(π/4)·0.5·60)/N*;
  // read = √(25·10²)/N*; Osborn et al. 2015 eq. 7 with C_Y = 1.5, D = 1 m, t = 60 s, X = 1.2, h = 2400 m;
  // floor = 60 ppm·√(3600/60); total = quadrature sum; 1 h = per exposure/√60.
  const b = groundNoiseBudget(base);
  it('reproduces each term', () => {
    expect(b.starElectronsPerExposure).toBeCloseTo(19956967.331929162, 4);
    expect(b.perExposure.photon).toBeCloseTo(2.238477465725719e-4, 14);
    expect(b.perExposure.sky).toBeCloseTo(1.2516925503761089e-5, 15);
    expect(b.perExposure.readNoise).toBeCloseTo(2.505390682280918e-6, 16);
    expect(b.perExposure.scintillation).toBeCloseTo(5.963471641493142e-4, 14);
    expect(b.perExposure.floor).toBeCloseTo(4.6475800154489004e-4, 14);
    expect(b.perExposure.total).toBeCloseTo(7.886068121954596e-4, 14);
    expect(b.perHour.total).toBeCloseTo(1.0180870167795783e-4, 14);
    expect(b.dominantTerm).toBe('scintillation');
  });

  it('Young 1967 for the same site (hand-computed: 0.09·100^(−2/3)·1.2^1.75·e^(−0.3)·120^(−1/2))', () => {
    expect(scintillationYoung(1, 1.2, 2400, 60)).toBeCloseTo(3.886846494234747e-4, 14);
    const y = groundNoiseBudget({ ...base, scintillation: { model: 'young1967', airmass: 1.2, altitudeM: 2400 } });
    expect(y.perExposure.scintillation).toBeCloseTo(3.886846494234747e-4, 14);
  });
});

describe('groundNoiseBudget: scaling laws', () => {
  const noScint: GroundBudgetInput = { ...base, sky: undefined, readNoise: undefined, scintillation: undefined, floor: undefined };
  it('photon noise ∝ D⁻¹ and ∝ t^(−1/2), ×10^(0.2 Δm) per magnitude (Poisson statistics, common practice)', () => {
    const p1 = groundNoiseBudget(noScint).perExposure.photon;
    expect(groundNoiseBudget({ ...noScint, apertureDiameterM: 2 }).perExposure.photon / p1).toBeCloseTo(0.5, 12);
    expect(groundNoiseBudget({ ...noScint, exposureS: 240 }).perExposure.photon / p1).toBeCloseTo(0.5, 12);
    expect(groundNoiseBudget({ ...noScint, magnitude: 12.5 }).perExposure.photon / p1).toBeCloseTo(Math.pow(10, 0.5), 12);
  });

  it('scintillation ∝ D^(−2/3) and t^(−1/2) in both models (Young 1967; Osborn et al. 2015, eq. 7)', () => {
    for (const f of [scintillationYoung, scintillationOsborn]) {
      expect(f(0.4, 1.3, 1000, 30) / f(0.2, 1.3, 1000, 30)).toBeCloseTo(Math.pow(2, -2 / 3), 12);
      expect(f(0.4, 1.3, 1000, 120) / f(0.4, 1.3, 1000, 30)).toBeCloseTo(0.5, 12);
    }
  });

  it('Osborn with C_Y = 1 at zenith is within 7.1 % of Young (prefactor 1e-5, not 1e-6 or 1e-4)', () => {
    // Computed from the two formulas: sqrt(1e-5 / (0.09²/2 · 100^(−4/3))) = 1.0705472 (airmass 1, any D, h, t).
    expect(scintillationOsborn(0.5, 1, 2000, 10, 1) / scintillationYoung(0.5, 1, 2000, 10)).toBeCloseTo(1.070547204443329, 12);
  });

  it('1-h values count exposures per hour from the cadence (dead time), and the dominant term flips with brightness', () => {
    const withGaps = groundNoiseBudget({ ...base, cadenceS: 90 });
    expect(withGaps.perHour.total / withGaps.perExposure.total).toBeCloseTo(Math.sqrt(90 / 3600), 14);
    const faint = groundNoiseBudget({ ...base, magnitude: 16, sky: { surfaceBrightnessMagPerArcsec2: 21, apertureRadiusArcsec: 2 } });
    expect(faint.dominantTerm).toBe('photon');
    const skyLimited = groundNoiseBudget({ ...base, magnitude: 21, sky: { surfaceBrightnessMagPerArcsec2: 18, apertureRadiusArcsec: 8 } });
    expect(skyLimited.dominantTerm).toBe('sky');
  });

  it('uses the V-band default zero point and rejects bad input with RangeError naming the field', () => {
    const d = groundNoiseBudget({ ...noScint, zeroPointPhotonsPerSM2: undefined });
    expect(d.starElectronsPerExposure).toBeCloseTo(V_BAND_ZERO_POINT_PHOTONS_PER_S_M2 * 1e-4 * (Math.PI / 4) * 0.5 * 60, 3);
    expect(() => groundNoiseBudget({ ...base, apertureDiameterM: 0 })).toThrow(/apertureDiameterM/);
    expect(() => groundNoiseBudget({ ...base, throughput: 1.5 })).toThrow(/throughput/);
    expect(() => groundNoiseBudget({ ...base, cadenceS: 30 })).toThrow(/cadenceS/);
    expect(() => groundNoiseBudget({ ...base, scintillation: { airmass: 0.9, altitudeM: 0 } })).toThrow(/airmass/);
    expect(() => groundNoiseBudget({ ...base, obstructionDiameterM: 1 })).toThrow(/obstructionDiameterM/);
    expect(Number.isNaN(scintillationYoung(-1, 1, 0, 1))).toBe(true);
    expect(Number.isNaN(scintillationOsborn(1, 0.5, 0, 1))).toBe(true);
  });
});
