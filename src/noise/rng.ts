/**
 * Seeded random numbers for reproducible simulation.
 *
 * Every realization draws from its own generator, keyed by
 * (scenario seed, cell index, realization index), so a sweep gives the same
 * numbers whatever the worker count, order, sharding or resumption: any
 * (cell, realization) is reached in O(1), with no jump() chain.
 *
 * Generator: xoroshiro128+ (Blackman & Vigna 2018, "Scrambled linear
 * pseudorandom number generators", arXiv:1805.01407; ACM TOMS 47(4), 36, 2021),
 * parameters a = 24, b = 16, c = 37, written on 32-bit halves. Doubles take the
 * upper 53 bits of each 64-bit output, as the authors recommend (the lowest
 * bits of the "+" scrambler have low linear complexity). The same update as
 * pure-rand's `xoroshiro128plus` (checked bit for bit in the tests); written
 * here because pure-rand's 32-bit `next()` exposes only the low half of each
 * output and so needs two steps, from the weak low bits, per double.
 *
 * State derivation: SplitMix64 (Steele, Lea & Flood 2014, "Fast splittable
 * pseudorandom number generators", OOPSLA '14, 453) with the `mix64` finalizer
 * of Java 8's SplittableRandom (Stafford's "Mix13"), the seeding Blackman &
 * Vigna 2018 (Sect. 10) recommend. Each mixing step is a bijection of 64-bit
 * words, so for a fixed seed distinct (cell, realization) pairs give distinct
 * keys, and the two state words are consecutive SplitMix64 outputs of that key.
 *
 * Gaussian deviates: ziggurat (Marsaglia & Tsang 2000; Doornik 2005), see
 * `gaussian.ts`.
 */
import { fillNormalZiggurat, normalZiggurat } from './gaussian.js';

/** A seeded source of uniform and normal deviates. Not shared between threads. */
export interface Rng {
  /** Uniform double on [0, 1), multiple of 2⁻⁵³ (53 random bits). */
  uniform(): number;
  /** Standard normal deviate N(0, 1). */
  normal(): number;
  /** Fill `out` with N(0, sigma²) deviates in place (sigma defaults to 1). */
  fillNormal(out: Float64Array, sigma?: number): void;
}

const MASK64 = (1n << 64n) - 1n;
/** SplitMix64 increment γ, the odd integer nearest 2⁶⁴/φ (Steele, Lea & Flood 2014, Sect. 3). */
const GOLDEN_GAMMA = 0x9e3779b97f4a7c15n;

/**
 * Stafford "Mix13" 64-bit finalizer as used by SplitMix64 (Java 8 SplittableRandom.mix64); a bijection.
 * Exported for tests only (not part of the public API).
 */
export function mix64(z: bigint): bigint {
  z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & MASK64;
  z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & MASK64;
  return z ^ (z >> 31n);
}

/** 2⁻⁵³ and 2²⁶, for building a 53-bit double from the upper bits of a 64-bit word. */
const TWO_POW_M53 = 1 / 9007199254740992;
const TWO_POW_26 = 67108864;

/**
 * xoroshiro128+ on 32-bit halves s0 = (s[0], s[1]), s1 = (s[2], s[3]) (high, low),
 * kept in an Int32Array: measured faster in V8 than four object fields.
 */
class Xoroshiro128PlusRng implements Rng {
  private readonly s: Int32Array;

  constructor(s0h: number, s0l: number, s1h: number, s1l: number) {
    this.s = Int32Array.of(s0h, s0l, s1h, s1l);
  }

  uniform(): number {
    const s = this.s;
    const s0h = s[0];
    const s0l = s[1];
    const s1h = s[2];
    const s1l = s[3];
    // Output s0 + s1 mod 2⁶⁴ (Blackman & Vigna 2018, Fig. 1, xoroshiro128+); the carry out of the
    // low words is bit 32 of their sum, computed in 31-bit integer arithmetic.
    const carry = ((s0l >>> 1) + (s1l >>> 1) + (s0l & s1l & 1)) >>> 31;
    const hi = (s0h + s1h + carry) | 0;
    const lo = (s0l + s1l) | 0;
    // State update: s1 ^= s0; s0 = rotl(s0, 24) ^ s1 ^ (s1 << 16); s1 = rotl(s1, 37).
    const th = s1h ^ s0h;
    const tl = s1l ^ s0l;
    s[0] = ((s0h << 24) | (s0l >>> 8)) ^ th ^ ((th << 16) | (tl >>> 16));
    s[1] = ((s0l << 24) | (s0h >>> 8)) ^ tl ^ (tl << 16);
    s[2] = (tl << 5) | (th >>> 27);
    s[3] = (th << 5) | (tl >>> 27);
    // Upper 53 bits of the output: bits 63..37 (hi >>> 5) then bits 36..11.
    return ((hi >>> 5) * TWO_POW_26 + (((hi & 31) << 21) | (lo >>> 11))) * TWO_POW_M53;
  }

  normal(): number {
    return normalZiggurat(this);
  }

  fillNormal(out: Float64Array, sigma = 1): void {
    if (!(sigma >= 0) || !Number.isFinite(sigma)) {
      throw new RangeError(`sigma must be a finite number >= 0, got ${sigma}`);
    }
    fillNormalZiggurat(this, out, sigma);
  }
}

function checkIndex(name: string, v: number, allowNegative: boolean): void {
  if (!Number.isSafeInteger(v) || (!allowNegative && v < 0)) {
    throw new RangeError(
      `${name} must be a ${allowNegative ? '' : 'non-negative '}safe integer, got ${v}`,
    );
  }
}

/**
 * The 128-bit xoroshiro128+ state for (seed, cell, realization), as four
 * uint32 words [s0 high, s0 low, s1 high, s1 low]. Exposed for tests and for
 * recording provenance; `createRng` is the normal entry point.
 */
export function deriveRngState(seed: number, cell: number, realization: number): [number, number, number, number] {
  checkIndex('seed', seed, true);
  checkIndex('cell', cell, false);
  checkIndex('realization', realization, false);
  // Key chain: each step x ↦ mix64(x + γ) after xor with the next index is a bijection in that index.
  let k = mix64((BigInt.asUintN(64, BigInt(seed)) + GOLDEN_GAMMA) & MASK64);
  k = mix64(((k ^ BigInt(cell)) + GOLDEN_GAMMA) & MASK64);
  k = mix64(((k ^ BigInt(realization)) + GOLDEN_GAMMA) & MASK64);
  // Two consecutive SplitMix64 outputs from key k (Steele, Lea & Flood 2014, Fig. 16 nextLong).
  let s0 = mix64((k + GOLDEN_GAMMA) & MASK64);
  const s1 = mix64((k + 2n * GOLDEN_GAMMA) & MASK64);
  // The all-zero state is the one forbidden state of xoroshiro (Blackman & Vigna 2018, Sect. 3).
  if (s0 === 0n && s1 === 0n) s0 = GOLDEN_GAMMA;
  return [Number(s0 >> 32n), Number(s0 & 0xffffffffn), Number(s1 >> 32n), Number(s1 & 0xffffffffn)];
}

/**
 * A generator for one realization of one grid cell of a scenario.
 * `seed` is any safe integer; `cell` and `realization` are non-negative safe
 * integers. Throws RangeError otherwise. Cost ≈ a few µs (BigInt mixing), O(1)
 * in cell and realization.
 */
export function createRng(seed: number, cell: number, realization: number): Rng {
  const [s0h, s0l, s1h, s1l] = deriveRngState(seed, cell, realization);
  return new Xoroshiro128PlusRng(s0h, s0l, s1h, s1l);
}

/** A generator started from an explicit state [s0 high, s0 low, s1 high, s1 low] (uint32 words). */
export function createRngFromState(state: readonly [number, number, number, number]): Rng {
  if (state.length !== 4 || state.some((w) => !Number.isInteger(w) || w < -0x80000000 || w > 0xffffffff)) {
    throw new RangeError(`state must be four 32-bit integers, got ${JSON.stringify(state)}`);
  }
  if (state.every((w) => (w | 0) === 0)) {
    throw new RangeError('state must not be all zero (xoroshiro128+ forbids it)');
  }
  return new Xoroshiro128PlusRng(state[0], state[1], state[2], state[3]);
}
