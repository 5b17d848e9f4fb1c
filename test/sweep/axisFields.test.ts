/**
 * Noise-model axes: every numeric field of the white noise, red noise, gaps
 * and ground budget is sweepable by its dotted path; level fields take the
 * same forms as the field ("300 ppm", 3e-4, "50 ppm per 1 h"); an axis that
 * the scenario cannot vary is refused with the field to sweep instead; up to
 * three axes. Expected values are the scenario parser's own reading of the
 * same text (the axis must mean what the field means: common practice, no source).
 */
import { describe, it, expect } from 'vitest';
import { parseSweepSpec, applyAxisValues } from '../../src/sweep/sweepSpec.js';
import { AXIS_FIELDS, parseLevel } from '../../src/sweep/axisFields.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import { InputError } from '../../src/scenario/errors.js';
import { createGrid } from '../../src/sweep/grid.js';
import { HOUR_S, MINUTE_S } from '../../src/physics/constants.js';
import { computeLimits } from '../../src/limits/computeLimits.js';

const WHITE: Record<string, unknown> = {
  name: 'Axis world',
  seed: 3,
  star: { mass: '0.9 Msun', radius: '0.9 Rsun', teff: '5400 K', limb_darkening: { u1: 0.45, u2: 0.2 } },
  planet: { mass: '0.8 Mjup', radius: '1 Rjup', period: '120 d', impact_parameter: 0.2 },
  moon: { mass: '0.5 Mearth', density: '3 g/cm^3', separation: '0.1 hill' },
  instrument: { cadence: '2 min', noise: '300 ppm per 2 min', red_noise: { model: 'power_law', amplitude: '150 ppm per 30 min', slope: 1 } },
  observation: { transits: 6, duty_cycle: 0.8, gap_length: '20 min', missed_fraction: 0.1 },
};

const GROUND: Record<string, unknown> = {
  ...WHITE,
  instrument: { cadence: '2 min', exposure: '100 s', ground: { aperture: '1 m', magnitude: 12, airmass: 1.2, floor: '100 ppm per 10 min' } },
};

const withAxes = (doc: Record<string, unknown>, axes: unknown[]) => ({ ...doc, sweep: { axes } });
const spec = (doc: Record<string, unknown>) => parseSweepSpec(doc, parseScenario(doc));

function problems(f: () => unknown): Array<{ path: string; allowed: string }> {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e.problems;
    throw e;
  }
  throw new Error('expected an InputError');
}

/** The scenario of the axis's last value. */
function lastCell(doc: Record<string, unknown>, axis: Record<string, unknown>) {
  const s = spec(withAxes(doc, [axis]));
  const a = s.axes[0];
  return { axis: a, cell: parseScenario(applyAxisValues(doc, s.axes, [a.values[a.values.length - 1]])) };
}

describe('noise-model fields are sweepable', () => {
  it('lists every numeric field of white noise, red noise, gaps and the ground budget', () => {
    for (const f of [
      'instrument.noise', 'instrument.red_noise.amplitude', 'instrument.red_noise.slope', 'instrument.red_noise.timescale',
      'observation.duty_cycle', 'observation.missed_fraction', 'observation.gap_length',
      'instrument.ground.aperture', 'instrument.ground.magnitude', 'instrument.ground.throughput', 'instrument.ground.airmass',
      'instrument.ground.altitude', 'instrument.ground.scintillation_coefficient', 'instrument.ground.floor',
    ]) expect(AXIS_FIELDS.has(f), f).toBe(true);
  });

  it('ground aperture, magnitude, airmass, altitude and floor reach the ground budget (nested paths)', () => {
    const base = parseScenario(GROUND).instrument.ground!;
    const ap = lastCell(GROUND, { field: 'instrument.ground.aperture', from: '0.5 m', to: '2 m', count: 3 }).cell.instrument;
    expect(ap.ground!.apertureM).toBe(2);
    // Photon noise falls with a bigger aperture (∝ 1/D, Howell 2006, ch. 4), so the total falls.
    expect(ap.noiseFraction).toBeLessThan(base.terms.total);
    const mag = lastCell(GROUND, { field: 'instrument.ground.magnitude', from: 10, to: 14, count: 3 }).cell.instrument;
    expect(mag.ground!.magnitude).toBe(14);
    expect(mag.ground!.terms.photon).toBeGreaterThan(base.terms.photon);
    const am = lastCell(GROUND, { field: 'instrument.ground.airmass', from: 1, to: 2, count: 2 }).cell.instrument;
    expect(am.ground!.airmass).toBe(2);
    expect(lastCell(GROUND, { field: 'instrument.ground.altitude', from: 500, to: 2400, count: 2 }).cell.instrument.ground!.altitudeM).toBe(2400);
    expect(lastCell(GROUND, { field: 'instrument.ground.throughput', from: 0.2, to: 0.6, count: 2 }).cell.instrument.ground!.throughput).toBe(0.6);
    expect(lastCell(GROUND, { field: 'instrument.ground.scintillation_coefficient', from: 1.3, to: 1.7, count: 2 }).cell.instrument.ground!.scintillationCoefficient).toBe(1.7);
    const fl = lastCell(GROUND, { field: 'instrument.ground.floor', from: '50 ppm', to: '400 ppm', count: 2 });
    // Bare ends keep the scenario's timescale (10 min).
    expect(fl.axis.timescaleS).toBe(10 * MINUTE_S);
    expect(fl.cell.instrument.ground!.floorFraction).toBeCloseTo(400e-6, 15);
    expect(fl.cell.instrument.ground!.floorTimescaleS).toBe(10 * MINUTE_S);
  });

  it('red noise and gap fields reach the cell scenario', () => {
    const amp = lastCell(WHITE, { field: 'instrument.red_noise.amplitude', from: '50 ppm per 1 h', to: '400 ppm per 1 h', count: 2, spacing: 'log' });
    expect(amp.cell.instrument.redNoise).toMatchObject({ model: 'power_law', timescaleS: HOUR_S });
    expect((amp.cell.instrument.redNoise as { rmsFraction: number }).rmsFraction).toBeCloseTo(400e-6, 15);
    expect((lastCell(WHITE, { field: 'instrument.red_noise.slope', from: 0.5, to: 2, count: 2 }).cell.instrument.redNoise as { beta: number }).beta).toBe(2);
    expect(lastCell(WHITE, { field: 'observation.duty_cycle', from: 0.5, to: 1, count: 2 }).cell.observation.dutyCycle).toBe(1);
    expect(lastCell(WHITE, { field: 'observation.missed_fraction', from: 0, to: 0.5, count: 2 }).cell.observation.missedFraction).toBe(0.5);
    expect(lastCell(WHITE, { field: 'observation.gap_length', from: 5, to: '1 h', count: 2 }).cell.observation.gapLengthS).toBe(HOUR_S);
    const drw = { ...WHITE, instrument: { cadence: '2 min', noise: '300 ppm per 2 min', red_noise: { model: 'drw', amplitude: '200 ppm', timescale: '45 min' } } };
    const tau = lastCell(drw, { field: 'instrument.red_noise.timescale', from: 10, to: '2 h', count: 2 }).cell.instrument.redNoise as { tauS: number };
    expect(tau.tauS).toBe(2 * HOUR_S);
    // A damped random walk's amplitude is a bare rms: bare ends stay bare.
    const drwAmp = lastCell(drw, { field: 'instrument.red_noise.amplitude', from: '100 ppm', to: '300 ppm', count: 2 });
    expect(drwAmp.axis.timescaleS).toBeUndefined();
    expect((drwAmp.cell.instrument.redNoise as { rmsFraction: number }).rmsFraction).toBeCloseTo(300e-6, 15);
  });

  it('refuses a field the scenario has no block or model for, naming what to sweep instead', () => {
    const p = problems(() => spec(withAxes(GROUND, [{ field: 'instrument.noise', from: '100 ppm', to: '1000 ppm', count: 2 }])));
    expect(p[0].path).toBe('sweep.axes[0].field');
    expect(p[0].allowed).toMatch(/ground budget.*sweep instrument\.ground\.aperture.*instrument\.ground\.magnitude.*instrument\.ground\.floor/);
    const q = problems(() => spec(withAxes(WHITE, [{ field: 'instrument.ground.aperture', from: '1 m', to: '2 m', count: 2 }])));
    expect(q[0].allowed).toMatch(/no ground budget.*instrument\.noise/);
    const r = problems(() => spec(withAxes(WHITE, [{ field: 'instrument.red_noise.timescale', from: 10, to: 20, count: 2 }])));
    expect(r[0].allowed).toMatch(/drw red-noise model.*power_law/);
    const { red_noise: _r, ...noRed } = WHITE.instrument as Record<string, unknown>;
    void _r;
    const s = problems(() => spec(withAxes({ ...WHITE, instrument: noRed }, [{ field: 'instrument.red_noise.amplitude', from: '1 ppm', to: '2 ppm', count: 2 }])));
    expect(s[0].allowed).toMatch(/no instrument\.red_noise block/);
  });
});

describe('axis endpoints take the same forms as the field', () => {
  it('instrument.noise: "X per T" states every value at T (the form the field requires)', () => {
    const { axis, cell } = lastCell(WHITE, { field: 'instrument.noise', from: '50 ppm per 1 h', to: '500 ppm per 1 h', count: 3, spacing: 'log' });
    expect(axis.from).toBeCloseTo(50e-6, 18);
    expect(axis.timescaleS).toBe(HOUR_S);
    // The same text parsed by the scenario itself (the field's own reading).
    const direct = parseScenario({ ...WHITE, instrument: { ...(WHITE.instrument as object), noise: '500 ppm per 1 h' } }).instrument;
    expect(cell.instrument.noiseFraction).toBeCloseTo(direct.noiseFraction, 15);
    expect(cell.instrument.noiseTimescaleS).toBe(direct.noiseTimescaleS);
  });

  it('instrument.noise: a percentage, a bare fraction and ppm without a timescale keep the scenario\'s (2 min)', () => {
    for (const [from, to, top] of [['0.01 %', '0.1 %', 1e-3], [1e-4, 1e-3, 1e-3], ['100 ppm', '1000 ppm', 1e-3]] as const) {
      const { axis, cell } = lastCell(WHITE, { field: 'instrument.noise', from, to, count: 2 });
      expect(axis.timescaleS).toBe(2 * MINUTE_S);
      expect(cell.instrument.noiseFraction).toBeCloseTo(top, 15);
      expect(cell.instrument.noiseTimescaleS).toBe(2 * MINUTE_S);
    }
  });

  it('an end without a timescale takes the other end\'s; different timescales are refused', () => {
    const s = spec(withAxes(WHITE, [{ field: 'instrument.noise', from: '50 ppm per 30 min', to: '500 ppm', count: 2 }]));
    expect(s.axes[0].timescaleS).toBe(30 * MINUTE_S);
    expect(s.notes.join(' ')).toMatch(/read at the other end's, per 1800 s/);
    const p = problems(() => spec(withAxes(WHITE, [{ field: 'instrument.noise', from: '50 ppm per 30 min', to: '500 ppm per 1 h', count: 2 }])));
    expect(p[0].path).toBe('sweep.axes[0].to');
    expect(p[0].allowed).toMatch(/same timescale/);
  });

  it('a malformed level is refused on its end with the allowed forms', () => {
    const p = problems(() => spec(withAxes(WHITE, [{ field: 'instrument.noise', from: '50 ppm per parsec', to: '500 ppm', count: 2 }])));
    expect(p[0].path).toBe('sweep.axes[0].from');
    expect(p[0].allowed).toMatch(/"50 ppm per 1 h"/);
    expect(() => parseLevel('3 kg', 'x')).toThrow(InputError);
    expect(parseLevel('2 %', 'x')).toEqual({ fraction: 0.02 });
  });

  it('other forms: units, bare numbers in the field\'s bare unit', () => {
    // Bare gap length is minutes, bare period days, as in the scenario.
    expect(lastCell(WHITE, { field: 'observation.gap_length', from: 5, to: 30, count: 2 }).cell.observation.gapLengthS).toBe(30 * MINUTE_S);
    expect(lastCell(WHITE, { field: 'planet.period', from: 100, to: 130, count: 2 }).cell.planet.periodS).toBe(130 * 86400);
    expect(lastCell(GROUND, { field: 'instrument.ground.aperture', from: '40 cm', to: '150 cm', count: 2 }).cell.instrument.ground!.apertureM).toBeCloseTo(1.5, 12);
    // The aperture, like the field, needs a unit.
    expect(problems(() => spec(withAxes(GROUND, [{ field: 'instrument.ground.aperture', from: 1, to: 2, count: 2 }])))[0].allowed).toMatch(/unit is required/);
  });
});

describe('every form an endpoint takes is the field\'s own', () => {
  const end = (doc: Record<string, unknown>, field: string, from: unknown, to: unknown) => spec(withAxes(doc, [{ field, from, to, count: 2 }])).axes[0];
  const base = parseScenario(WHITE);

  it('moon separation: "f hill", "N Rp", roche/stable and a length', () => {
    const lim = computeLimits(base);
    expect(end(WHITE, 'moon.separation', '0.1 hill', '0.3 hill').to).toBeCloseTo(0.3 * lim.hill_radius_m, 3);
    expect(end(WHITE, 'moon.separation', '5 Rp', '12 Rp').to).toBe(12 * base.planet.radiusM);
    expect(end(WHITE, 'moon.separation', 'roche', 'stable').from).toBe(lim.roche_limit_m);
    expect(end(WHITE, 'moon.separation', '1e9 m', '2e6 km').to).toBe(2e9);
  });

  it('angles in degrees (bare or with a unit), a bare temperature in K, a percentage, a whole number', () => {
    expect(end(WHITE, 'planet.inclination', 89.5, '90 deg').from).toBeCloseTo(89.5 * Math.PI / 180, 15);
    expect(end(WHITE, 'moon.inclination', '0.1 rad', 30).to).toBeCloseTo(Math.PI / 6, 15);
    expect(end(WHITE, 'star.teff', 5000, '6000 K').from).toBe(5000);
    expect(end(WHITE, 'detection.false_alarm', '0.1 %', 0.05).from).toBeCloseTo(1e-3, 18);
    expect(end(WHITE, 'observation.transits', 3, 9).values).toEqual([3, 9]);
  });

  it('a level the field itself refuses is refused on that end with the field\'s reason', () => {
    // A damped random walk's amplitude is a stationary rms (a fraction), not a level at a timescale, as the scenario says.
    const drw = { ...WHITE, instrument: { cadence: '2 min', noise: '300 ppm per 2 min', red_noise: { model: 'drw', amplitude: '200 ppm', timescale: '45 min' } } };
    const p = problems(() => spec(withAxes(drw, [{ field: 'instrument.red_noise.amplitude', from: '100 ppm per 1 h', to: '200 ppm per 1 h', count: 2 }])));
    expect(p.map((x) => x.path)).toEqual(['sweep.axes[0].from', 'sweep.axes[0].to']);
    expect(p[0].allowed).toMatch(/instrument\.red_noise\.amplitude = 100 ppm per 3600 s the scenario is refused: instrument\.red_noise\.amplitude: .*a dimensionless fraction/);
    // Bare ends over a power law keep the scenario's averaging timescale (30 min).
    expect(spec(withAxes(WHITE, [{ field: 'instrument.red_noise.amplitude', from: '100 ppm', to: '200 ppm', count: 2 }])).axes[0].timescaleS).toBe(30 * MINUTE_S);
  });
});

describe('an axis may list its values, each in the field\'s own form', () => {
  it('uneven apertures in mixed units; levels at one timescale; written into each cell', () => {
    const s = spec(withAxes(GROUND, [{ field: 'instrument.ground.aperture', values: ['40 cm', '1 m', '2.5 m'], spacing: 'log' }]));
    expect(s.axes[0].values).toEqual([0.4, 1, 2.5]);
    expect([s.axes[0].fromText, s.axes[0].toText, s.axes[0].count]).toEqual(['40 cm', '2.5 m', 3]);
    expect(parseScenario(applyAxisValues(GROUND, s.axes, [1])).instrument.ground!.apertureM).toBe(1);
    const n = spec(withAxes(WHITE, [{ field: 'instrument.noise', values: ['800 ppm per 1 h', '400 ppm', '100 ppm per 1 h'] }]));
    expect(n.axes[0].timescaleS).toBe(HOUR_S);
    expect(n.axes[0].values[1]).toBeCloseTo(400e-6, 18);
  });

  it('refuses a list with from/to, out of order, with mixed timescales, or a value the field refuses', () => {
    expect(problems(() => spec(withAxes(GROUND, [{ field: 'instrument.ground.aperture', values: ['1 m'], from: '1 m' }])))[0].allowed).toMatch(/either a list of values or from, to and count/);
    const order = problems(() => spec(withAxes(GROUND, [{ field: 'instrument.ground.aperture', values: ['1 m', '2 m', '1.5 m'] }])));
    expect(order[0].path).toBe('sweep.axes[0].values[2]');
    expect(order[0].allowed).toMatch(/increasing \(or decreasing\) order/);
    const ts = problems(() => spec(withAxes(WHITE, [{ field: 'instrument.noise', values: ['100 ppm per 1 h', '200 ppm per 2 h'] }])));
    expect(ts[0].path).toBe('sweep.axes[0].values[1]');
    // The middle value is checked against the scenario as well (magnitude above 25 is refused).
    const mid = problems(() => spec(withAxes(GROUND, [{ field: 'instrument.ground.magnitude', values: [10, 30, 40] }])));
    expect(mid.map((x) => x.path)).toEqual(['sweep.axes[0].values[1]', 'sweep.axes[0].values[2]']);
    expect(problems(() => spec(withAxes(GROUND, [{ field: 'instrument.ground.aperture', values: [] }])))[0].path).toBe('sweep.axes[0].values');
  });
});

describe('three axes', () => {
  it('are accepted, four are refused; the grid is row-major, last axis fastest', () => {
    const s = spec(withAxes(GROUND, [
      { field: 'moon.mass', from: '0.1 Mearth', to: '1 Mearth', count: 3, spacing: 'log' },
      { field: 'moon.separation', from: '0.05 hill', to: '0.4 hill', count: 2 },
      { field: 'instrument.ground.aperture', from: '0.5 m', to: '2 m', count: 2 },
    ]));
    expect(s.axes.map((a) => a.field)).toEqual(['moon.mass', 'moon.separation', 'instrument.ground.aperture']);
    const g = createGrid(s.axes.map((a) => a.values));
    expect(g.total).toBe(12);
    // index = i0·(2·2) + i1·2 + i2
    expect(g.cellAxisIndices(7)).toEqual([1, 1, 1]);
    expect(g.cellAxisIndices(10)).toEqual([2, 1, 0]);
    const ax = { field: 'moon.mass', from: '0.1 Mearth', to: '1 Mearth', count: 2 };
    const p = problems(() => spec(withAxes(WHITE, [ax, { ...ax, field: 'moon.eccentricity', from: 0, to: 0.1 }, { ...ax, field: 'planet.albedo', from: 0, to: 0.5 }, { ...ax, field: 'moon.albedo', from: 0, to: 0.5 }])));
    expect(p[0].path).toBe('sweep.axes');
    expect(p[0].allowed).toMatch(/one to 3 axes/);
  });
});
