/**
 * Golden-section search for the maximum of a unimodal function on [lo, hi]
 * (Kiefer 1953, Proc. Am. Math. Soc. 4, 502; Press et al. 2007, Numerical
 * Recipes 3rd ed., §10.2): each step keeps the sub-interval holding the
 * larger of two interior values, which sit at the golden ratio, so one new
 * evaluation per step shrinks the bracket by (√5 − 1)/2. On a tie the lower
 * interior point is kept. To find a minimum, maximise the negated function
 * (negation is exact, so the steps are the same).
 *
 * The objective is an object with a method rather than a closure, so that a
 * caller in a hot loop can keep one (DEVELOPERS.md: no closure per call).
 */

export const GOLDEN_RATIO_CONJUGATE = (Math.sqrt(5) - 1) / 2;

export interface ScalarObjective {
  valueAt(x: number): number;
}

export interface GoldenSectionMaximum {
  /** The better of the two final interior points. */
  x: number;
  /** The objective there. */
  value: number;
}

/** Maximum of `objective` on [lo, hi], stopping once hi − lo ≤ tolerance or after maxIterations steps. */
export function goldenSectionMaximum(objective: ScalarObjective, lo: number, hi: number, tolerance: number, maxIterations = 60): GoldenSectionMaximum {
  const g = GOLDEN_RATIO_CONJUGATE;
  let x1 = hi - g * (hi - lo);
  let x2 = lo + g * (hi - lo);
  let f1 = objective.valueAt(x1);
  let f2 = objective.valueAt(x2);
  for (let it = 0; it < maxIterations && hi - lo > tolerance; it++) {
    if (f1 >= f2) {
      hi = x2;
      x2 = x1;
      f2 = f1;
      x1 = hi - g * (hi - lo);
      f1 = objective.valueAt(x1);
    } else {
      lo = x1;
      x1 = x2;
      f1 = f2;
      x2 = lo + g * (hi - lo);
      f2 = objective.valueAt(x2);
    }
  }
  return f1 >= f2 ? { x: x1, value: f1 } : { x: x2, value: f2 };
}
