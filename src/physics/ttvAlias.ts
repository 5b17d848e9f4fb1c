/**
 * Stroboscopic aliasing of a moon's TTV signal.
 *
 * Transits sample the planet's reflex motion once per barycentre period P_B,
 * while a Hill-stable moon has P_S well below P_B (Kipping 2009a, MNRAS 392,
 * 181). A signal at P_B/P_S cycles per epoch then appears in a TTV periodogram
 * at the folded frequency
 *   ν = |P_B/P_S − round(P_B/P_S)|  ∈ [0, ½] cycles per epoch,
 * alias period 1/ν epochs (Kipping 2021, MNRAS 500, 1851, "exomoon
 * corridor"; standard Nyquist folding for unit-spaced samples). Every moon
 * with P_B/P_S = k ± ν (k = 1, 2, …) gives the same ν, so the TTV period alone
 * cannot fix P_S; `aliasFamily` lists the first members.
 */

export interface TtvAlias {
  /** P_B / P_S: moon orbits per transit epoch. */
  periodRatio: number;
  /** Folded frequency ν, cycles per epoch, in [0, ½]. */
  aliasFrequencyPerEpoch: number;
  /** 1/ν, epochs (Infinity when ν = 0). */
  aliasPeriodEpochs: number;
  /** P_B/ν, s (Infinity when ν = 0). */
  aliasPeriodS: number;
}

export interface AliasFamilyMember {
  /** Harmonic k of the sampling frequency. */
  harmonic: number;
  /** +1 for P_B/P_S = k + ν, −1 for k − ν. */
  sign: 1 | -1;
  /** Moon period that aliases to the same ν, s. */
  moonPeriodS: number;
}

function requirePositive(name: string, v: number): void {
  if (!(v > 0) || !Number.isFinite(v)) throw new RangeError(`${name} must be a positive finite number; got ${v}`);
}

/** Folded TTV frequency of a moon of period P_S sampled once per P_B (Kipping 2021, MNRAS 500, 1851). */
export function ttvAlias(barycentrePeriodS: number, moonPeriodS: number): TtvAlias {
  requirePositive('barycentrePeriodS', barycentrePeriodS);
  requirePositive('moonPeriodS', moonPeriodS);
  const periodRatio = barycentrePeriodS / moonPeriodS;
  const nu = Math.abs(periodRatio - Math.round(periodRatio));
  return {
    periodRatio,
    aliasFrequencyPerEpoch: nu,
    aliasPeriodEpochs: 1 / nu,
    aliasPeriodS: barycentrePeriodS / nu,
  };
}

/**
 * Moon periods P_S = P_B/(k ± ν), k = 1 … maxHarmonic, that alias to the folded
 * frequency ν (cycles per epoch, 0 ≤ ν ≤ ½), in increasing k; k − ν ≤ 0 is
 * skipped and ν = 0 or ½ (where k + ν and k + 1 − ν coincide) is listed once.
 */
export function aliasFamily(barycentrePeriodS: number, aliasFrequencyPerEpoch: number, maxHarmonic = 5): AliasFamilyMember[] {
  requirePositive('barycentrePeriodS', barycentrePeriodS);
  const nu = aliasFrequencyPerEpoch;
  if (!(nu >= 0 && nu <= 0.5)) throw new RangeError(`aliasFrequencyPerEpoch must be in [0, 0.5]; got ${nu}`);
  if (!Number.isInteger(maxHarmonic) || maxHarmonic < 1) {
    throw new RangeError(`maxHarmonic must be a positive integer; got ${maxHarmonic}`);
  }
  const out: AliasFamilyMember[] = [];
  const seen = new Set<number>();
  for (let k = 1; k <= maxHarmonic; k++) {
    for (const sign of [-1, 1] as const) {
      const ratio = k + sign * nu;
      if (!(ratio > 0)) continue;
      const key = Math.round(ratio * 1e9);
      if (seen.has(key)) continue;
      seen.add(key);
      out.push({ harmonic: k, sign, moonPeriodS: barycentrePeriodS / ratio });
    }
  }
  return out;
}
