/**
 * The planet keeps moving around the planet–moon barycentre while it
 * crosses the star. Kipping's (2009a, MNRAS 392, 181) TTV and TDV amplitudes
 * freeze the planet's reflex offset during the transit (moon period P_S ≫
 * transit duration D); when D is a sizeable fraction of P_S the contact times
 * sample the reflex offset x(t) = a_PB sin(2πt/P_S + φ) at ingress and egress,
 * half a duration apart, and the signals shrink (derived here):
 *   mid-time (t1 + t4)/2 shifts by −[x(t1) + x(t4)]/(2v) ∝ a_PB cos(πD/P_S),
 *   duration t4 − t1 changes by −[x(t4) − x(t1)]/v ∝ 2 a_PB sin(πD/P_S),
 * so relative to the frozen-planet amplitudes the TTV is multiplied by
 * cos(πD/P_S) and the TDV by sinc(πD/P_S) = sin(πD/P_S)/(πD/P_S). Both tend
 * to 1 as D/P_S → 0 (Kipping's limit). Checked against the nested-Kepler
 * truth in test/physics/transitAveraging.test.ts.
 */

export interface TransitAveraging {
  /** Factor on the TTV amplitude, |cos(πD/P_S)|. */
  ttvFactor: number;
  /** Factor on the velocity TDV amplitude, sinc(πD/P_S). */
  tdvFactor: number;
}

/** Kernel: NaN for a non-positive duration or moon period. */
export function transitAveraging(durationS: number, moonPeriodS: number): TransitAveraging {
  if (!(durationS > 0) || !(moonPeriodS > 0)) return { ttvFactor: NaN, tdvFactor: NaN };
  const w = (Math.PI * durationS) / moonPeriodS;
  return { ttvFactor: Math.abs(Math.cos(w)), tdvFactor: Math.abs(Math.sin(w) / w) };
}
