/**
 * The assumptions block of the sweep report: what was simulated and how
 * (star, planet, moon, instrument, noise model, transits, seed, false-alarm
 * probability requested and measured, software version, scenario hash).
 * Rows are plain text; the caller escapes them.
 */
import { parseScenario } from '../scenario/parseScenario.js';
import { whiteNoiseSigma } from '../noise/whiteNoise.js';
import { AU_M, DAY_S, HOUR_S, JULIAN_YEAR_S, L_SUN_W, M_EARTH_KG, M_JUP_KG, M_SUN_KG, R_EARTH_M, R_JUP_M, R_SUN_M } from '../physics/constants.js';
import type { CellResult } from '../sweep/cellTypes.js';
import type { SweepMeta } from '../sweep/sweepMeta.js';
import type { SweepRunInfo } from '../sweep/outputs.js';
import { axisDisplay, formatDisplay, formatNumber as f } from './axisDisplay.js';
import type { SweepSummary } from './summary.js';
import { num } from './reportGrid.js';

const DEG = 180 / Math.PI;

export function assumptionRows(meta: SweepMeta, summary: SweepSummary, scenarioDoc: unknown, runInfo: SweepRunInfo | null, cells: readonly CellResult[]): Array<[string, string]> {
  const rows: Array<[string, string]> = [['scenario', meta.scenario]];
  const swept = new Set(meta.axes.map((a) => a.field));
  const mark = (field: string) => (swept.has(field) ? ' (swept)' : '');
  if (scenarioDoc !== null && scenarioDoc !== undefined) {
    const s = parseScenario(scenarioDoc, 'scenario');
    const st = s.star;
    rows.push(['star', `M = ${f(st.massKg / M_SUN_KG)} M☉, R = ${f(st.radiusM / R_SUN_M)} R☉, Teff = ${f(st.teffK)} K, L = ${f(st.luminosityW / L_SUN_W)} L☉, age ${f(st.ageS / (1e9 * JULIAN_YEAR_S))} Gyr; quadratic limb darkening u1 = ${st.u1}, u2 = ${st.u2}`]);
    const p = s.planet;
    rows.push(['planet', `M = ${f(p.massKg / M_JUP_KG)} M_J${mark('planet.mass')}, R = ${f(p.radiusM / R_JUP_M)} R_J, P = ${f(p.periodS / DAY_S, 5)} d${mark('planet.period')}, a = ${f(p.semiMajorAxisM / AU_M)} au, e = ${p.eccentricity}, impact parameter ${f(p.impactParameter)}, Bond albedo ${p.albedo}, k2 = ${p.k2}, Q = ${f(p.tidalQ)}`]);
    const m = s.moon;
    rows.push(['moon (base values; swept fields vary by cell)', m
      ? `M = ${f(m.massKg / M_EARTH_KG)} M⊕${mark('moon.mass')}, R = ${f(m.radiusM / R_EARTH_M)} R⊕, separation ${f(m.separationM / p.radiusM)} Rp${mark('moon.separation')}, e = ${m.eccentricity}, inclination ${f(m.inclinationRad * DEG)}°, ${m.retrograde ? 'retrograde' : 'prograde'}; orbital phase (and node, periapsis where they matter) drawn at random in each realization`
      : 'none']);
    const ins = s.instrument;
    const sigma = whiteNoiseSigma(ins.noiseFraction, ins.noiseTimescaleS, ins.exposureS);
    rows.push(['instrument', `cadence ${f(ins.cadenceS / 60)} min${mark('instrument.cadence')}, exposure ${f(ins.exposureS / 60)} min, noise ${f(ins.noiseFraction * 1e6)} ppm per ${f(ins.noiseTimescaleS / 60)} min${mark('instrument.noise')}`]);
    rows.push(['noise model', `white Gaussian noise, ${f(sigma * 1e6)} ppm per exposure (scaled as 1/√t from the stated timescale); no correlated (red) noise, no stellar activity, no instrumental systematics, no weather or gaps`]);
    const o = s.observation;
    rows.push(['transits', `${o.transits} consecutive transits${mark('observation.transits')}, each observed from ${f(o.baselineS / HOUR_S)} h before first to ${f(o.baselineS / HOUR_S)} h after last contact; epoch 0 at BJD_TDB ${o.t0BjdTdb}`]);
  } else {
    rows.push(['scenario document', 'not available: star, planet, instrument and noise are not listed, and physical boundaries and example cells are omitted (run `moonsieve report DIR --scenario FILE` with the scenario file)']);
  }
  for (const [k, a] of meta.axes.entries()) {
    const d = axisDisplay(a);
    rows.push([`sweep axis ${k + 1}`, `${a.field}: ${a.values.length} values, ${a.spacing}, from ${a.from_text} to ${a.to_text} (${formatDisplay(d, Math.min(...a.values))} to ${formatDisplay(d, Math.max(...a.values))})`]);
  }
  rows.push(['detection', meta.forecast_only
    ? 'analytic forecast only: noncentral χ² of white-noise TTV/TDV excesses (no simulations)'
    : `${meta.realizations} realizations per cell; a channel detects when its statistic exceeds the threshold calibrated on no-moon realizations; combined = any of TTV, TDV, moon dip`]);
  const nulls = cells.map((c) => num(c, 'null_realizations')).filter((x): x is number => x !== null);
  let fa = `requested ${meta.false_alarm} per channel`;
  const m = summary.false_alarm_measured_combined;
  if (m) fa += `; measured on the no-moon realizations (combined channel, over the simulated cells): median ${f(m.median)}, range ${f(m.min)}–${f(m.max)}${nulls.length ? `, from ${Math.min(...nulls)} no-moon realizations` : ''}`;
  else fa += '; not measured (no simulated cells)';
  rows.push(['false-alarm probability', fa]);
  rows.push(['seed', `${meta.seed} (realization r of cell i draws from the generator keyed by (seed, i, r))`]);
  rows.push(['software', `moonsieve ${meta.moonsieve_version}${runInfo ? `, Node ${runInfo.node_version}` : ''}`]);
  rows.push(['scenario hash (sha256 of the canonical scenario)', meta.scenario_hash]);
  if (runInfo) {
    rows.push(['run', `${runInfo.cells} of ${runInfo.cells_total} cells${runInfo.shard ? ` (shard ${runInfo.shard.k}/${runInfo.shard.n})` : ''}, ${runInfo.workers} worker threads, ${f(runInfo.wall_time_s)} s, finished ${runInfo.finished}${runInfo.merged_from ? `, merged from ${runInfo.merged_from.length} shards` : ''}`]);
  }
  for (const n of meta.notes) rows.push(['note', n]);
  return rows;
}
