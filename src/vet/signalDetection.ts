/**
 * Is there a timing signal at all? The one detection rule of `vet`, used both
 * for the claim's own table and for every moon injected into its epochs and
 * errors (exclusionMap.ts), so the excluded region means exactly "this rule
 * would have fired".
 *
 * Tests (each a p-value under "linear ephemeris, constant duration, errors as
 * stated, white Gaussian noise"):
 *   - χ² of the mid-times about the weighted line, jointly with the durations
 *     about their mean when the table has them (Press et al. 2007, Numerical
 *     Recipes 3rd ed., §15.1; timing/chiSquareStatistics.ts);
 *   - the highest peak of the generalised Lomb–Scargle periodogram of the TTV
 *     residuals (and of the TDV residuals) over every frequency searched, as a
 *     false-alarm probability (Zechmeister & Kürster 2009, A&A 496, 577;
 *     Baluev 2008, MNRAS 385, 1279, eq. 14 with the Davies bound: the
 *     look-elsewhere effect of the frequency search), taken at its upper bound
 *     FAP_single + τ (the Davies bound), so that the rule stays conservative for
 *     the small tables of a claim, where the approximation is least accurate.
 * The k tests are combined by Bonferroni's bound (Bonferroni 1936; e.g. Miller
 * 1981, Simultaneous Statistical Inference, §1.2): a signal when
 * k·min(p) < α, so the false-alarm rate of the whole rule is at most α
 * whatever the correlation between the tests. ΔBIC is not a test here.
 */
import { jointTimingExcess, tdvExcess, ttvExcess } from '../timing/chiSquareStatistics.js';
import { fastPeriodogram } from './fastPeriodogram.js';

/** The tests of a table; `ttv_amplitude` / `tdv_amplitude` are the z-tests of claimed amplitudes (vetClaim.ts). */
export type SignalTestId = 'chi_square' | 'ttv_periodogram' | 'tdv_periodogram' | 'ttv_amplitude' | 'tdv_amplitude';

export interface SignalTest {
  id: SignalTestId;
  /** What was tested, in words (with the channel). */
  label: string;
  pValue: number;
}

export interface SignalDecision {
  falseAlarm: number;
  tests: SignalTest[];
  /** k·min(p), capped at 1: the false-alarm probability of the rule as a whole (Bonferroni). */
  adjustedPValue: number;
  /** The test with the smallest p-value (the one that sets the decision). */
  strongest: SignalTestId;
  detected: boolean;
}

/** Timing series in SI: mid-times (s, any zero), durations optional. */
export interface DetectionInput {
  epochs: Float64Array;
  timeS: Float64Array;
  timeErrS: Float64Array;
  durationS: Float64Array | null;
  durationErrS: Float64Array | null;
}

/** Scratch of `decideSignal`, reusable across injections (results never point into it). */
export interface DetectionScratch {
  ttvResid: Float64Array;
  tdvResid: Float64Array;
}

export function detectionScratch(n: number): DetectionScratch {
  return { ttvResid: new Float64Array(n), tdvResid: new Float64Array(n) };
}

/** Apply the detection rule (file header) at false-alarm level α. Pure. */
export function decideSignal(x: DetectionInput, falseAlarm: number, scratch: DetectionScratch = detectionScratch(x.epochs.length)): SignalDecision {
  if (!(falseAlarm > 0 && falseAlarm < 1)) throw new RangeError(`falseAlarm must be in (0, 1), got ${falseAlarm}`);
  const ttv = ttvExcess(x.epochs, x.timeS, x.timeErrS, scratch.ttvResid);
  const tests: SignalTest[] = [];
  if (x.durationS && x.durationErrS) {
    const tdv = tdvExcess(x.epochs, x.durationS, x.durationErrS, scratch.tdvResid);
    const joint = jointTimingExcess(ttv, tdv);
    tests.push({ id: 'chi_square', label: `joint TTV+TDV χ² ${joint.chiSquare.toPrecision(3)} for ${joint.dof} dof`, pValue: joint.pValue });
  } else {
    tests.push({ id: 'chi_square', label: `TTV χ² ${ttv.chiSquare.toPrecision(3)} for ${ttv.dof} dof`, pValue: ttv.pValue });
  }
  if (x.epochs.length >= 4) {
    const pt = fastPeriodogram(x.epochs, scratch.ttvResid, x.timeErrS, 10, 2);
    tests.push({ id: 'ttv_periodogram', label: `TTV periodogram peak at ${pt.peakFrequency.toPrecision(3)} cycles/epoch`, pValue: pt.falseAlarmBound });
    if (x.durationS && x.durationErrS) {
      const pd = fastPeriodogram(x.epochs, scratch.tdvResid, x.durationErrS);
      tests.push({ id: 'tdv_periodogram', label: `TDV periodogram peak at ${pd.peakFrequency.toPrecision(3)} cycles/epoch`, pValue: pd.falseAlarmBound });
    }
  }
  let best = tests[0];
  for (const t of tests) if (t.pValue < best.pValue || !Number.isFinite(best.pValue)) best = t;
  const minP = Number.isFinite(best.pValue) ? best.pValue : 1;
  const adjustedPValue = Math.min(1, tests.length * minP);
  return { falseAlarm, tests, adjustedPValue, strongest: best.id, detected: adjustedPValue < falseAlarm };
}
