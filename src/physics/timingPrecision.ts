/**
 * Per-transit timing and duration precision for white noise.
 *
 * Model: the trapezoid of Carter et al. 2008 (ApJ 689, 499):
 * depth δ, T = time from mid-ingress to mid-egress, τ = ingress (= egress)
 * duration, out-of-transit flux f0, uniform-disc star. With white noise σ
 * per sample and Γ samples per unit time, Q ≡ sqrt(ΓT)·δ/σ and, to leading
 * order in τ/T (Carter et al. 2008; formulas from memory, equation numbers not
 * re-checked; the I = 0 case is verified by the Fisher test):
 *   σ_tc = Q⁻¹ T sqrt(τ/(2T)),  σ_T = Q⁻¹ T sqrt(2τ/T),
 *   σ_τ  = Q⁻¹ T sqrt(6τ/T),    σ_δ = Q⁻¹ δ.
 *
 * Finite exposure I (each sample is the mean of the light curve over I):
 * the ∂m/∂t_c and ∂m/∂T derivatives are the ±δ/τ (resp. ±δ/(2τ)) boxes of
 * width τ at ingress and egress, convolved with the unit-area box of width I.
 * The squared norm of a box of width τ convolved with a box of width I is
 * (τ − I/3) (I ≤ τ) or (τ²/I²)(I − τ/3) (I > τ), which gives, in the
 * phase-averaged (Γ∫dt) Fisher information,
 *   I ≤ τ: σ_tc = Q⁻¹ T sqrt(τ/(2T)) (1 − I/(3τ))^{−1/2}
 *   I > τ: σ_tc = Q⁻¹ T sqrt(I/(2T)) (1 − τ/(3I))^{−1/2}
 * and σ_T = 2 σ_tc in both regimes (as for I = 0). This derivation is ours
 * (derived here, not copied from a paper); it is consistent with the Fisher
 * analysis of Price & Rogers 2014 (ApJ 794, 92), whose abstract states that
 * t_c stays uncorrelated with the other parameters at any I, and it is checked
 * in test/physics/timingPrecision.test.ts against a direct Fisher-matrix
 * computation on an exposure-integrated trapezoid with all five parameters
 * free. σ_τ and σ_δ are returned for instantaneous sampling only (Price &
 * Rogers 2014 report that σ_δ barely changes with I while σ_τ grows strongly;
 * no finite-exposure σ_τ is offered here).
 *
 * Accuracy against the full five-parameter Fisher matrix (t_c, T, τ, δ, f0):
 * σ_tc is exact in the phase-averaged limit (t_c decouples by symmetry);
 * σ_T ignores its correlation with δ and f0, which inflates the true σ_T by
 * O(max(τ, I)/T) (measured 1–4 % for I/T ≤ 0.08 with a baseline of T/2 on each
 * side); σ_δ = Q⁻¹δ assumes the out-of-transit level f0 is known (a long
 * baseline), otherwise the true σ_δ is larger.
 *
 * Validity: τ ≪ T, high S/N (the Cramér–Rao bound), white noise, a sampling
 * cadence fine compared with max(τ, I) or averaged over the sampling phase.
 * Limb darkening makes the true errors larger (Carter et al. 2008, §5).
 */

export interface TimingPrecisionInput {
  /** Transit depth δ as a fraction of the out-of-transit flux. */
  depth: number;
  /** T: mid-ingress to mid-egress duration, s. */
  durationS: number;
  /** τ: ingress (= egress) duration, s; 0 < τ < T. */
  ingressS: number;
  /** White noise per sample (per exposure), as a fraction of the stellar flux. */
  noisePerSample: number;
  /** Time between samples, s (Γ = 1/cadence). */
  cadenceS: number;
  /** Exposure (integration) time per sample, s; 0 means instantaneous sampling. */
  exposureS: number;
}

export interface TimingPrecision {
  /** Q = sqrt(ΓT)·δ/σ (Carter et al. 2008). */
  q: number;
  /** Mid-transit time uncertainty with the finite-exposure correction, s. */
  sigmaTcS: number;
  /** Duration (T) uncertainty with the finite-exposure correction, s. */
  sigmaDurS: number;
  /** Mid-transit time uncertainty for instantaneous sampling (Carter et al. 2008), s. */
  sigmaTcInstantS: number;
  /** Duration uncertainty for instantaneous sampling (Carter et al. 2008), s. */
  sigmaDurInstantS: number;
  /** Ingress duration uncertainty, instantaneous sampling only (Carter et al. 2008), s. */
  sigmaIngressInstantS: number;
  /** Depth uncertainty (fraction), instantaneous sampling (Carter et al. 2008). */
  sigmaDepth: number;
}

function requirePositive(name: string, v: number): void {
  if (!(v > 0) || !Number.isFinite(v)) {
    throw new RangeError(`${name} must be a positive finite number; got ${v}`);
  }
}

/**
 * Finite-exposure inflation factor of σ_tc (and σ_T) relative to Carter et al. 2008
 * instantaneous sampling at the same per-sample noise and cadence:
 * (1 − I/(3τ))^{−1/2} for I ≤ τ, sqrt(I/τ)·(1 − τ/(3I))^{−1/2} for I > τ (derived above).
 * Kernel: NaN for τ ≤ 0 or I < 0.
 */
export function exposureInflation(ingressS: number, exposureS: number): number {
  if (!(ingressS > 0) || !(exposureS >= 0)) return NaN;
  if (exposureS <= ingressS) return 1 / Math.sqrt(1 - exposureS / (3 * ingressS));
  return Math.sqrt(exposureS / ingressS) / Math.sqrt(1 - ingressS / (3 * exposureS));
}

/** Per-transit precision of t_c, T, τ and δ (see the file header for formulas and sources). */
export function timingPrecision(input: TimingPrecisionInput): TimingPrecision {
  const { depth, durationS: T, ingressS: tau, noisePerSample: sigma, cadenceS, exposureS } = input;
  requirePositive('depth', depth);
  requirePositive('durationS', T);
  requirePositive('ingressS', tau);
  requirePositive('noisePerSample', sigma);
  requirePositive('cadenceS', cadenceS);
  if (!(exposureS >= 0) || !Number.isFinite(exposureS)) {
    throw new RangeError(`exposureS must be ≥ 0 and finite; got ${exposureS}`);
  }
  if (!(tau < T)) {
    throw new RangeError(`ingressS must be shorter than durationS (${T} s); got ${tau}`);
  }
  const gamma = 1 / cadenceS;
  // Carter et al. 2008 (ApJ 689, 499): Q = sqrt(ΓT) δ/σ.
  const q = (Math.sqrt(gamma * T) * depth) / sigma;
  // Carter et al. 2008 (leading order in τ/T).
  const sigmaTcInstantS = (T / q) * Math.sqrt(tau / (2 * T));
  const sigmaDurInstantS = (T / q) * Math.sqrt((2 * tau) / T);
  const sigmaIngressInstantS = (T / q) * Math.sqrt((6 * tau) / T);
  const sigmaDepth = depth / q;
  // Finite-exposure factor (derived here; consistent with Price & Rogers 2014, ApJ 794, 92).
  const f = exposureInflation(tau, exposureS);
  return {
    q,
    sigmaTcS: sigmaTcInstantS * f,
    sigmaDurS: sigmaDurInstantS * f,
    sigmaTcInstantS,
    sigmaDurInstantS,
    sigmaIngressInstantS,
    sigmaDepth,
  };
}
