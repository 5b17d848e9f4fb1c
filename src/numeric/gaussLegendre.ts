/**
 * Gauss–Legendre nodes and weights on [−1, 1], by Newton iteration on the
 * Legendre polynomial Pₙ from the Tricomi initial guess cos(π(i − ¼)/(n + ½))
 * (Abramowitz & Stegun 1964, §25.4.29 for the rule; DLMF §3.5(v)). Exact for
 * polynomials of degree ≤ 2n − 1. Used by the quadratures of photometry/
 * (lens region of two discs, thin crescents); computed once per caller.
 */

/** Nodes x[i] (ascending) and weights w[i] of the n-point rule on [−1, 1]. */
export interface GaussLegendreRule {
  readonly nodes: Float64Array;
  readonly weights: Float64Array;
}

/** n-point Gauss–Legendre rule, n ≥ 1. @throws RangeError for a non-integer or n < 1. */
export function gaussLegendreRule(n: number): GaussLegendreRule {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`n must be an integer ≥ 1, got ${n}`);
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let i = 0; i < (n + 1) >> 1; i++) {
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let dp = 0;
    for (let iter = 0; iter < 100; iter++) {
      // three-term recurrence for Pₙ(x) and its derivative (DLMF 18.9.1, 18.9.17)
      let p0 = 1;
      let p1 = x;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      if (n === 1) p0 = 1;
      dp = (n * (x * p1 - p0)) / (x * x - 1);
      const dx = p1 / dp;
      x -= dx;
      if (Math.abs(dx) < 1e-16) break;
    }
    const w = 2 / ((1 - x * x) * dp * dp);
    nodes[i] = -x;
    nodes[n - 1 - i] = x;
    weights[i] = w;
    weights[n - 1 - i] = w;
  }
  return { nodes, weights };
}
