/**
 * A large pool of no-moon channel statistics (TTV, TDV, dip, template) of one
 * cell of an invented system, for measuring calibration methods against it
 * (bench/tailFit.ts). Realization r is realization r of the cell's null class
 * (nullSet.ts seeding), so any prefix of the pool is the null set a sweep with
 * that many no-moon realizations would draw. Computed in chunks (the template
 * residuals of 20 000 realizations would not fit in memory at once) and cached
 * in a file under the OS temporary folder, keyed by the class and the cell.
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync, renameSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseScenario } from '../src/scenario/parseScenario.js';
import { withoutMoon } from '../src/sweep/applyAxes.js';
import { computeNullRange, nullClassOfScenario, nullTemplateLayout, unpackNullSet } from '../src/sweep/nullSet.js';
import { channelsFor, dipProfile, dipScores } from '../src/sweep/runCell.js';
import { buildTemplateBank, freedomBasis, templateStatistics } from '../src/timing/templateSearch.js';
import { scenarioDurations } from '../src/photometry/transitWindows.js';
import { RealizationWorkspace } from '../src/timing/realization.js';
import { hillRadius } from '../src/physics/hillRadius.js';
import type { DetectionChannel } from '../src/timing/detection.js';
import { efficiencySystemDoc } from './efficiency.js';


export interface TailPool {
  count: number;
  channels: DetectionChannel[];
  stats: Partial<Record<DetectionChannel, Float64Array>>;
  seconds: number;
  cached: boolean;
  label: string;
}

/** Realizations are computed and cached in blocks of this many (the first block of a larger pool is the smaller pool). */
const BLOCK = 100000;

/** The pool of `count` no-moon realizations for the cell (mass, separation in Hill radii): blocks of 100 000, each cached. */
export function tailPool(count: number, massMearth = 0.15, separationHill = 0.3, onProgress?: (done: number) => void): TailPool {
  if (count <= BLOCK) return tailPoolBlock(0, count, massMearth, separationHill, onProgress);
  const parts: TailPool[] = [];
  for (let start = 0; start < count; start += BLOCK) parts.push(tailPoolBlock(start, Math.min(BLOCK, count - start), massMearth, separationHill, onProgress));
  const stats: TailPool['stats'] = {};
  for (const ch of parts[0].channels) {
    const all = new Float64Array(count);
    parts.forEach((p, i) => all.set(p.stats[ch]!, i * BLOCK));
    stats[ch] = all;
  }
  return { count, channels: parts[0].channels, stats, seconds: parts.reduce((a, p) => a + p.seconds, 0), cached: parts.every((p) => p.cached), label: `Harvik b, ${massMearth} M⊕ at ${separationHill} Hill, ${count} no-moon realizations` };
}

function tailPoolBlock(first: number, count: number, massMearth: number, separationHill: number, onProgress?: (done: number) => void): TailPool {
  const probe = parseScenario(efficiencySystemDoc(0.1, 1, 20), 'tail pool');
  const hillRp = hillRadius(probe.planet.semiMajorAxisM, probe.planet.massKg, probe.star.massKg) / probe.planet.radiusM;
  const s = parseScenario(efficiencySystemDoc(massMearth, separationHill, hillRp), 'tail pool');
  const c = nullClassOfScenario(withoutMoon(s), 17, first + count);
  const channels = channelsFor(s.observation.transits);
  const label = `Harvik b, ${massMearth} M⊕ at ${separationHill} Hill, ${count} no-moon realizations`;
  // Keyed by the class without its count (realization r does not depend on the count) and the block.
  const hash = createHash('sha256').update(nullClassOfScenario(withoutMoon(s), 17, 1).key).update(`|${massMearth}|${separationHill}|${first}|${count}`).digest('hex').slice(0, 16);
  const file = join(tmpdir(), `moonsieve-tail-pool-${hash}.json`);
  if (existsSync(file)) {
    const j = JSON.parse(readFileSync(file, 'utf8')) as { count: number; seconds: number; stats: Record<string, number[]> };
    const stats: TailPool['stats'] = {};
    for (const ch of channels) stats[ch] = Float64Array.from(j.stats[ch]);
    return { count, channels, stats, seconds: j.seconds, cached: true, label };
  }
  const t0 = performance.now();
  const layout = nullTemplateLayout(c);
  const bank = buildTemplateBank(s, layout, { basis: freedomBasis(c.scenario, layout) });
  const exclude = 0.5 * scenarioDurations(s).t14S;
  const stats: Record<DetectionChannel, Float64Array> = { ttv: new Float64Array(count), tdv: new Float64Array(count), dip: new Float64Array(count), template: new Float64Array(count) };
  const ws = new RealizationWorkspace();
  let profile: Float64Array | null = null;
  const chunk = 250;
  for (let start = 0; start < count; start += chunk) {
    const n = Math.min(chunk, count - start);
    const set = unpackNullSet(computeNullRange(c, first + start, n, ws));
    profile ??= dipProfile(s, set.stacks[0]);
    stats.ttv.set(set.ttv, start);
    stats.tdv.set(set.tdv, start);
    stats.dip.set(dipScores(set.stacks, profile, exclude), start);
    stats.template.set(templateStatistics(bank, set.rho, n), start);
    onProgress?.(first + start + n);
  }
  const seconds = (performance.now() - t0) / 1000;
  const out: Record<string, number[]> = {};
  for (const ch of channels) out[ch] = Array.from(stats[ch]);
  writeFileSync(`${file}.tmp`, JSON.stringify({ count, seconds, stats: out }));
  renameSync(`${file}.tmp`, file);
  const kept: TailPool['stats'] = {};
  for (const ch of channels) kept[ch] = stats[ch];
  return { count, channels, stats: kept, seconds, cached: false, label };
}

// `node dist/bench/tailPool.js N`: compute (or read) the pool, printing progress.
if (process.argv[1]?.endsWith('tailPool.js')) {
  const n = Number(process.argv[2] ?? 20000);
  const t0 = performance.now();
  const p = tailPool(n, 0.15, 0.3, (d) => { if (d % 1000 === 0) process.stdout.write(`${d} ${((performance.now() - t0) / 1000).toFixed(1)} s\n`); });
  process.stdout.write(`${p.label}: ${p.seconds.toFixed(1)} s${p.cached ? ' (cached)' : ''}\n`);
}
