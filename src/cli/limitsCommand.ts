/** `moonsieve limits SCENARIO [--json]`: analytic answers for one planet and moon. */
import type { Command } from 'commander';
import { loadScenario } from '../scenario/loadScenario.js';
import { formatCautions } from '../scenario/parseScenario.js';
import { computeLimits, limitsToJson, type LimitsJson } from '../limits/computeLimits.js';
import { assertObservable } from '../photometry/transitWindows.js';
import { AU_M, DAY_S, HOUR_S, M_EARTH_KG } from '../physics/constants.js';
import type { Scenario } from '../scenario/types.js';
import type { CliIo } from './cliIo.js';

export function registerLimits(program: Command, io: CliIo): void {
  program
    .command('limits')
    .description('analytic limits: Hill radius, stable band, Roche limit, tidal survival, energy budget, TTV/TDV amplitudes, timing precision, forecast detection probability')
    .argument('<scenario>', 'scenario YAML file')
    .option('--json', 'print JSON with SI keys instead of the table')
    .action((scenarioPath: string, opts: { json?: boolean }) => {
      const scenario = loadScenario(scenarioPath);
      assertObservable(scenario, scenarioPath);
      io.err(formatCautions(scenario)); // odd but legal inputs, as note: lines
      const limits = computeLimits(scenario);
      io.out(opts.json ? JSON.stringify(limitsToJson(limits), null, 2) + '\n' : formatLimits(scenario, limits));
    });
}

const km = (m: number) => `${(m / 1e3).toLocaleString('en-US', { maximumFractionDigits: 0 })} km`;
const fmt = (x: number, digits = 3) => (Math.abs(x) >= 1e5 || (Math.abs(x) < 1e-3 && x !== 0) ? x.toExponential(digits - 1) : x.toPrecision(digits));
const dur = (s: number) => (s >= 2 * HOUR_S ? `${(s / HOUR_S).toFixed(2)} h` : s >= 120 ? `${(s / 60).toFixed(2)} min` : `${s.toFixed(1)} s`);

/** One-line drawing of the separations: Roche limit, prograde and retrograde stable limits, the moon. */
export function stableBandBar(l: LimitsJson, planetRadiusM: number, width = 60): string {
  const maxSep = Math.max(l.stable_max_separation_retrograde_m, l.moon_separation_m ?? 0) * 1.05;
  const col = (m: number) => Math.min(width - 1, Math.max(0, Math.round((m / maxSep) * (width - 1))));
  const chars: string[] = [];
  for (let i = 0; i < width; i++) {
    const m = (i / (width - 1)) * maxSep;
    chars.push(m < planetRadiusM ? 'O' : m < l.roche_limit_m ? '.' : m <= l.stable_max_separation_m ? '=' : m <= l.stable_max_separation_retrograde_m ? '-' : ' ');
  }
  if (l.moon_separation_m !== null) chars[col(l.moon_separation_m)] = 'M';
  return `[${chars.join('')}]`;
}

const pct = (p: number | null, none: string) => (p === null ? none : `${(100 * p).toFixed(1)} %`);

/** The forecast row: every channel that the transit count allows, and which ones it does not. */
function forecastText(l: LimitsJson): string {
  if (l.pdet_forecast_joint === null && l.transits >= 2) return 'no forecast (see below)';
  if (l.pdet_forecast_joint === null) return `no timing channel with ${l.transits} transit${l.transits === 1 ? '' : 's'}; moon dip only (not forecast; see below)`;
  if (l.pdet_forecast_ttv === null) {
    return `no TTV channel with ${l.transits} transits; TDV ${pct(l.pdet_forecast_tdv, '–')} (1 degree of freedom) at false-alarm ${l.false_alarm}; moon dip not forecast`;
  }
  return `joint ${pct(l.pdet_forecast_joint, '–')} (TTV ${pct(l.pdet_forecast_ttv, '–')}, TDV ${pct(l.pdet_forecast_tdv, '–')}) at false-alarm ${l.false_alarm}`;
}

export function formatLimits(s: Scenario, l: LimitsJson): string {
  const rp = s.planet.radiusM;
  const lines: string[] = [];
  const row = (label: string, value: string) => lines.push(`  ${label.padEnd(40)} ${value}`);
  lines.push(`${s.name}: analytic limits`, '');
  lines.push('Where a moon can orbit');
  row('Hill radius a(M/3M*)^1/3', `${(l.hill_radius_m / AU_M).toFixed(5)} au = ${km(l.hill_radius_m)} = ${(l.hill_radius_m / rp).toFixed(1)} Rp`);
  row('Hill radius at pericentre', `${km(l.hill_radius_pericentre_m)}`);
  row('stable limit, prograde', `${km(l.stable_max_separation_m)} = ${(l.stable_max_separation_m / rp).toFixed(1)} Rp (Domingos, Winter & Yokoyama 2006)`);
  row('stable limit, retrograde', `${km(l.stable_max_separation_retrograde_m)} = ${(l.stable_max_separation_retrograde_m / rp).toFixed(1)} Rp (Domingos, Winter & Yokoyama 2006)`);
  row(`Roche limit, fluid (moon ${fmt(l.roche_moon_density_kg_m3)} kg/m³)`, `${km(l.roche_limit_m)} = ${(l.roche_limit_m / rp).toFixed(2)} Rp`);
  row('Roche limit, rigid', `${km(l.roche_limit_rigid_m)} = ${(l.roche_limit_rigid_m / rp).toFixed(2)} Rp`);
  row('largest moon surviving tidal migration', `${fmt(l.tidal_max_moon_mass_kg / M_EARTH_KG)} Mearth (planet k2 ${s.planet.k2}, Q ${fmt(s.planet.tidalQ)}, age ${fmt(s.star.ageS / (DAY_S * 365.25e9))} Gyr)`);
  lines.push(`  ${stableBandBar(l, rp)}`);
  lines.push('   O planet  . inside Roche  = stable (pro- and retrograde)  - retrograde only  M the moon');
  if (l.habitable_zone_inner_m !== null && l.habitable_zone_outer_m !== null) {
    row('stellar habitable zone (Kopparapu 2013)', `${(l.habitable_zone_inner_m / AU_M).toFixed(3)}–${(l.habitable_zone_outer_m / AU_M).toFixed(3)} au; planet at ${(s.planet.semiMajorAxisM / AU_M).toFixed(3)} au`);
  }
  lines.push('', 'Transit and timing precision (one transit)');
  row('duration T14 / mid-ingress to mid-egress', `${dur(l.transit_duration_s)} / ${dur(l.transit_duration_mid_s)}`);
  row('ingress', dur(l.ingress_duration_s));
  row('depth at mid-transit', `${(l.transit_depth * 1e6).toFixed(0)} ppm`);
  row('white noise per exposure', `${(l.noise_per_exposure * 1e6).toFixed(1)} ppm`);
  row('mid-time precision (model Fisher bound)', `${dur(l.timing_precision_s)} (Carter 2008 trapezoid: ${l.timing_precision_carter_s === null ? 'n/a, see below' : dur(l.timing_precision_carter_s)})`);
  row('duration precision (model Fisher bound)', `${dur(l.duration_precision_s)} (Carter 2008 trapezoid: ${l.duration_precision_carter_s === null ? 'n/a, see below' : dur(l.duration_precision_carter_s)})`);
  if (s.moon && l.moon_placement) {
    const m = s.moon;
    lines.push('', `The moon: ${fmt(m.massKg / M_EARTH_KG)} Mearth at ${(m.separationM / rp).toFixed(1)} Rp (${(m.separationM / l.hill_radius_m).toFixed(3)} Hill radii), ${m.retrograde ? 'retrograde' : 'prograde'}`);
    row('placement', l.moon_placement.join('; '));
    row('moon orbital period', dur(l.moon_period_s!));
    row('TTV semi-amplitude / rms', `${dur(l.ttv_semi_amplitude_s!)} / ${dur(l.ttv_rms_s!)}`);
    row('TDV semi-amplitude / rms', `${dur(l.tdv_semi_amplitude_s!)} / ${dur(l.tdv_rms_s!)}`);
    row('TDV phase offset from TTV', `${((l.ttv_tdv_phase_offset_rad! * 180) / Math.PI).toFixed(0)} deg`);
    row('TTV alias (sampled once per transit)', `${l.ttv_alias_frequency_per_epoch!.toFixed(4)} cycles/epoch, period ${l.ttv_alias_period_epochs!.toFixed(2)} epochs`);
    row('moon periods with the same alias', l.ttv_alias_family_periods_s!.map((p) => `${(p / DAY_S).toFixed(3)} d`).join(', '));
    row('moon dip depth', `${(l.moon_depth! * 1e6).toFixed(2)} ppm`);
    row('photocentric / barycentric TTV weight', `${l.photocentric_ratio!.toPrecision(2)}${l.forecast_regime_ok ? '' : '  (forecast outside its regime: see below)'}`);
    row(`forecast detection, ${l.transits} transit${l.transits === 1 ? '' : 's'}`, forecastText(l));
    const e = l.energy_budget!;
    lines.push('', 'Energy budget at the moon (orbit- and globally averaged, absorbed)');
    row('starlight (less eclipses)', `${e.stellar_w_m2.toFixed(2)} W/m²`);
    row('reflected by the planet', `${e.reflected_w_m2.toFixed(3)} W/m²`);
    row('planet thermal emission', `${e.thermal_w_m2.toFixed(3)} W/m²`);
    row('tidal heating', `${fmt(e.tidal_w_m2)} W/m²`);
    row('total / runaway-greenhouse limit', `${e.total_w_m2.toFixed(2)} / ${e.runaway_limit_w_m2.toFixed(1)} W/m²`);
    row('verdict', `${e.verdict} (dominant term: ${e.dominant})`);
    lines.push(`  Caution: ${e.caution}.`);
  } else {
    lines.push('', '(no moon in the scenario: add a `moon:` block for timing signals, forecasts and the energy budget)');
  }
  lines.push('', 'What this leaves out:');
  for (const a of l.assumptions) lines.push(`  - ${a}`);
  return lines.join('\n') + '\n';
}
