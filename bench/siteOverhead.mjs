// Cost of a ground campaign's per-exposure noise (issue 18): the demo campaign (two sites, 53
// epochs, clear nights) with the ground budget at each exposure's air mass (A: per-point σ, sandwich
// errors) against the same plan and points with one stated σ, their rms (B). Run after `npm run build`:
//   node bench/siteOverhead.mjs [realizations per repeat, default 40]
import { readFileSync } from 'node:fs';
const D = new URL('../dist/src', import.meta.url).href;
const { parseScenarioText } = await import(`${D}/scenario/loadScenario.js`);
const { runRealization, RealizationWorkspace } = await import(`${D}/timing/realization.js`);
const { createRng } = await import(`${D}/noise/rng.js`);
const { observingPlan } = await import(`${D}/noise/observingPlan.js`);
const text = readFileSync(new URL('../scenarios/demo-calendar.yaml', import.meta.url), 'utf8');
const moon = `\nmoon: {mass: 0.5 Mearth, radius: 0.8 Rearth, separation: 0.3 hill}\n`;
// A: ground budget (per-exposure σ at its air mass, sandwich errors). B: the same plan and points with one stated σ (their rms).
const A = parseScenarioText(text.replace('clear_fraction: 0.7', 'clear_fraction: 1') + moon, 'A');
const rms = Math.sqrt(observingPlan(A).sigma.reduce((a, v) => a + v * v, 0) / observingPlan(A).sigma.length);
const textB = text.replace(/  ground:\n    aperture: 1.5 m\n    magnitude: 11.0\n    altitude: 2400 m\n/, `  noise: ${(rms * 1e6).toFixed(3)} ppm\n`).replace('clear_fraction: 0.7', 'clear_fraction: 1');
const B = parseScenarioText(textB + moon, 'B');
if (B.instrument.ground) throw new Error('B still ground');
const R = Number(process.argv[2] ?? 40);
function time(s, r0) {
  const ws = new RealizationWorkspace();
  for (let r = 0; r < 5; r++) runRealization(s, createRng(s.seed, 0, r), { workspace: ws });
  const t = performance.now();
  let pts = 0;
  for (let r = r0; r < r0 + R; r++) pts += runRealization(s, createRng(s.seed, 0, r), { workspace: ws }).observation.timeS.length;
  return [(performance.now() - t) / R, pts / R];
}
const reps = Number(process.argv[3] ?? 9);
const out = { A: [], B: [] };
// Interleaved, and the fastest repeat of each: the least disturbed by other load on the machine.
for (let rep = 0; rep < reps; rep++) { out.A.push(time(A, 100)); out.B.push(time(B, 100)); }
const min = (xs) => Math.min(...xs.map((x) => x[0]));
const med = (xs) => xs.map((x) => x[0]).sort((a, b) => a - b)[Math.floor(xs.length / 2)];
console.log(`points/realization A ${out.A[0][1]}, B ${out.B[0][1]}; ms/realization over ${reps} × ${R}: fastest A ${min(out.A).toFixed(2)}, B ${min(out.B).toFixed(2)}, ratio ${(min(out.A) / min(out.B)).toFixed(3)}; median ratio ${(med(out.A) / med(out.B)).toFixed(3)}`);
