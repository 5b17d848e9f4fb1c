/**
 * No-moon calibration realizations ("null sets") of a sweep: R₀ realizations
 * of a cell's scenario with its moon removed, from which each detection
 * channel's false-alarm threshold is calibrated. They depend only on the
 * moon-less scenario, the seed and R₀, so every cell of a "null class" (cells
 * that differ only in the moon) shares one set.
 *
 * Realization r of a class draws from createRng(seed ^ NULL_SEED_SALT, id, r),
 * with id a hash of the moon-less scenario: any range of realizations can be
 * computed anywhere (any worker, any chunk, any order) and gives the same
 * numbers, so a set assembled from chunks is bit-identical to one computed in
 * a single loop.
 *
 * Packed form: a range of realizations as a few flat Float64Arrays (per
 * realization: statistics and stack geometry; the stacks' bins concatenated),
 * structured-cloneable and transferable between threads; a whole set is
 * assembled into SharedArrayBuffer-backed arrays so that every worker reads
 * one copy.
 */
import { createHash } from 'node:crypto';
import type { Scenario } from '../scenario/types.js';
import { createRng } from '../noise/rng.js';
import { RealizationWorkspace, runRealization } from '../timing/realization.js';
import type { ResidualStack } from '../timing/residualStack.js';
import { chiSquareSurvival } from '../numeric/noncentralChiSquare.js';
import { ResidualScratch, templateLayout, templateResiduals, type TemplateLayout } from '../timing/templateSearch.js';
import type { Observation } from '../noise/observe.js';
import type { TimingRecovery } from '../timing/timingSeries.js';
import { canonicalJson } from './canonicalJson.js';

/** A seed distinct from the moon realizations' seed for the same scenario seed. */
export const NULL_SEED_SALT = 0x6e756c6c; // "null"

/** Expected no-moon exceedances a threshold at α should rest on (issue 17: ≥ ~25, so its rate in force is known to ±40 % at 95 %). */
export const NULL_EXCEEDANCES = 25;

/**
 * Expected exceedances at α the tail-fit calibration needs (timing/detection.ts, method 'tail'): measured
 * in bench/tailFit.ts on the efficiency system (`npm run bench -- tail-fit`), a generalised Pareto fit of
 * the upper tail from ⌈15/α⌉ no-moon realizations holds the pooled rate in force of every channel and of
 * the combined rule within ±5 % of α at α = 1 %, with a spread across calibration sets no larger than the
 * order statistic's at 25/α (17–22 % against 19–24 %; README, Performance).
 */
export const NULL_EXCEEDANCES_TAIL = 15;

/** The calibration method of a scenario: its `detection.calibration`, 'tail' when absent. */
export function calibrationMethodOf(s: Pick<Scenario, 'detection'>): 'tail' | 'order_statistic' {
  return s.detection.calibration ?? 'tail';
}

/**
 * Default number of no-moon calibration realizations: with the order statistic ⌈25/α⌉ (each threshold at
 * α, single or combined, rests on ~25 expected exceedances: the Beta(25, n − 24) rate in force has a
 * relative standard deviation of 1/√25 = 20 %); with the tail fit (the default) ⌈15/α⌉
 * (NULL_EXCEEDANCES_TAIL); at least R and 200.
 */
export function defaultNullRealizations(falseAlarm: number, realizations: number, calibration: 'tail' | 'order_statistic' = 'tail'): number {
  const expected = calibration === 'tail' ? NULL_EXCEEDANCES_TAIL : NULL_EXCEEDANCES;
  return Math.max(realizations, 200, Math.ceil(expected / falseAlarm - 1e-9));
}

/** The calibration statistics of a null class, per realization, with its residual stacks. */
export interface NullSet {
  ttv: Float64Array;
  tdv: Float64Array;
  stacks: ResidualStack[];
  /** Template channel: normalised binned residuals ρ of every realization (r at r·bins), and the layout's bins. */
  rho: Float64Array;
  rhoBins: number;
}

/**
 * The template channel's bins of a null class (the moonless scenario's planned samples; with a ground
 * campaign, the campaign's epochs and the plan's exposures, as runRealization observes: templateLayout).
 */
export function nullTemplateLayout(c: NullClass): TemplateLayout {
  return templateLayout(c.scenario);
}

/** ρ of one realization on layout L (templateSearch.ts), written at `out`. */
export function realizationRho(L: TemplateLayout, observation: Observation, recovery: TimingRecovery, out?: Float64Array, scratch?: ResidualScratch): Float64Array {
  // Each point's own σ (a ground budget) whitens the residuals when the layout weighs its exposures.
  return templateResiduals(L, observation.timeS, observation.epoch, observation.flux, observation.sigma, recovery.global, out, scratch, observation.sigmaPoint);
}

/** What identifies (and suffices to compute) a null set. */
export interface NullClass {
  /** `${seed}|${count}|${canonical JSON of the moon-less scenario, unnamed}`: equal keys, equal sets. */
  key: string;
  /** 31-bit stream id: hash of the moon-less scenario. */
  id: number;
  /** Number of realizations R₀. */
  count: number;
  /** The scenario seed (the realizations use seed ^ NULL_SEED_SALT). */
  seed: number;
  /** The scenario without its moon. */
  scenario: Scenario;
}

/** Realizations [start, start + n) of a null set, packed into flat arrays (plain data). */
export interface PackedNullRange {
  start: number;
  n: number;
  ttv: Float64Array;
  tdv: Float64Array;
  /** Per realization: the stack's bin-0 centre, bin width and per-point σ. */
  x0S: Float64Array;
  binS: Float64Array;
  sigma: Float64Array;
  /** Realization k's bins are [binOffset[k], binOffset[k + 1]) of `sum` and `count` (length n + 1). */
  binOffset: Float64Array;
  sum: Float64Array;
  count: Float64Array;
  /** ρ of realization k at [k·rhoBins, (k + 1)·rhoBins). */
  rho: Float64Array;
  rhoBins: number;
}

/** −log10 of a χ² survival probability (floored at 1e-300); 0 when not measured. */
export function chiSquareScore(chi2: number, dof: number): number {
  if (!(dof >= 1) || !Number.isFinite(chi2)) return 0;
  const p = chiSquareSurvival(chi2, dof);
  return -Math.log10(Math.max(p, 1e-300));
}

/** The null class of scenario `s` (its moon, if any, is ignored) for `seed` and `count` realizations. */
export function nullClassOfScenario(s: Scenario, seed: number, count: number): NullClass {
  if (!(Number.isInteger(count) && count >= 1)) throw new RangeError(`count must be an integer ≥ 1, got ${count}`);
  // The calibration method does not change the realizations: left out, so both methods draw the same ones.
  const json = canonicalJson({ ...s, moon: null, name: '', detection: { falseAlarm: s.detection.falseAlarm } });
  const id = createHash('sha256').update(json).digest().readUInt32BE(0) >>> 1;
  return { key: `${seed}|${count}|${json}`, id, count, seed, scenario: { ...s, moon: null } };
}

/** Run realizations [start, start + n) of null class `c` and pack them. */
export function computeNullRange(c: NullClass, start: number, n: number, ws: RealizationWorkspace = new RealizationWorkspace()): PackedNullRange {
  if (!(Number.isInteger(start) && Number.isInteger(n) && start >= 0 && n >= 0 && start + n <= c.count)) {
    throw new RangeError(`realizations [${start}, ${start + n}) are outside the null set of ${c.count}`);
  }
  const ttv = new Float64Array(n);
  const tdv = new Float64Array(n);
  const stacks: ResidualStack[] = [];
  const L = nullTemplateLayout(c);
  const rho = new Float64Array(n * L.bins);
  const scratch = new ResidualScratch();
  for (let k = 0; k < n; k++) {
    const rng = createRng((c.seed ^ NULL_SEED_SALT) >>> 0, c.id, start + k);
    const { record, observation, recovery } = runRealization(c.scenario, rng, { withMoon: false, workspace: ws });
    ttv[k] = chiSquareScore(record.ttvChi2, record.ttvDof);
    tdv[k] = chiSquareScore(record.tdvChi2, record.tdvDof);
    stacks.push(record.stack);
    realizationRho(L, observation, recovery, rho.subarray(k * L.bins, (k + 1) * L.bins), scratch);
  }
  return packRange(start, ttv, tdv, stacks, rho, L.bins);
}

function packRange(start: number, ttv: Float64Array, tdv: Float64Array, stacks: readonly ResidualStack[], rho: Float64Array, rhoBins: number): PackedNullRange {
  const n = stacks.length;
  const binOffset = new Float64Array(n + 1);
  for (let k = 0; k < n; k++) binOffset[k + 1] = binOffset[k] + stacks[k].sum.length;
  const bins = binOffset[n];
  const out: PackedNullRange = {
    start, n, ttv, tdv,
    x0S: new Float64Array(n), binS: new Float64Array(n), sigma: new Float64Array(n), binOffset,
    sum: new Float64Array(bins), count: new Float64Array(bins), rho, rhoBins,
  };
  for (let k = 0; k < n; k++) {
    const st = stacks[k];
    out.x0S[k] = st.x0S;
    out.binS[k] = st.binS;
    out.sigma[k] = st.sigma;
    out.sum.set(st.sum, binOffset[k]);
    out.count.set(st.count, binOffset[k]);
  }
  return out;
}

/** The buffers of a packed range, for a postMessage transfer list. */
export function packedBuffers(p: PackedNullRange): ArrayBuffer[] {
  const arrays = [p.ttv, p.tdv, p.x0S, p.binS, p.sigma, p.binOffset, p.sum, p.count, p.rho];
  const out: ArrayBuffer[] = [];
  for (const a of arrays) if (a.buffer instanceof ArrayBuffer && !out.includes(a.buffer)) out.push(a.buffer);
  return out;
}

/**
 * Join ranges that tile [0, total) (in any order) into one packed set, in
 * realization order. With `shared`, the arrays live in SharedArrayBuffers
 * (posted to workers without copying). Throws when the ranges do not tile.
 */
export function joinNullRanges(ranges: readonly PackedNullRange[], total: number, shared = false): PackedNullRange {
  const sorted = [...ranges].sort((a, b) => a.start - b.start);
  let next = 0;
  let bins = 0;
  for (const r of sorted) {
    if (r.start !== next) throw new RangeError(`null-set ranges do not tile [0, ${total}): gap or overlap at realization ${next}`);
    next += r.n;
    bins += r.binOffset[r.n];
  }
  if (next !== total) throw new RangeError(`null-set ranges cover ${next} realizations, expected ${total}`);
  const rhoBins = sorted.length > 0 ? sorted[0].rhoBins : 0;
  for (const r of sorted) if (r.rhoBins !== rhoBins) throw new RangeError(`null-set ranges disagree on the template bins: ${r.rhoBins} and ${rhoBins}`);
  const alloc = (len: number): Float64Array => (shared ? new Float64Array(new SharedArrayBuffer(len * 8)) : new Float64Array(len));
  const out: PackedNullRange = {
    start: 0, n: total,
    ttv: alloc(total), tdv: alloc(total), x0S: alloc(total), binS: alloc(total), sigma: alloc(total),
    binOffset: alloc(total + 1), sum: alloc(bins), count: alloc(bins), rho: alloc(total * rhoBins), rhoBins,
  };
  let binAt = 0;
  for (const r of sorted) {
    for (const f of ['ttv', 'tdv', 'x0S', 'binS', 'sigma'] as const) out[f].set(r[f], r.start);
    for (let k = 0; k < r.n; k++) out.binOffset[r.start + k + 1] = binAt + r.binOffset[k + 1];
    out.sum.set(r.sum, binAt);
    out.count.set(r.count, binAt);
    out.rho.set(r.rho, r.start * rhoBins);
    binAt += r.binOffset[r.n];
  }
  return out;
}

/** A null set over a packed range: the stacks are views into its arrays (nothing copied). */
export function unpackNullSet(p: PackedNullRange): NullSet {
  const stacks: ResidualStack[] = [];
  for (let k = 0; k < p.n; k++) {
    const a = p.binOffset[k];
    const b = p.binOffset[k + 1];
    stacks.push({ x0S: p.x0S[k], binS: p.binS[k], sigma: p.sigma[k], sum: p.sum.subarray(a, b), count: p.count.subarray(a, b) });
  }
  return { ttv: p.ttv, tdv: p.tdv, stacks, rho: p.rho, rhoBins: p.rhoBins };
}

/** The whole null set of class `c`, computed here (the fallback when none was provided). */
export function computeNullSet(c: NullClass, ws?: RealizationWorkspace): NullSet {
  return unpackNullSet(computeNullRange(c, 0, c.count, ws));
}
