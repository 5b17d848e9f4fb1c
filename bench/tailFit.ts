/**
 * `npm run bench -- tail-fit` (issue 17, item 3): can a generalised Pareto
 * fit of the no-moon statistics' upper tail (numeric/generalizedPareto.ts,
 * Knijnenburg et al. 2009) reach, with fewer no-moon realizations, the
 * accuracy of the order-statistic threshold at n = 25/α?
 *
 * On a pool of P no-moon realizations (300 000 by default, MOONSIEVE_TAIL_POOL;
 * about 15 min of one core the first time, then read from the cache) of one cell of the invented K-dwarf
 * system of bench/efficiency.ts (0.15 M⊕ at 0.30 Hill: TTV, TDV, dip and
 * template statistics; bench/tailPool.ts, cached in the OS temporary folder),
 * the pool is cut into disjoint calibration sets of n realizations; each set
 * gives a threshold per channel and one for the combined weighted min-p rule,
 * and its rate in force is the fraction of the rest of the pool (P − n
 * realizations) above it. Over the sets: the pooled rate (mean rate / α; goal
 * of issue 17 within ±20 %) and its spread (relative sd of the rate across
 * sets; the order statistic's is the Beta(n + 1 − k, k) one, 20 % at 25/α).
 * The pool's own sampling error of a rate near α is 1/√(αP) (relative), common
 * to every method (it is the same pool).
 *
 * Methods:
 * - empirical: the order statistic x_(k), k = ⌈(n + 1)(1 − α)⌉, and the
 *   combined rule calibrated by calibrateDetection (timing/detection.ts), at
 *   n = ⌈25/α⌉.
 * - wired: calibrateDetection with method 'tail' (what a sweep cell runs) at
 *   its default n = ⌈15/α⌉, with the share of sets whose measured combined
 *   rate lies inside the set's bootstrap interval, and the calibration time.
 * - GPD (PWM or ML): per channel the tail fit of the set (exceedance count
 *   from min(250, n/2) down by 10 until the Anderson–Darling bootstrap check,
 *   99 replicates, passes at 5 %), threshold = tail quantile at α; the
 *   combined rule scores M = max_c w_c/p_c with p_c the tail-fit survival above
 *   the channel's tail threshold and the empirical (N − B + 1)/(N + 1) below,
 *   and its threshold is the tail quantile at α of ln M over the set's own
 *   realizations (ln M has an exponential-like tail where M ~ 1/p has ξ ≈ 1).
 */
import { availableParallelism } from 'node:os';
import { tailPool } from './tailPool.js';
import { calibrateDetection, decideDetection, DETECTION_CHANNELS, type DetectionChannel, type DetectionStatistics, type DetectionThresholds } from '../src/timing/detection.js';
import { orderStatisticThresholdSorted } from '../src/timing/falseAlarmCalibration.js';
import { fitUpperTail, tailQuantile, tailSurvival, type GpdEstimator, type TailFit } from '../src/numeric/generalizedPareto.js';
import { lowerBound } from '../src/numeric/lowerBound.js';
import { COMBINED_RULE_WEIGHTS } from '../src/physics/detectionForecast.js';
import { createRng } from '../src/noise/rng.js';
import type { BenchMedian } from './measure.js';
import { benchSweep, referenceSweepDoc } from './sweep.js';

type Rule = DetectionChannel | 'combined';

/** Count of values of the ascending `sorted` strictly above t. */
function above(sorted: Float64Array, t: number): number {
  if (!(t < Infinity)) return 0;
  // first index with v > t
  let a = 0;
  let b = sorted.length;
  while (a < b) {
    const m = (a + b) >>> 1;
    if (sorted[m] <= t) a = m + 1;
    else b = m;
  }
  return sorted.length - a;
}

/** Slice of a channel's pool. */
function slice(x: Float64Array, start: number, n: number): Float64Array {
  return x.subarray(start, start + n);
}

interface SetRates {
  /** Per rule, the rate in force of each set. */
  rates: Record<Rule, number[]>;
}

function summarize(rates: number[], alpha: number): { pooled: number; relSd: number } {
  const m = rates.reduce((a, r) => a + r, 0) / rates.length;
  const v = rates.reduce((a, r) => a + (r - m) * (r - m), 0) / Math.max(1, rates.length - 1);
  return { pooled: m / alpha, relSd: Math.sqrt(v) / m };
}

/** The combined rule's firing rate over the pool outside the calibration set [start, start + n). */
function combinedRateOutside(pool: Record<DetectionChannel, Float64Array>, channels: DetectionChannel[], P: number, start: number, n: number, thresholds: DetectionThresholds): number {
  const row = { ttv: NaN, tdv: NaN, dip: NaN, template: NaN } as DetectionStatistics;
  let fired = 0;
  for (let i = 0; i < P; i++) {
    if (i >= start && i < start + n) continue;
    for (const ch of channels) row[ch] = pool[ch][i];
    if (decideDetection(row, thresholds).combined) fired++;
  }
  return fired / (P - n);
}

/** Empirical method on disjoint sets of n: per-channel order statistic, combined via calibrateDetection. */
function empiricalRates(pool: Record<DetectionChannel, Float64Array>, channels: DetectionChannel[], poolSorted: Record<DetectionChannel, Float64Array>, P: number, n: number, alpha: number, maxSets: number): SetRates {
  const out: SetRates = { rates: { ttv: [], tdv: [], dip: [], template: [], combined: [] } };
  const sets = Math.min(maxSets, Math.floor(P / n));
  for (let s = 0; s < sets; s++) {
    const start = s * n;
    const nullStats: Partial<Record<DetectionChannel, Float64Array>> = {};
    for (const ch of channels) nullStats[ch] = slice(pool[ch], start, n);
    const cal = calibrateDetection(nullStats, alpha, COMBINED_RULE_WEIGHTS);
    for (const ch of channels) {
      const sorted = Float64Array.from(nullStats[ch]!).sort();
      const t = orderStatisticThresholdSorted(sorted, alpha);
      out.rates[ch].push((above(poolSorted[ch], t) - above(sorted, t)) / (P - n));
    }
    out.rates.combined.push(combinedRateOutside(pool, channels, P, start, n, cal.thresholds));
  }
  return out;
}

/** p of x for one channel: the tail fit above its threshold, else the empirical (N − B + 1)/(N + 1). */
function channelP(sorted: Float64Array, fit: TailFit, x: number): number {
  if (x >= fit.threshold) return tailSurvival(fit, x);
  const N = sorted.length;
  const below = lowerBound(sorted, 0, N, x);
  return (N - below + 1) / (N + 1);
}

function lnM(pool: Record<DetectionChannel, Float64Array>, i: number, channels: DetectionChannel[], sorted: Record<DetectionChannel, Float64Array>, fits: Record<DetectionChannel, TailFit>, w: Record<DetectionChannel, number>): number {
  let best = -Infinity;
  for (const ch of channels) {
    const p = channelP(sorted[ch], fits[ch], pool[ch][i]);
    const v = Math.log(w[ch]) - Math.log(Math.max(p, 1e-300));
    if (v > best) best = v;
  }
  return best;
}

/** GPD method on disjoint sets of n (fits once per set; rates at every α of `alphas`). */
function gpdRates(pool: Record<DetectionChannel, Float64Array>, channels: DetectionChannel[], poolSorted: Record<DetectionChannel, Float64Array>, P: number, n: number, alphas: number[], maxSets: number, estimator: GpdEstimator, maxExceedances: number): { rates: SetRates[]; accepted: number; fits: number; msPerSet: number } {
  const outs: SetRates[] = alphas.map(() => ({ rates: { ttv: [], tdv: [], dip: [], template: [], combined: [] } }));
  const sets = Math.min(maxSets, Math.floor(P / n));
  let wSum = 0;
  for (const ch of channels) wSum += COMBINED_RULE_WEIGHTS[ch];
  const w = {} as Record<DetectionChannel, number>;
  for (const ch of channels) w[ch] = COMBINED_RULE_WEIGHTS[ch] / wSum;
  let accepted = 0;
  let fitsDone = 0;
  let ms = 0;
  for (let s = 0; s < sets; s++) {
    const t0 = performance.now();
    const start = s * n;
    const sorted = {} as Record<DetectionChannel, Float64Array>;
    const fits = {} as Record<DetectionChannel, TailFit>;
    for (const ch of channels) {
      sorted[ch] = Float64Array.from(slice(pool[ch], start, n)).sort();
      fits[ch] = fitUpperTail(sorted[ch], { estimator, maxExceedances, rng: createRng(17, s, DETECTION_CHANNELS.indexOf(ch)) });
      fitsDone++;
      if (fits[ch].accepted) accepted++;
    }
    const own = new Float64Array(n);
    for (let i = 0; i < n; i++) own[i] = lnM(pool, start + i, channels, sorted, fits, w);
    own.sort();
    const fitM = fitUpperTail(own, { estimator, maxExceedances, rng: createRng(17, s, 99) });
    fitsDone++;
    if (fitM.accepted) accepted++;
    ms += performance.now() - t0;
    // lnM of the rest of the pool, once per set; then every α.
    const rest = new Float64Array(P - n);
    let j = 0;
    for (let i = 0; i < P; i++) if (i < start || i >= start + n) rest[j++] = lnM(pool, i, channels, sorted, fits, w);
    rest.sort();
    alphas.forEach((alpha, a) => {
      for (const ch of channels) {
        const t = tailQuantile(fits[ch], alpha);
        outs[a].rates[ch].push((above(poolSorted[ch], t) - above(sorted[ch], t)) / (P - n));
      }
      outs[a].rates.combined.push(above(rest, tailQuantile(fitM, alpha)) / (P - n));
    });
  }
  return { rates: outs, accepted, fits: fitsDone, msPerSet: ms / sets };
}


/**
 * The wired method (calibrateDetection with method 'tail', as a sweep cell runs it) on disjoint sets of n:
 * per-rule pooled rate and spread, the share of sets whose measured combined rate lies inside their
 * bootstrap interval, and the calibration time per set beside the order statistic's on the same sets.
 */
function wiredRates(pool: Record<DetectionChannel, Float64Array>, channels: DetectionChannel[], poolSorted: Record<DetectionChannel, Float64Array>, P: number, n: number, alpha: number, maxSets: number): { rates: SetRates; covered: number; sets: number; tailMs: number; orderMs: number; tailUsed: number } {
  const out: SetRates = { rates: { ttv: [], tdv: [], dip: [], template: [], combined: [] } };
  const sets = Math.min(maxSets, Math.floor(P / n));
  let covered = 0;
  let tailMs = 0;
  let orderMs = 0;
  let tailUsed = 0;
  for (let s = 0; s < sets; s++) {
    const start = s * n;
    const nullStats: Partial<Record<DetectionChannel, Float64Array>> = {};
    for (const ch of channels) nullStats[ch] = slice(pool[ch], start, n);
    let t0 = performance.now();
    calibrateDetection(nullStats, alpha, COMBINED_RULE_WEIGHTS);
    orderMs += performance.now() - t0;
    t0 = performance.now();
    const cal = calibrateDetection(nullStats, alpha, COMBINED_RULE_WEIGHTS, { method: 'tail', rng: createRng(17, s, 7) });
    tailMs += performance.now() - t0;
    if (cal.method === 'tail') tailUsed++;
    for (const ch of channels) {
      const t = cal.thresholds.single[ch]!;
      const sorted = Float64Array.from(nullStats[ch]!).sort();
      out.rates[ch].push((above(poolSorted[ch], t) - above(sorted, t)) / (P - n));
    }
    const rate = combinedRateOutside(pool, channels, P, start, n, cal.thresholds);
    out.rates.combined.push(rate);
    if (rate >= cal.falseAlarmInForceLower && rate <= cal.falseAlarmInForceUpper) covered++;
  }
  return { rates: out, covered, sets, tailMs: tailMs / sets, orderMs: orderMs / sets, tailUsed };
}

export function benchTailFit(poolSize = Number(process.env.MOONSIEVE_TAIL_POOL ?? 300000)): BenchMedian[] {
  const pool = tailPool(poolSize);
  const channels = pool.channels;
  const P = pool.count;
  const stats = pool.stats as Record<DetectionChannel, Float64Array>;
  const poolSorted = {} as Record<DetectionChannel, Float64Array>;
  for (const ch of channels) poolSorted[ch] = Float64Array.from(stats[ch]).sort();
  const rows: BenchMedian[] = [];
  const rules: Rule[] = [...channels, 'combined'];
  rows.push({ label: `pool: ${pool.label}${pool.cached ? ' (read from the cache)' : ''}; ${availableParallelism()} cores`, median: pool.seconds, unit: 's', repeats: 1, summary: 'to compute the pool, one thread' });
  rows.push({ label: `  one no-moon realization (dip and template statistics included)`, median: (1000 * pool.seconds) / P, unit: 'ms', repeats: 1, summary: `mean over ${P}` });
  const line = (label: string, r: Record<Rule, number[]>, alpha: number): BenchMedian[] =>
    rules.map((rule) => {
      const s = summarize(r[rule], alpha);
      return { label: `  ${label}, ${rule}: pooled rate / α ${s.pooled.toFixed(3)}, relative sd across sets ${(100 * s.relSd).toFixed(1)} %`, median: s.pooled, unit: '× α', repeats: r[rule].length, summary: `${r[rule].length} sets` };
    });
  const alphas = [0.01, 0.001];
  for (const alpha of alphas) {
    const n = Math.ceil(25 / alpha - 1e-9);
    rows.push({ label: `α = ${alpha}: pool noise of a rate near α, 1/√(αP)`, median: 1 / Math.sqrt(alpha * P), unit: 'rel', repeats: 1 });
    if (n <= P / 2) {
      const t0 = performance.now();
      const e = empiricalRates(stats, channels, poolSorted, P, n, alpha, 100);
      rows.push(...line(`empirical order statistic, n = ${n}`, e.rates, alpha));
      rows.push({ label: `    (${((performance.now() - t0) / 1000).toFixed(1)} s for the empirical sets)`, median: n, unit: 'n', repeats: 1 });
    } else {
      // Fewer than two disjoint sets fit in the pool: the order statistic's rate in force is distribution-free, Beta(n + 1 − k, k).
      const k = Math.ceil((n + 1) * (1 - alpha) - 1e-9);
      const a = n + 1 - k;
      rows.push({ label: `  empirical order statistic, n = ${n}: not measurable on a pool of ${P}; distribution-free Beta(${a}, ${k}): mean / α ${(a / (n + 1) / alpha).toFixed(3)}, relative sd ${(100 * Math.sqrt((k / (n + 2)) / a)).toFixed(1)} % (David & Nagaraja 2003, §2.2)`, median: a / (n + 1) / alpha, unit: '× α', repeats: 0, summary: 'theory' });
    }
  }
  // n: 200, 500, 1000 (issue 17), 1500 at α = 1 %; 2500, 5000, 10 000, 15 000 for α = 0.1 % (still below its 25/α = 25 000).
  // Exceedances: Knijnenburg et al.'s start min(250, n/2), and 10 % of n where that is more.
  const cases: Array<{ n: number; alphas: number[]; cap: number }> = [];
  for (const n of [200, 500, 1000, 1500]) cases.push({ n, alphas, cap: Math.min(250, n / 2) });
  for (const n of [2500, 5000, 10000, 15000]) {
    cases.push({ n, alphas: [0.001], cap: 250 });
    if (n / 10 > 250) cases.push({ n, alphas: [0.001], cap: n / 10 });
  }
  // The wired method at its default count ⌈15/α⌉ (nullSet.ts), as a sweep cell calibrates.
  for (const alpha of alphas) {
    const n = Math.ceil(15 / alpha - 1e-9);
    const w = wiredRates(stats, channels, poolSorted, P, n, alpha, 60);
    rows.push({ label: `wired: calibrateDetection 'tail', α = ${alpha}, n = ${n}: combined rule on its tail fit in ${w.tailUsed} of ${w.sets} sets; measured combined rate inside the set's bootstrap interval in ${w.covered} of ${w.sets}`, median: w.tailMs, unit: 'ms', repeats: w.sets, summary: `calibration per set (order statistic: ${w.orderMs.toFixed(1)} ms)` });
    rows.push(...line(`wired, α = ${alpha}, n = ${n}`, w.rates.rates, alpha));
  }
  const estimators = (process.env.MOONSIEVE_TAIL_ESTIMATORS ?? 'pwm,ml').split(',') as GpdEstimator[];
  for (const estimator of estimators) {
    // ML is ~20× slower than PWM (its profile likelihood inside 99 bootstrap refits): n ≤ 1500 only, 60 sets.
    for (const c of estimator === 'ml' ? cases.filter((x) => x.n <= 1500) : cases) {
      const g = gpdRates(stats, channels, poolSorted, P, c.n, c.alphas, estimator === 'ml' ? 60 : 100, estimator, c.cap);
      rows.push({ label: `GPD tail (${estimator.toUpperCase()}, exceedances from ${c.cap} down by 10 until the AD bootstrap check passes), n = ${c.n}: fits accepted ${g.accepted} of ${g.fits}`, median: g.msPerSet, unit: 'ms', repeats: g.rates[0].rates.combined.length, summary: 'per set: 4 channel fits + M' });
      c.alphas.forEach((alpha, a) => rows.push(...line(`α = ${alpha}, n = ${c.n}`, g.rates[a].rates, alpha)));
    }
  }
  return rows;
}

/**
 * What the default count saves in a sweep: the bench's small sweep (the reference scenario on a 6 × 6
 * grid, 20 realizations per cell) on one worker with `detection.calibration: tail` (1500 no-moon) and
 * `order_statistic` (2500), in the order tail, order, order, tail (a linear drift of the machine cancels).
 */
export async function benchTailSweep(): Promise<BenchMedian[]> {
  const seconds: Record<string, number[]> = { tail: [], order_statistic: [] };
  const shape: Record<string, string> = {};
  for (const m of ['tail', 'order_statistic', 'order_statistic', 'tail'] as const) {
    const doc = referenceSweepDoc(20);
    for (const a of (doc.sweep as { axes: Array<{ count: number }> }).axes) a.count = 6;
    doc.detection = { ...(doc.detection as Record<string, unknown>), calibration: m };
    const r = await benchSweep(doc, { workers: 1, label: `small sweep, ${m}` });
    seconds[m].push(r.seconds);
    shape[m] = `${r.cells} cells × 20 realizations + ${r.calibrationRealizations} no-moon`;
  }
  const mean = (xs: number[]): number => xs.reduce((a, x) => a + x, 0) / xs.length;
  return [
    { label: `small sweep, tail calibration (${shape.tail}), 1 worker (${seconds.tail.map((t) => t.toFixed(1)).join(', ')} s)`, median: mean(seconds.tail), unit: 's', repeats: 2, summary: 'mean of 2' },
    { label: `the same, order statistic (${shape.order_statistic}) (${seconds.order_statistic.map((t) => t.toFixed(1)).join(', ')} s)`, median: mean(seconds.order_statistic), unit: 's', repeats: 2, summary: 'mean of 2' },
    { label: 'ratio, tail over order statistic', median: mean(seconds.tail) / mean(seconds.order_statistic), unit: '×', repeats: 2, summary: 'ratio of the means' },
  ];
}
