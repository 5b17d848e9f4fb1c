/**
 * Micro-benchmarks for the noise stage: Gaussian draws per second (our
 * xoroshiro128+ vs pure-rand's xoroshiro128+ vs seedrandom's default ARC4,
 * with ziggurat / polar / Box–Muller samplers) and real FFT time (fft.js vs
 * fft-js). Each function returns labelled medians; bench/run.ts prints them.
 */
import { createRequire } from 'node:module';
import { performance } from 'node:perf_hooks';
import { median, rate, type BenchMedian } from './measure.js';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import seedrandom from 'seedrandom';
import FFT from 'fft.js';
import { createRng } from '../src/noise/rng.js';
import { powerLawNoise, powerLawTransformSize, PowerLawNoiseWorkspace } from '../src/noise/powerLawNoise.js';
import { dampedRandomWalkNoise } from '../src/noise/dampedRandomWalkNoise.js';
import { fillNormalBoxMuller, normalPolar, normalZiggurat, type UniformSource } from '../src/noise/gaussian.js';


function sumNormals(src: UniformSource, sampler: (s: UniformSource) => number, n: number): number {
  let acc = 0;
  for (let k = 0; k < n; k++) acc += sampler(src);
  return acc;
}

/** Uniform doubles and Gaussian deviates per second for each generator and sampler. */
export function benchGaussian(n = 2_000_000, repeats = 7): BenchMedian[] {
  const ours = createRng(1, 2, 3);
  const pr = xoroshiro128plus(12345);
  const pureRand: UniformSource = { uniform: () => uniformFloat64(pr) };
  const arc4 = seedrandom('12345');
  const seedrandomSrc: UniformSource = { uniform: () => arc4.double() };
  const buf = new Float64Array(n);
  const sum = (b: Float64Array): number => b[0] + b[b.length - 1];
  return [
    rate('uniform: xoroshiro128+ (moonsieve)', n, repeats, (m) => {
      let a = 0;
      for (let k = 0; k < m; k++) a += ours.uniform();
      return a;
    }),
    rate('uniform: xoroshiro128+ (pure-rand uniformFloat64)', n, repeats, (m) => {
      let a = 0;
      for (let k = 0; k < m; k++) a += uniformFloat64(pr);
      return a;
    }),
    rate('uniform: seedrandom ARC4 double()', n, repeats, (m) => {
      let a = 0;
      for (let k = 0; k < m; k++) a += arc4.double();
      return a;
    }),
    rate('normal: moonsieve Rng.fillNormal (xoroshiro128+ ziggurat)', n, repeats, (m) => {
      const b = buf.subarray(0, m);
      ours.fillNormal(b);
      return sum(b);
    }),
    rate('normal: xoroshiro128+ (moonsieve) polar', n, repeats, (m) => sumNormals(ours, normalPolar, m)),
    rate('normal: xoroshiro128+ (moonsieve) Box-Muller', n, repeats, (m) => {
      const b = buf.subarray(0, m);
      fillNormalBoxMuller(ours, b);
      return sum(b);
    }),
    rate('normal: xoroshiro128+ (pure-rand) ziggurat', n, repeats, (m) => sumNormals(pureRand, normalZiggurat, m)),
    rate('normal: seedrandom ARC4 ziggurat', n, repeats, (m) => sumNormals(seedrandomSrc, normalZiggurat, m)),
    rate('normal: seedrandom ARC4 polar', n, repeats, (m) => sumNormals(seedrandomSrc, normalPolar, m)),
  ];
}

interface FftJsModule {
  fft(vector: number[]): [number, number][];
}

/** Forward real FFT time (ms, median) at N = 4096 and 65536: fft.js realTransform vs fft-js. */
export function benchFft(sizes: readonly number[] = [4096, 65536], repeats = 7): BenchMedian[] {
  const require = createRequire(import.meta.url);
  const fftJs = require('fft-js') as FftJsModule;
  const out: BenchMedian[] = [];
  const rng = createRng(7, 0, 0);
  for (const n of sizes) {
    const x = new Float64Array(n);
    rng.fillNormal(x);
    const plain = Array.from(x);
    const f = new FFT(n);
    const spec = f.createComplexArray() as number[];
    const time = (label: string, reps: number, warmups: number, run: () => number): void => {
      let sink = 0;
      for (let w = 0; w < warmups; w++) sink += run(); // JIT warm-up

      const ts: number[] = [];
      for (let r = 0; r < reps; r++) {
        const t0 = performance.now();
        sink += run();
        ts.push(performance.now() - t0);
      }
      if (Number.isNaN(sink)) throw new Error('unreachable');
      out.push({ label: `${label}, N=${n}`, median: median(ts), unit: 'ms', repeats: reps });
    };
    time('fft.js realTransform+completeSpectrum', repeats * 3, 50, () => {
      f.realTransform(spec, x);
      f.completeSpectrum(spec);
      return spec[2];
    });
    time('fft-js fft', repeats, 2, () => fftJs.fft(plain)[1][0]);
  }
  return out;
}

/** Correlated-noise generation rates (M points/s): power-law (Timmer & König, fft.js) and damped random walk. */
export function benchCorrelatedNoise(repeats = 7): BenchMedian[] {
  const rng = createRng(8, 0, 0);
  const out: BenchMedian[] = [];
  for (const n of [4096, 65536]) {
    const x = new Float64Array(n);
    const ws = new PowerLawNoiseWorkspace(powerLawTransformSize(n));
    const opts = { dtS: 120, beta: 1, rmsFraction: 1e-4, timescaleS: 3600 };
    out.push(
      rate(`power-law noise beta=1, n=${n} (workspace reused)`, 16 * n, repeats, (m) => {
        let a = 0;
        for (let done = 0; done < m; done += n) a += powerLawNoise(x, opts, rng, ws)[0];
        return a;
      }),
    );
  }
  const n = 1_000_000;
  const t = Float64Array.from({ length: n }, (_, k) => 120 * k);
  const y = new Float64Array(n);
  out.push(rate('damped random walk, n=1e6', n, repeats, () => dampedRandomWalkNoise(t, 3600, 1e-4, rng, y)[n - 1]));
  return out;
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) {
  for (const r of [...benchGaussian(), ...benchFft(), ...benchCorrelatedNoise()]) {
    console.log(`${r.label.padEnd(62)} ${r.median.toFixed(3).padStart(10)} ${r.unit}`);
  }
}
