import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { pairTransitFlux, pairTransitFluxArray } from '../../src/photometry/pairTransitFlux.js';
import { transitFluxScalar } from '../../src/photometry/transitFlux.js';

// ---------------------------------------------------------------------------
// Independent 2-D brute force (no code shared with src): the star is cut into
// horizontal rows (midpoint rule in y, N rows over the union's y-extent); in
// each row the blocked set is the union of the planet's and the moon's chords,
// each clipped to the star's chord, integrated in x by 16-point Gauss–Legendre
// after x = a + (b − a)(1 − cos t)/2. Normalised by the disc-integrated
// intensity π(1 − u1/3 − u2/6) (elementary integral of I over the disc).
// ---------------------------------------------------------------------------
function legendreRule(n: number): { x: number[]; w: number[] } {
  const x: number[] = [];
  const w: number[] = [];
  for (let i = 0; i < n; i++) {
    let t = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let d = 1;
    for (let it = 0; it < 50; it++) {
      let a = 1;
      let b = t;
      for (let k = 2; k <= n; k++) [a, b] = [b, ((2 * k - 1) * t * b - (k - 1) * a) / k];
      d = (n * (t * b - a)) / (t * t - 1);
      t -= b / d;
    }
    x.push(t);
    w.push(2 / ((1 - t * t) * d * d));
  }
  return { x, w };
}
const RULE = legendreRule(16);

function bruteDeficit(
  xp: number, yp: number, rp: number, xm: number, ym: number, rm: number, u1: number, u2: number, rows: number,
): number {
  const I = (x: number, y: number): number => {
    const mu = Math.sqrt(Math.max(0, 1 - x * x - y * y));
    return 1 - u1 * (1 - mu) - u2 * (1 - mu) * (1 - mu);
  };
  const lineInt = (y: number, a: number, b: number): number => {
    if (!(b > a)) return 0;
    const h = 0.5 * (b - a);
    let s = 0;
    for (let i = 0; i < RULE.x.length; i++) {
      const t = 0.5 * Math.PI * (RULE.x[i] + 1);
      s += RULE.w[i] * I(a + h * (1 - Math.cos(t)), y) * h * Math.sin(t);
    }
    return 0.5 * Math.PI * s;
  };
  const y0 = Math.max(-1, Math.min(yp - rp, ym - rm));
  const y1 = Math.min(1, Math.max(yp + rp, ym + rm));
  const dy = (y1 - y0) / rows;
  let sum = 0;
  for (let j = 0; j < rows; j++) {
    const y = y0 + (j + 0.5) * dy;
    const hs = Math.sqrt(Math.max(0, 1 - y * y));
    const chord = (cx: number, cy: number, r: number): [number, number] => {
      const h2 = r * r - (y - cy) * (y - cy);
      if (h2 <= 0) return [0, 0];
      const h = Math.sqrt(h2);
      return [Math.max(cx - h, -hs), Math.min(cx + h, hs)];
    };
    let [a1, b1] = chord(xp, yp, rp);
    let [a2, b2] = chord(xm, ym, rm);
    if (!(b1 > a1)) [a1, b1] = [0, 0];
    if (!(b2 > a2)) [a2, b2] = [0, 0];
    if (b1 > a1 && b2 > a2 && a2 <= b1 && a1 <= b2) {
      sum += lineInt(y, Math.min(a1, a2), Math.max(b1, b2)); // overlapping chords: one interval
    } else {
      sum += lineInt(y, a1, b1) + lineInt(y, a2, b2);
    }
  }
  return (sum * dy) / (Math.PI * (1 - u1 / 3 - u2 / 6));
}

describe('pairTransitFlux against an independent 2-D integration', () => {
  // [xp, yp, rp, xm, ym, rm]
  const configs: [string, number[]][] = [
    ['partial overlap mid-disc', [0.3, 0.1, 0.1, 0.4, 0.11, 0.02]],
    ['lens partly off the star', [0.95, 0, 0.1, 1.04, 0.03, 0.02]],
    ['planet at the centre', [0, 0, 0.1, 0.11, 0, 0.02]],
    ['large moon on the planet edge', [0.5, 0.2, 0.2, 0.5, 0.4, 0.05]],
    ['both crossing the limb', [1.05, 0, 0.1, 0.98, 0.05, 0.05]],
    ['lens covering the star centre', [0.05, 0, 0.1, -0.02, 0, 0.03]],
  ];
  for (const [name, [xp, yp, rp, xm, ym, rm]] of configs) {
    it(`${name}: agrees to 1e-10 of the stellar flux (u = 0.4, 0.26 and 0.1, 0.6)`, () => {
      // Expected: bruteDeficit above. Its error (midpoint rule in y) scales as
      // h^1.5 from the square-root ends of the chords at each disc's top and
      // bottom: measured 2.9e-9 → 1.6e-9 from 20 000 to 40 000 rows, ratio 2^1.5.
      // One Richardson step, (2^1.5·B(40k) − B(20k))/(2^1.5 − 1), removes that
      // term; what remains is below 1e-10 (so the 1 ppm goal is checked with
      // four orders of margin).
      const r = 2 ** 1.5;
      for (const [u1, u2] of [[0.4, 0.26], [0.1, 0.6]]) {
        const f = pairTransitFlux(xp, yp, rp, xm, ym, rm, u1, u2);
        const b40 = bruteDeficit(xp, yp, rp, xm, ym, rm, u1, u2, 40_000);
        const b20 = bruteDeficit(xp, yp, rp, xm, ym, rm, u1, u2, 20_000);
        const brute = 1 - (r * b40 - b20) / (r - 1);
        expect(Math.abs(f - brute)).toBeLessThan(1e-10);
      }
    });
  }
});

describe('pairTransitFlux properties (fast-check)', () => {
  const u = [0.4, 0.26] as const;
  const single = (x: number, y: number, r: number): number => 1 - transitFluxScalar(Math.hypot(x, y), r, u[0], u[1]);
  const coord = fc.double({ min: -1.3, max: 1.3, noNaN: true });
  const rpArb = fc.double({ min: 0.01, max: 0.2, noNaN: true });
  const rmArb = fc.double({ min: 0.005, max: 0.05, noNaN: true });

  it('flux = 1 when both discs are off the star (common practice, no source)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }), fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }), rpArb, rmArb, (a, b, rp, rm) => {
        const dp = 1 + rp + 0.01;
        const dm = 1 + rm + 0.01;
        return pairTransitFlux(dp * Math.cos(a), dp * Math.sin(a), rp, dm * Math.cos(b), dm * Math.sin(b), rm, u[0], u[1]) === 1;
      }),
    );
  });

  it('deficit = sum of single deficits when the discs are apart; between the larger single deficit and the sum when they overlap', () => {
    // Expected: additivity of blocked flux over disjoint regions; monotonicity of
    // the union (common practice, no source).
    fc.assert(
      fc.property(coord, coord, rpArb, coord, coord, rmArb, (xp, yp, rp, xm, ym, rm) => {
        const def = 1 - pairTransitFlux(xp, yp, rp, xm, ym, rm, u[0], u[1]);
        const dP = single(xp, yp, rp);
        const dM = single(xm, ym, rm);
        if (Math.hypot(xp - xm, yp - ym) >= rp + rm) return Math.abs(def - (dP + dM)) < 1e-15;
        return def >= Math.max(dP, dM) - 1e-14 && def <= dP + dM + 1e-14;
      }),
      { numRuns: 3000 },
    );
  });

  it('overlapping cases near each other concentrate the check (moon within rp + rm of the planet)', () => {
    fc.assert(
      fc.property(coord, coord, rpArb, rmArb, fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }), (xp, yp, rp, rm, f, ang) => {
        const d = f * (rp + rm);
        const xm = xp + d * Math.cos(ang);
        const ym = yp + d * Math.sin(ang);
        const def = 1 - pairTransitFlux(xp, yp, rp, xm, ym, rm, u[0], u[1]);
        const dP = single(xp, yp, rp);
        const dM = single(xm, ym, rm);
        return def >= Math.max(dP, dM) - 1e-14 && def <= dP + dM + 1e-14;
      }),
      { numRuns: 3000 },
    );
  });

  it('a moon wholly behind the planet gives the planet flux (to rounding)', () => {
    fc.assert(
      fc.property(coord, coord, rpArb, fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }), (xp, yp, rp, f, ang) => {
        const rm = 0.3 * rp;
        const d = f * (rp - rm);
        const flux = pairTransitFlux(xp, yp, rp, xp + d * Math.cos(ang), yp + d * Math.sin(ang), rm, u[0], u[1]);
        // exact up to how √(x² + y²) is rounded (hypot vs sqrt differ for subnormal inputs)
        return Math.abs(flux - transitFluxScalar(Math.hypot(xp, yp), rp, u[0], u[1])) <= 1e-15;
      }),
    );
  });
});

describe('pairTransitFluxArray and errors', () => {
  it('matches the scalar function element by element', () => {
    const xp = Float64Array.from([0, 0.3, 0.95, 2]);
    const yp = Float64Array.from([0, 0.1, 0, 0]);
    const xm = Float64Array.from([0.11, 0.4, 1.04, 2.1]);
    const ym = Float64Array.from([0, 0.11, 0.03, 0]);
    const out = new Float64Array(4);
    expect(pairTransitFluxArray(xp, yp, 0.1, xm, ym, 0.02, 0.4, 0.26, out)).toBe(out);
    for (let i = 0; i < 4; i++) expect(out[i]).toBe(pairTransitFlux(xp[i], yp[i], 0.1, xm[i], ym[i], 0.02, 0.4, 0.26));
  });

  it('throws RangeError naming the argument', () => {
    expect(() => pairTransitFlux(0, 0, -0.1, 0, 0, 0.02, 0.4, 0.26)).toThrow(/rp/);
    expect(() => pairTransitFlux(0, 0, 0.1, 0, 0, NaN, 0.4, 0.26)).toThrow(/rm/);
    expect(() => pairTransitFlux(0, 0, 0.1, 0, 0, 0.02, 3, 2)).toThrow(RangeError);
    const a = new Float64Array(2);
    expect(() => pairTransitFluxArray(a, a, 0.1, a, new Float64Array(3), 0.02, 0.4, 0.26, a)).toThrow(/lengths/);
    expect(pairTransitFlux(NaN, 0, 0.1, 0, 0, 0.02, 0.4, 0.26)).toBeNaN();
  });
});
