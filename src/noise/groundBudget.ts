/**
 * Photometric noise budget of a ground-based telescope, per exposure and
 * binned to one hour, with the dominant term named (it decides between a
 * bigger telescope and more nights).
 *
 * Terms (relative flux, 1σ):
 * - photon (shot) noise of the star, sky background and read noise: the "CCD
 *   equation" (Merline & Howell 1995, Exp. Astron. 6, 163; Howell 2006,
 *   Handbook of CCD Astronomy, 2nd ed., Ch. 4) with dark current omitted:
 *   σ² = [N* + n_pix (N_sky/n_pix + R²)] / N*², each term kept separately;
 * - scintillation: Young 1967 (AJ 72, 747), in the form used by Dravins et al.
 *   1998 (PASP 110, 610): σ = 0.09 D_cm^(−2/3) X^1.75 e^(−h/8000 m) (2t)^(−1/2);
 *   or the modified Young form of Osborn et al. 2015 (MNRAS 452, 1707, eq. 7):
 *   σ² = 10×10⁻⁶ C_Y² D_m^(−4/3) t^(−1) X³ exp(−2h/H), H = 8000 m, C_Y = 1.5
 *   the median over the sites they studied. The prefactor is 1.0e-5: with
 *   C_Y = 1 and X = 1 it reproduces Young's 0.09²/2 · 100^(−4/3) = 8.7e-6 to
 *   within 7 % in σ (checked in the tests), as Osborn et al. intend;
 * - a systematic floor stated like a white term ("60 ppm in 1 h", the TESS
 *   noise-model convention of a floor in ppm h^1/2, Sullivan et al. 2015,
 *   ApJ 809, 77), scaled by √t.
 * The total is their quadrature sum. Every term falls as t^(−1/2) with the
 * number of exposures, so the 1-h values are the per-exposure values divided
 * by sqrt(3600 s / cadence) (dead time between exposures counts).
 */

/**
 * Johnson–Cousins UBVRI zero points: flux density of a magnitude-0 star, Jy,
 * effective wavelength, µm, and fractional bandwidth Δλ/λ (Bessell 1979,
 * PASP 91, 589, as tabulated in J. Huchra's notes on magnitudes,
 * https://lweb.cfa.harvard.edu/~dfabricant/huchra/ay145/mags.html).
 */
export const BAND_ZERO_POINTS = {
  U: { fluxJy: 1810, lambdaUm: 0.36, dLambdaOverLambda: 0.15 },
  B: { fluxJy: 4260, lambdaUm: 0.44, dLambdaOverLambda: 0.22 },
  V: { fluxJy: 3640, lambdaUm: 0.55, dLambdaOverLambda: 0.16 },
  R: { fluxJy: 3080, lambdaUm: 0.64, dLambdaOverLambda: 0.23 },
  I: { fluxJy: 2550, lambdaUm: 0.79, dLambdaOverLambda: 0.19 },
} as const;

export type MagnitudeBand = keyof typeof BAND_ZERO_POINTS;

/** Planck constant, J s (exact, SI 2019). */
const PLANCK_J_S = 6.62607015e-34;

/**
 * Photon flux of a magnitude-0 star in a band above the atmosphere, photons
 * s⁻¹ m⁻²: N = f_ν Δν / (hν) = f_ν (Δλ/λ) / h, since Δν/ν = Δλ/λ for a narrow
 * band (1 Jy = 10⁻²⁶ W m⁻² Hz⁻¹; 1 Jy·(Δλ/λ)/h = 1.51e7 photons s⁻¹ m⁻² per
 * unit Δλ/λ, as in Huchra's notes).
 */
export function bandZeroPointPhotons(band: MagnitudeBand): number {
  const z = BAND_ZERO_POINTS[band];
  if (!z) throw new RangeError(`band must be one of ${Object.keys(BAND_ZERO_POINTS).join(', ')}, got ${String(band)}`);
  return (z.fluxJy * 1e-26 * z.dLambdaOverLambda) / PLANCK_J_S;
}

/** V-band photon flux of a V = 0 star, photons s⁻¹ m⁻² (Bessell 1979 zero point): 8.79e9. */
export const V_BAND_ZERO_POINT_PHOTONS_PER_S_M2 = bandZeroPointPhotons('V');

/** Scale height of the turbulence, m (Young 1967; Osborn et al. 2015, eq. 7). */
const TURBULENCE_SCALE_HEIGHT_M = 8000;
/** Median empirical scintillation coefficient C_Y over the sites of Osborn et al. 2015. */
export const OSBORN_MEDIAN_CY = 1.5;
const SECONDS_PER_HOUR = 3600;

export type ScintillationModel = 'osborn2015' | 'young1967' | 'none';

export interface GroundBudgetInput {
  /** Telescope aperture diameter, m. */
  apertureDiameterM: number;
  /** Diameter of the central obstruction, m (default 0). */
  obstructionDiameterM?: number;
  /** Stellar magnitude in the band of the zero point. */
  magnitude: number;
  /** Photons s⁻¹ m⁻² from a magnitude-0 star in the band (default V_BAND_ZERO_POINT_PHOTONS_PER_S_M2). */
  zeroPointPhotonsPerSM2?: number;
  /** Total system throughput incl. atmosphere and detector QE, (0, 1]. */
  throughput: number;
  /** Exposure time, s. */
  exposureS: number;
  /** Time between exposure starts, s (≥ exposure; default = exposure). */
  cadenceS?: number;
  /** Optional sky background inside the photometric aperture. */
  sky?: { surfaceBrightnessMagPerArcsec2: number; apertureRadiusArcsec: number };
  /** Optional read noise: electrons rms per pixel and pixels in the aperture. */
  readNoise?: { electronsPerPixel: number; pixels: number };
  /** Scintillation model and site (default Osborn et al. 2015 with C_Y = 1.5). */
  scintillation?: { model?: ScintillationModel; airmass: number; altitudeM: number; cY?: number };
  /** Systematic floor (relative flux) stated at a timescale, scaled as white noise. */
  floor?: { fraction: number; timescaleS: number };
}

export type NoiseTermName = 'photon' | 'sky' | 'readNoise' | 'scintillation' | 'floor';

/** Each noise term and the quadrature total, relative flux (1σ). */
export interface NoiseTerms {
  photon: number;
  sky: number;
  readNoise: number;
  scintillation: number;
  floor: number;
  total: number;
}

export interface GroundBudget {
  perExposure: NoiseTerms;
  perHour: NoiseTerms;
  /** The largest term (the same per exposure and per hour, since all scale alike). */
  dominantTerm: NoiseTermName;
  /** Detected stellar photo-electrons per exposure. */
  starElectronsPerExposure: number;
}

function positive(name: string, v: number): void {
  if (!(v > 0) || !Number.isFinite(v)) throw new RangeError(`${name} must be a finite number > 0, got ${v}`);
}
function nonNegative(name: string, v: number): void {
  if (!(v >= 0) || !Number.isFinite(v)) throw new RangeError(`${name} must be a finite number >= 0, got ${v}`);
}

/**
 * Young 1967 scintillation, relative flux per exposure (as written by Dravins et al. 1998):
 * 0.09 D_cm^(−2/3) X^1.75 e^(−h/8000 m) (2t)^(−1/2). Kernel: NaN out of domain.
 */
export function scintillationYoung(apertureDiameterM: number, airmass: number, altitudeM: number, exposureS: number): number {
  if (!(apertureDiameterM > 0) || !(airmass >= 1) || !(exposureS > 0) || !Number.isFinite(altitudeM)) return NaN;
  const dCm = 100 * apertureDiameterM;
  return (
    0.09 *
    Math.pow(dCm, -2 / 3) *
    Math.pow(airmass, 1.75) *
    Math.exp(-altitudeM / TURBULENCE_SCALE_HEIGHT_M) *
    Math.pow(2 * exposureS, -0.5)
  );
}

/**
 * Osborn et al. 2015 (MNRAS 452, 1707, eq. 7) modified-Young scintillation, relative flux per exposure:
 * sqrt(1e-5 C_Y² D_m^(−4/3) t^(−1) X³ exp(−2h/H)), H = 8000 m. Kernel: NaN out of domain.
 */
export function scintillationOsborn(apertureDiameterM: number, airmass: number, altitudeM: number, exposureS: number, cY = OSBORN_MEDIAN_CY): number {
  if (!(apertureDiameterM > 0) || !(airmass >= 1) || !(exposureS > 0) || !(cY >= 0) || !Number.isFinite(altitudeM)) return NaN;
  const variance =
    10e-6 * // = 1.0e-5 (10 × 10⁻⁶), as printed in Osborn et al. 2015, eq. 7
    cY * cY *
    Math.pow(apertureDiameterM, -4 / 3) /
    exposureS *
    airmass ** 3 *
    Math.exp((-2 * altitudeM) / TURBULENCE_SCALE_HEIGHT_M);
  return Math.sqrt(variance);
}

/** Name of the largest term (ties go to the earlier name in the list). */
function dominant(t: NoiseTerms): NoiseTermName {
  const names: NoiseTermName[] = ['photon', 'sky', 'readNoise', 'scintillation', 'floor'];
  let best: NoiseTermName = 'photon';
  for (const k of names) if (t[k] > t[best]) best = k;
  return best;
}

/**
 * The noise budget for one star, telescope, site and exposure. Throws
 * RangeError naming any argument out of its domain.
 */
export function groundNoiseBudget(input: GroundBudgetInput): GroundBudget {
  const d = input.apertureDiameterM;
  positive('apertureDiameterM', d);
  const obstruction = input.obstructionDiameterM ?? 0;
  nonNegative('obstructionDiameterM', obstruction);
  if (!(obstruction < d)) throw new RangeError(`obstructionDiameterM must be < apertureDiameterM (${d}), got ${obstruction}`);
  if (!Number.isFinite(input.magnitude)) throw new RangeError(`magnitude must be finite, got ${input.magnitude}`);
  const zp = input.zeroPointPhotonsPerSM2 ?? V_BAND_ZERO_POINT_PHOTONS_PER_S_M2;
  positive('zeroPointPhotonsPerSM2', zp);
  if (!(input.throughput > 0 && input.throughput <= 1)) throw new RangeError(`throughput must be in (0, 1], got ${input.throughput}`);
  positive('exposureS', input.exposureS);
  const cadence = input.cadenceS ?? input.exposureS;
  positive('cadenceS', cadence);
  if (cadence < input.exposureS) throw new RangeError(`cadenceS must be >= exposureS (${input.exposureS}), got ${cadence}`);

  const t = input.exposureS;
  const areaM2 = (Math.PI / 4) * (d * d - obstruction * obstruction);
  // Pogson: flux ratio 10^(−0.4 m) relative to the zero point.
  const photonRate = zp * Math.pow(10, -0.4 * input.magnitude) * areaM2 * input.throughput;
  const nStar = photonRate * t;

  let nSky = 0;
  if (input.sky) {
    const { surfaceBrightnessMagPerArcsec2: mu, apertureRadiusArcsec: r } = input.sky;
    if (!Number.isFinite(mu)) throw new RangeError(`sky.surfaceBrightnessMagPerArcsec2 must be finite, got ${mu}`);
    nonNegative('sky.apertureRadiusArcsec', r);
    nSky = zp * Math.pow(10, -0.4 * mu) * Math.PI * r * r * areaM2 * input.throughput * t;
  }
  let readVar = 0;
  if (input.readNoise) {
    nonNegative('readNoise.electronsPerPixel', input.readNoise.electronsPerPixel);
    nonNegative('readNoise.pixels', input.readNoise.pixels);
    readVar = input.readNoise.pixels * input.readNoise.electronsPerPixel ** 2;
  }

  // CCD-equation terms (Merline & Howell 1995), each as a fraction of the star signal.
  const photon = 1 / Math.sqrt(nStar);
  const sky = Math.sqrt(nSky) / nStar;
  const readNoise = Math.sqrt(readVar) / nStar;

  let scintillation = 0;
  const sc = input.scintillation ?? null;
  if (sc) {
    const model = sc.model ?? 'osborn2015';
    if (model !== 'osborn2015' && model !== 'young1967' && model !== 'none') {
      throw new RangeError(`scintillation.model must be 'osborn2015', 'young1967' or 'none', got ${String(model)}`);
    }
    if (!(sc.airmass >= 1) || !Number.isFinite(sc.airmass)) throw new RangeError(`scintillation.airmass must be >= 1, got ${sc.airmass}`);
    if (!Number.isFinite(sc.altitudeM)) throw new RangeError(`scintillation.altitudeM must be finite, got ${sc.altitudeM}`);
    const cY = sc.cY ?? OSBORN_MEDIAN_CY;
    nonNegative('scintillation.cY', cY);
    if (model === 'osborn2015') scintillation = scintillationOsborn(d, sc.airmass, sc.altitudeM, t, cY);
    else if (model === 'young1967') scintillation = scintillationYoung(d, sc.airmass, sc.altitudeM, t);
  }

  let floor = 0;
  if (input.floor) {
    nonNegative('floor.fraction', input.floor.fraction);
    positive('floor.timescaleS', input.floor.timescaleS);
    floor = input.floor.fraction * Math.sqrt(input.floor.timescaleS / t);
  }

  const perExposure: NoiseTerms = {
    photon,
    sky,
    readNoise,
    scintillation,
    floor,
    total: Math.sqrt(photon ** 2 + sky ** 2 + readNoise ** 2 + scintillation ** 2 + floor ** 2),
  };
  // One hour of back-to-back exposures: N = 3600 s / cadence; every term falls as N^(−1/2).
  const k = 1 / Math.sqrt(SECONDS_PER_HOUR / cadence);
  const perHour: NoiseTerms = {
    photon: photon * k,
    sky: sky * k,
    readNoise: readNoise * k,
    scintillation: scintillation * k,
    floor: floor * k,
    total: perExposure.total * k,
  };
  return { perExposure, perHour, dominantTerm: dominant(perExposure), starElectronsPerExposure: nStar };
}
