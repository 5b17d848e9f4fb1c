/**
 * The residual light curve of one realization, stacked in the planet's frame:
 * residuals of the planet-only fit binned by time from each transit's fitted
 * mid-time. Keeping the per-bin sums (Σr, count) lets the moon-dip matched
 * filter be evaluated later for any moon separation in O(bins) — the sweep
 * calibrates the dip channel of every cell on the same stored no-moon stacks.
 *
 * Matched filter (weighted linear least squares of the residuals onto the
 * folded moon-dip profile f, e.g. Press et al. 2007, Numerical Recipes 3rd ed.,
 * §15.4): with equal per-point σ, δ̂ = −Σ r_i f(x_i) / Σ f(x_i)², σ_δ =
 * σ/√Σ f². Binning at the cadence replaces f(x_i) by f at the bin centre; the
 * profile (Heller 2014's orbital-sampling effect, moonDipStack.ts) varies on
 * the timescale of the moon's orbit crossing, far longer than one cadence.
 */
import type { TransitTemplate } from './transitTemplate.js';
import { templateFlux } from './transitTemplate.js';
import type { TransitFit } from './perTransitFit.js';

export interface ResidualStack {
  /** Centre of bin 0, s from planet mid-transit; bins are `binS` wide. */
  x0S: number;
  binS: number;
  /** Σ residual per bin. */
  sum: Float64Array;
  /** Number of points per bin. */
  count: Float64Array;
  /** Per-point white-noise σ (relative flux) the residuals carry. */
  sigma: number;
}

/**
 * Stack residuals (flux − f0·T((t − t_c)/s), the per-transit planet-only model) of every
 * successfully fitted transit into bins of `binS` over ±halfWidthS around the planet mid-time.
 * With no template (no transit observed) or no successful fit the bins stay empty.
 */
export function stackResiduals(
  timeS: Float64Array,
  flux: Float64Array,
  epoch: Int32Array,
  fits: readonly TransitFit[],
  template: TransitTemplate | null,
  sigma: number,
  binS: number,
  halfWidthS: number,
): ResidualStack {
  const nb = 2 * Math.ceil(halfWidthS / binS) + 1;
  const x0S = -((nb - 1) / 2) * binS;
  const sum = new Float64Array(nb);
  const count = new Float64Array(nb);
  // Each ok fit's mid-time, time scale and baseline, found from a point's epoch by a table.
  const ok = template === null ? [] : fits.filter((f) => f.status === 'ok');
  let e0 = 0;
  let e1 = -1;
  if (ok.length > 0) {
    e0 = Math.min(...ok.map((f) => f.epoch));
    e1 = Math.max(...ok.map((f) => f.epoch));
  }
  const slot = new Int32Array(e1 - e0 + 1).fill(-1);
  const tc = new Float64Array(ok.length);
  const scale = new Float64Array(ok.length);
  const base = new Float64Array(ok.length);
  ok.forEach((f, j) => {
    slot[f.epoch - e0] = j; // a later fit of the same epoch wins, as before
    tc[j] = f.tcS;
    scale[j] = f.durationS / template!.t14S;
    base[j] = f.baseline;
  });
  // No template (no transit observed in the realization): an empty stack, whose dip SNR is NaN.
  if (template !== null && ok.length > 0) binResiduals(timeS, flux, epoch, e0, slot, tc, scale, base, template, x0S, binS, sum, count);
  return { x0S, binS, sum, count, sigma };
}

/**
 * The binning loop of stackResiduals, top-level and over arrays (it ran as
 * on-stack-replacement code that was discarded on property loads of the fits).
 */
function binResiduals(
  timeS: Float64Array,
  flux: Float64Array,
  epoch: Int32Array,
  e0: number,
  slot: Int32Array,
  tc: Float64Array,
  scale: Float64Array,
  base: Float64Array,
  template: TransitTemplate,
  x0S: number,
  binS: number,
  sum: Float64Array,
  count: Float64Array,
): void {
  const nb = sum.length;
  for (let i = 0; i < timeS.length; i++) {
    const e = epoch[i] - e0;
    const j = e >= 0 && e < slot.length ? slot[e] : -1;
    if (j < 0) continue;
    const x = timeS[i] - tc[j];
    const k = Math.round((x - x0S) / binS);
    if (k < 0 || k >= nb) continue;
    const model = base[j] * templateFlux(template, x / scale[j]);
    sum[k] += flux[i] - model;
    count[k] += 1;
  }
}

export interface StackedDip {
  depth: number;
  depthError: number;
  snr: number;
}

/**
 * Matched-filter amplitude of the moon dip in a stack, for a profile given at
 * the bin centres (`profile[k]` = folded dip per unit moon depth at x0S + k·binS).
 * Bins with |x| < excludeWithinS are skipped (the planet-only fit absorbs part
 * of an in-transit moon dip). NaN when the profile has no weight outside.
 */
export function stackedDipSnr(stack: ResidualStack, profile: Float64Array, excludeWithinS: number): StackedDip {
  let srf = 0;
  let sff = 0;
  for (let k = 0; k < stack.sum.length; k++) {
    const x = stack.x0S + k * stack.binS;
    if (Math.abs(x) < excludeWithinS || stack.count[k] === 0) continue;
    const f = profile[k];
    srf += stack.sum[k] * f;
    sff += stack.count[k] * f * f;
  }
  if (!(sff > 0) || !(stack.sigma > 0)) return { depth: NaN, depthError: NaN, snr: NaN };
  const depth = -srf / sff;
  const depthError = stack.sigma / Math.sqrt(sff);
  return { depth, depthError, snr: depth / depthError };
}
