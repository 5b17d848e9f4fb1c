/**
 * What this machine gives two threads: the same fixed arithmetic loop (no
 * memory traffic, no allocation) timed alone on one worker thread and on two
 * worker threads at once. Ratio = 2 × (time alone) / (mean time of the pair):
 * 2.0 on two free cores, less when the cores are shared (hyper-threads, other
 * tenants). The sweep's 2-over-1-worker speed-up cannot exceed it, so the
 * bench prints both, measured in the same run.
 */
import { Worker } from 'node:worker_threads';
import { median } from './measure.js';

const LOOP = `
const { parentPort, workerData } = require('node:worker_threads');
let x = 0;
const t = performance.now();
for (let i = 0; i < workerData; i++) x += Math.sqrt(i) * 1e-9;
parentPort.postMessage([performance.now() - t, x]);
`;

function spin(threads: number, iterations: number): Promise<number[]> {
  return Promise.all(
    Array.from({ length: threads }, () => new Promise<number>((resolve, reject) => {
      const w = new Worker(LOOP, { eval: true, workerData: iterations });
      w.on('message', (m: [number, number]) => {
        resolve(m[0]);
        void w.terminate();
      });
      w.on('error', reject);
    })),
  );
}

/**
 * Medians over `repeats` of the two-thread capacity ratio (see the file header)
 * and of the loop's time alone, ms: a yardstick of the machine's speed at the
 * time of the run (a shared machine can run at half speed for minutes; 0.57 s
 * for 1e8 steps was typical here on 2026-12-02, about twice that when slowed).
 */
export async function threadScaling(repeats = 3, iterations = 1e8): Promise<{ ratio: number; aloneMs: number }> {
  const ratios: number[] = [];
  const alone: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const [one] = await spin(1, iterations);
    const pair = await spin(2, iterations);
    alone.push(one);
    ratios.push((2 * one) / ((pair[0] + pair[1]) / 2));
  }
  return { ratio: median(ratios), aloneMs: median(alone) };
}
