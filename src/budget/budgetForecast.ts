/**
 * The analytic forecast along the solved quantity, in milliseconds: the
 * noncentral chi-square detection probability of `forecastDetection`
 * (src/physics/detectionForecast.ts; white Gaussian timing errors at the
 * Cramér–Rao precision of the fitted model) with the same inputs
 * `computeLimits` gives it. The per-transit precision depends only on the
 * star, planet and instrument, the TTV/TDV amplitudes only on the moon, so
 * each is computed once and combined for every (value, moon) pair.
 */
import { computeLimits, type LimitsJson } from '../limits/computeLimits.js';
import { forecastDetection } from '../physics/detectionForecast.js';
import { parseScenario } from '../scenario/parseScenario.js';
import type { Scenario } from '../scenario/types.js';
import { scenarioDocumentOf } from '../scenario/scenarioDocument.js';
import type { BudgetChannel } from './budgetTypes.js';
import { applyQuantity, type SolvedQuantity } from './solvedQuantity.js';
import { MIN_BUDGET_TRANSITS } from './budgetSpec.js';

/** What the forecast needs from the moon (from computeLimits). */
export interface MoonSignal {
  ttvRmsS: number;
  tdvRmsS: number;
  /** Alias frequency of the moon's TTV sampled once per transit, cycles per epoch. */
  aliasFrequencyPerEpoch: number;
}

/** What the forecast needs from the observation at one value of the solved quantity. */
export interface ValuePrecision {
  transits: number;
  sigmaTcS: number;
  sigmaDurS: number;
  falseAlarm: number;
}

export function moonSignal(l: LimitsJson): MoonSignal {
  return { ttvRmsS: l.ttv_rms_s ?? 0, tdvRmsS: l.tdv_rms_s ?? 0, aliasFrequencyPerEpoch: l.ttv_alias_frequency_per_epoch ?? 0 };
}

export function valuePrecision(l: LimitsJson): ValuePrecision {
  return { transits: l.transits, sigmaTcS: l.timing_precision_s, sigmaDurS: l.duration_precision_s, falseAlarm: l.false_alarm };
}

/**
 * Forecast detection probability of `channel`: TTV, TDV, or for `combined`
 * the joint χ²_TTV + χ²_TDV test at α (a stand-in: the Monte Carlo's combined
 * rule is a weighted min-p over the template, TTV, TDV and dip channels,
 * timing/detection.ts, mostly carried by the template search, so the budget's
 * Monte Carlo usually needs fewer transits than this forecast). Null for the dip and
 * template channels (no analytic forecast), for a channel the transit count does not
 * allow (TTV below 3 transits, TDV and combined below 2; detectionForecast.ts),
 * or without a finite precision.
 */
export function forecastProbability(channel: BudgetChannel, sig: MoonSignal, p: ValuePrecision): number | null {
  if (channel === 'dip' || channel === 'template' || !(p.transits >= 1)) return null;
  if (!(p.sigmaTcS > 0 && p.sigmaDurS > 0) || !Number.isFinite(p.sigmaTcS + p.sigmaDurS)) return null;
  const f = forecastDetection({
    nTransits: p.transits,
    sigmaTcS: p.sigmaTcS,
    sigmaDurS: p.sigmaDurS,
    ttvRmsS: sig.ttvRmsS,
    tdvRmsS: sig.tdvRmsS,
    falseAlarm: p.falseAlarm,
    aliasFrequencyPerEpoch: Math.min(0.5, Math.max(0, sig.aliasFrequencyPerEpoch)),
  });
  // A channel that the transit count does not allow (TTV below 3, any timing below 2) has no forecast.
  const c = channel === 'ttv' ? f.ttv : channel === 'tdv' ? f.tdv : f.joint;
  return c ? c.probability : null;
}

/**
 * The observation's precision at every grid value of `q`, for the scenario
 * `base` with the value applied to its document (`Scenario.document`) and
 * validated as a scenario is. Transits change nothing in the
 * per-transit precision, so that grid needs one computeLimits call.
 */
export function precisionsAlong(q: SolvedQuantity, base: Scenario): ValuePrecision[] {
  if (q.solve === 'transits') {
    const p = valuePrecision(computeLimits(base));
    return q.values.map((n) => ({ ...p, transits: n }));
  }
  const doc = scenarioDocumentOf(base);
  return q.values.map((v) => valuePrecision(computeLimits(parseScenario(applyQuantity(doc, q, v)))));
}

/** Smallest n in [from, nMax] whose forecast reaches `probability`, by doubling then bisection (null: none). Assumes the forecast rises with n. */
export function forecastTransitsNeeded(channel: BudgetChannel, sig: MoonSignal, p: ValuePrecision, probability: number, from: number, nMax: number): number | null {
  const ok = (n: number): boolean => (forecastProbability(channel, sig, { ...p, transits: n }) ?? 0) >= probability;
  let hi = Math.max(MIN_BUDGET_TRANSITS, from);
  let lo = hi - 1;
  if (hi > nMax) return null;
  while (!ok(hi)) {
    if (hi >= nMax) return null;
    lo = hi;
    hi = Math.min(nMax, 2 * hi);
  }
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (ok(mid)) hi = mid;
    else lo = mid;
  }
  return hi;
}
