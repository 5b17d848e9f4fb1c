/**
 * Depth of a moon's own transit dip.
 *
 * A small opaque disc (R_S ≪ R*) fully inside the stellar disc at projected
 * radius r blocks a fraction p²·I(μ)/(4Ω) of a quadratically limb-darkened
 * star, p = R_S/R*, I(μ) = 1 − u1(1 − μ) − u2(1 − μ)², μ = sqrt(1 − r²),
 * 4Ω = 1 − u1/3 − u2/6 (Mandel & Agol 2002, ApJ 580, L171, §5 small-planet
 * approximation and §4). Uniform disc: p².
 *
 * Two positions are offered: the moon at the planet–moon barycentre's
 * mid-transit position (r = b, the mean position of the moon over its orbit),
 * and the mean over the transit chord at impact parameter b, with
 * x uniform on [−c, c], c = sqrt(1 − b²): ⟨μ⟩ = πc/4, ⟨μ²⟩ = 2c²/3
 * (elementary integrals, derived here). Depths are fractions of the stellar
 * flux (the CLI prints ppm).
 */

export interface MoonDipInput {
  moonRadiusM: number;
  starRadiusM: number;
  /** Quadratic limb-darkening coefficients (I(μ)/I(1) = 1 − u1(1−μ) − u2(1−μ)²). */
  u1: number;
  u2: number;
  /** Impact parameter of the barycentre's transit chord, stellar radii, 0 ≤ b < 1. */
  impactParameter: number;
}

export interface MoonDip {
  /** (R_S/R*)², the uniform-disc depth. */
  uniformDepth: number;
  /** Depth with the moon at the barycentre's mid-transit position (r = b). */
  depthAtMidTransit: number;
  /** Depth averaged along the transit chord. */
  depthChordMean: number;
}

/** Moon-dip depths (fractions) for a small moon (see header; Mandel & Agol 2002 §5). */
export function moonDipDepth(input: MoonDipInput): MoonDip {
  const { moonRadiusM, starRadiusM, u1, u2, impactParameter: b } = input;
  if (!(moonRadiusM >= 0) || !Number.isFinite(moonRadiusM)) {
    throw new RangeError(`moonRadiusM must be ≥ 0 and finite; got ${moonRadiusM}`);
  }
  if (!(starRadiusM > 0) || !Number.isFinite(starRadiusM)) {
    throw new RangeError(`starRadiusM must be positive and finite; got ${starRadiusM}`);
  }
  if (!Number.isFinite(u1)) throw new RangeError(`u1 must be finite; got ${u1}`);
  if (!Number.isFinite(u2)) throw new RangeError(`u2 must be finite; got ${u2}`);
  if (!(b >= 0 && b < 1)) throw new RangeError(`impactParameter must be in [0, 1); got ${b}`);
  const p = moonRadiusM / starRadiusM;
  const uniformDepth = p * p;
  // Mandel & Agol 2002: total flux ∝ 4Ω = 1 − u1/3 − u2/6 for I(μ=1) = 1.
  const norm = 1 - u1 / 3 - u2 / 6;
  const intensity = (mu: number, mu2: number): number => 1 - u1 * (1 - mu) - u2 * (1 - 2 * mu + mu2);
  const muMid = Math.sqrt(1 - b * b);
  const c = muMid;
  return {
    uniformDepth,
    depthAtMidTransit: (uniformDepth * intensity(muMid, muMid * muMid)) / norm,
    depthChordMean: (uniformDepth * intensity((Math.PI * c) / 4, (2 * c * c) / 3)) / norm,
  };
}
