/**
 * The assumptions block of the sweep report: what was simulated and how
 * (star, planet, moon, instrument, noise model, transits, seed, false-alarm
 * probability requested and measured, software version, scenario hash).
 * Rows are plain text; the caller escapes them.
 */
import { parseScenario } from '../scenario/parseScenario.js';
import type { Scenario } from '../scenario/types.js';
import { scenarioDurations, windowsOverlap } from '../photometry/transitWindows.js';
import { whiteNoiseSigma } from '../noise/whiteNoise.js';
import { boundNotes } from '../timing/knownTemplateBound.js';
import { AU_M, DAY_S, HOUR_S, JULIAN_YEAR_S, L_SUN_W, M_EARTH_KG, M_JUP_KG, M_SUN_KG, R_EARTH_M, R_JUP_M, R_SUN_M } from '../physics/constants.js';
import type { CellResult } from '../sweep/cellTypes.js';
import type { SweepMeta, SweepRunInfo } from '../sweep/sweepMeta.js';
import { axisDisplay, formatDisplay, formatNumber as f } from './axisDisplay.js';
import type { SweepSummary } from './summary.js';
import { num } from './reportGrid.js';

const DEG = 180 / Math.PI;
const ppm = (x: number) => `${f(x * 1e6)} ppm`;

/** What the known-template bound (pdet_bound) is, and what of this scenario it leaves out. */
export function boundText(s: Scenario): string {
  const leaves = boundNotes(s);
  return 'the known-template bound: the matched filter for the exact planet+moon light curve after the planet-only model\'s own freedoms (mid-time, period, radius ratio, impact parameter, a/R*, limb darkening, each transit\'s offset and slope) are projected out, Φ(SNR − z₁₋α), averaged over the moon\'s phase (and node, periapsis where drawn); no analysis of the same data can beat it: it knows the moon\'s mass, radius and orbit up to those angles and assumes white noise (Kay 1998, Detection Theory, §4.3, §7.7)'
    + (leaves.length ? `; ${leaves.join('; ')}` : '');
}

/** The instrument row: cadence, exposure and where the white-noise level came from (stated, or a ground budget). */
export function instrumentText(s: Scenario, mark: (field: string) => string = () => ''): string {
  const ins = s.instrument;
  const head = `cadence ${f(ins.cadenceS / 60)} min${mark('instrument.cadence')}, exposure ${f(ins.exposureS / 60)} min`;
  const g = ins.ground;
  if (!g) return `${head}, noise ${f(ins.noiseFraction * 1e6)} ppm per ${f(ins.noiseTimescaleS / 60)} min${mark('instrument.noise')}`;
  return `${head}; white noise from a ground-based budget${mark('instrument.ground')}: ${f(g.apertureM)} m aperture, magnitude ${f(g.magnitude)}, throughput ${f(g.throughput)}, airmass ${f(g.airmass)}, site altitude ${f(g.altitudeM)} m, scintillation coefficient C_Y = ${f(g.scintillationCoefficient)} (Osborn et al. 2015), floor ${g.floorFraction > 0 ? `${ppm(g.floorFraction)} per ${f(g.floorTimescaleS / 60)} min` : 'none'}; per exposure: photon ${ppm(g.terms.photon)}, scintillation ${ppm(g.terms.scintillation)}, floor ${ppm(g.terms.floor)}, total ${ppm(g.terms.total)} (dominated by ${g.terms.dominant})`;
}

/** The noise-model row: the white level per exposure and the correlated noise the scenario sets (or that there is none). */
export function noiseModelText(s: Scenario, mark: (field: string) => string = () => ''): string {
  const ins = s.instrument;
  const sigma = whiteNoiseSigma(ins.noiseFraction, ins.noiseTimescaleS, ins.exposureS);
  const white = `white Gaussian noise, ${ppm(sigma)} per exposure (scaled as 1/√t from the stated timescale)`;
  const r = ins.redNoise;
  const red = !r
    ? 'no correlated (red) noise'
    : r.model === 'drw'
      ? `plus correlated noise${mark('instrument.red_noise')}: a damped random walk (Kelly et al. 2009), rms ${ppm(r.rmsFraction)}, timescale ${f(r.tauS / 60)} min`
      : `plus correlated noise${mark('instrument.red_noise')}: a power law S ∝ f^−${f(r.beta)} (Timmer & König 1995), rms ${ppm(r.rmsFraction)} over ${f(r.timescaleS / 60)} min`;
  return `${white}; ${red}; no stellar activity, no instrumental systematics`;
}

/** The gaps row: missed transits and random gaps within the windows, or that every window was fully observed. */
export function gapsText(s: Scenario, mark: (field: string) => string = () => ''): string {
  const o = s.observation;
  const parts: string[] = [];
  if (o.missedFraction > 0) parts.push(`each transit missed with probability ${f(o.missedFraction)}${mark('observation.missed_fraction')} (weather, scheduling; drawn per realization)`);
  if (o.dutyCycle < 1) parts.push(`${f(100 * o.dutyCycle)} % of each window observed${mark('observation.duty_cycle')}, in random gaps of mean length ${f(o.gapLengthS / 60)} min${mark('observation.gap_length')}`);
  return parts.length ? parts.join('; ') : 'none: every transit and every window fully observed (no weather, no gaps)';
}

export function assumptionRows(meta: SweepMeta, summary: SweepSummary, scenarioDoc: unknown, runInfo: SweepRunInfo | null, cells: readonly CellResult[]): Array<[string, string]> {
  const rows: Array<[string, string]> = [['scenario', meta.scenario]];
  const swept = new Set(meta.axes.map((a) => a.field));
  // A field is marked when it, or a field under it (instrument.ground.aperture under instrument.ground), is an axis.
  const mark = (field: string) => ([...swept].some((a) => a === field || a.startsWith(`${field}.`)) ? ' (swept)' : '');
  let forecastIgnores = '';
  if (scenarioDoc !== null && scenarioDoc !== undefined) {
    const s = parseScenario(scenarioDoc, 'scenario');
    const ignored = [s.instrument.redNoise ? 'red noise' : '', s.observation.missedFraction > 0 || s.observation.dutyCycle < 1 ? 'gaps and missed transits' : ''].filter(Boolean);
    if (ignored.length) forecastIgnores = `; it ignores the ${ignored.join(' and the ')} set in the scenario (only simulations include them)`;
    const st = s.star;
    rows.push(['star', `M = ${f(st.massKg / M_SUN_KG)} M☉, R = ${f(st.radiusM / R_SUN_M)} R☉, Teff = ${f(st.teffK)} K, L = ${f(st.luminosityW / L_SUN_W)} L☉, age ${f(st.ageS / (1e9 * JULIAN_YEAR_S))} Gyr; quadratic limb darkening u1 = ${st.u1}, u2 = ${st.u2}`]);
    const p = s.planet;
    rows.push(['planet', `M = ${f(p.massKg / M_JUP_KG)} M_J${mark('planet.mass')}, R = ${f(p.radiusM / R_JUP_M)} R_J, P = ${f(p.periodS / DAY_S, 5)} d${mark('planet.period')}, a = ${f(p.semiMajorAxisM / AU_M)} au, e = ${p.eccentricity}, impact parameter ${f(p.impactParameter)}, Bond albedo ${p.albedo}, k2 = ${p.k2}, Q = ${f(p.tidalQ)}${scenarioDurations(s).t23S > 0 ? '' : `; grazing transit (no flat bottom, Seager & Mallén-Ornelas 2003)${p.impactParameter >= 0.999 ? ', moon dip modelled at b = 0.999' : ''}`}`]);
    const m = s.moon;
    rows.push(['moon (base values; swept fields vary by cell)', m
      ? `M = ${f(m.massKg / M_EARTH_KG)} M⊕${mark('moon.mass')}, R = ${f(m.radiusM / R_EARTH_M)} R⊕, separation ${f(m.separationM / p.radiusM)} Rp${mark('moon.separation')}, e = ${m.eccentricity}, inclination ${f(m.inclinationRad * DEG)}°, ${m.retrograde ? 'retrograde' : 'prograde'}; orbital phase (and node, periapsis where they matter) drawn at random in each realization`
      : 'none']);
    rows.push(['instrument', instrumentText(s, mark)]);
    rows.push(['noise model', noiseModelText(s, mark)]);
    const o = s.observation;
    rows.push(['transits', `${o.transits} consecutive transits${mark('observation.transits')}, each observed from ${f(o.baselineS / HOUR_S)} h before first to ${f(o.baselineS / HOUR_S)} h after last contact${mark('observation.baseline')}; epoch 0 at BJD_TDB ${o.t0BjdTdb}${windowsOverlap(s) ? '; the baseline reaches past half the period, so consecutive windows are cut at the midpoints between conjunctions (each time stamp once)' : ''}`]);
    rows.push(['gaps', gapsText(s, mark)]);
    rows.push(['detection bound (cyan lines)', boundText(s)]);
  } else {
    rows.push(['scenario document', 'not available: star, planet, instrument and noise are not listed, and physical boundaries and example cells are omitted (run `moonsieve report DIR --scenario FILE` with the scenario file)']);
  }
  for (const [k, a] of meta.axes.entries()) {
    const d = axisDisplay(a);
    rows.push([`sweep axis ${k + 1}`, `${a.field}: ${a.values.length} values, ${a.spacing}, from ${a.from_text} to ${a.to_text} (${formatDisplay(d, Math.min(...a.values))} to ${formatDisplay(d, Math.max(...a.values))})`]);
  }
  rows.push(['detection', meta.forecast_only
    ? `analytic forecast only: noncentral χ² of white-noise TTV/TDV excesses (no simulations)${forecastIgnores}`
    : `${meta.realizations} realizations per cell; a channel (template search, TTV, TDV, moon dip) detects when its statistic exceeds the threshold calibrated on no-moon realizations; combined = the weighted minimum of the channels' p-values against the same no-moon realizations, with its own calibrated threshold (TTV needs 3 transits, TDV 2, moon dip 1)`]);
  const lost = cells.map((c) => num(c, 'no_transit_observed')).filter((x): x is number => x !== null);
  const lostTotal = lost.reduce((a, x) => a + x, 0);
  if (lostTotal > 0) rows.push(['realizations with no transit observed', `${lostTotal} (over ${lost.length} simulated cells): every transit lost to missed transits or gaps; counted as non-detections in every channel`]);
  const nulls = cells.map((c) => num(c, 'no_moon_realizations')).filter((x): x is number => x !== null);
  let fa = `requested ${meta.false_alarm} for each channel and for the combined rule`;
  const m = summary.false_alarm_measured_combined;
  if (m) fa += `; measured on the no-moon realizations (combined channel, over the simulated cells): median ${f(m.median)}, range ${f(m.min)}–${f(m.max)}${nulls.length ? `, from ${Math.min(...nulls)} no-moon realizations` : ''}`;
  else fa += '; not measured (no simulated cells)';
  const inForce = cells.map((c) => num(c, 'false_alarm_in_force')).filter((x): x is number => x !== null);
  if (inForce.length) {
    const lo = Math.min(...cells.map((c) => num(c, 'false_alarm_in_force_lo')).filter((x): x is number => x !== null));
    const hi = Math.max(...cells.map((c) => num(c, 'false_alarm_in_force_hi')).filter((x): x is number => x !== null));
    const methods = [...new Set(cells.map((c) => c.calibration_method).filter((x): x is NonNullable<typeof x> => typeof x === 'string'))];
    const how = methods.length === 1 && methods[0] === 'tail'
      ? 'thresholds from a generalised Pareto fit of the no-moon statistics\' upper tails (Knijnenburg et al. 2009), the rate in force a bootstrap of that fit (it leaves out the tail model\'s own error)'
      : methods.length === 1 && methods[0] === 'order_statistic'
        ? 'thresholds at order statistics of the no-moon statistics, the rate in force their Beta distribution (David & Nagaraja 2003)'
        : 'thresholds from tail fits or order statistics (cells differ: calibration_method)';
    fa += `; rate in force of the combined rule: ${f(Math.min(...inForce))}–${f(Math.max(...inForce))} over the cells, 95 % intervals within ${f(lo)}–${f(hi)} (${how})`;
  }
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
