/**
 * Renders docs/scenario-reference.md from the validator's field table
 * (src/scenario/fields.ts) and the sweepable fields (src/sweep/axisFields.ts).
 * A tool above the scenario layer: the scenario layer never imports the sweep.
 * `npm run docs:scenario` writes the file; a test checks the committed file
 * equals this text, so the reference cannot drift from the validator.
 */
import { SCENARIO_FIELDS, type ScenarioField } from '../scenario/fields.js';
import { boundsText } from '../scenario/fieldReader.js';
import { COMMON_UNITS, formatNumber, type QuantityKind } from '../scenario/units.js';
import { AXIS_FIELDS } from '../sweep/axisFields.js';

const SECTIONS: Array<{ key: string; title: string; intro: string }> = [
  { key: '', title: 'Top level', intro: 'Besides the blocks below, a scenario may hold `sweep:` and `budget:` blocks, read by `moonsieve sweep` and `moonsieve budget` (see the README).' },
  { key: 'star', title: '`star`', intro: 'The host star. Limb darkening is quadratic, given as `{u1, u2}` or as Kipping (2013) `{q1, q2}`.' },
  { key: 'planet', title: '`planet`', intro: 'The transiting planet; its period and ephemeris are those of the planet–moon barycentre. Give `impact_parameter` or `inclination`, not both; `radius`, or `mass_radius` to take the radius from the mass.' },
  { key: 'moon', title: '`moon` (optional)', intro: 'Without a `moon` block the scenario is the no-moon case. Give `radius` or `density`, not both.' },
  { key: 'instrument', title: '`instrument`', intro: 'Sampling and noise. Give the white noise as `noise` or as a ground-based budget `ground`, not both; `red_noise` adds correlated noise to either.' },
  { key: 'observation', title: '`observation`', intro: 'What is observed. Give `transits` or `duration`, not both.' },
  { key: 'detection', title: '`detection`', intro: 'When a moon counts as detected.' },
  { key: 'site', title: '`site` (optional)', intro: 'Where the telescope is, for `moonsieve calendar`. A list of sites, each with a `name`, makes a network: a transit counts as seen where any site sees it.' },
  { key: 'target', title: '`target` (optional)', intro: 'The star\'s ICRS (J2000) position: degrees, or sexagesimal text (RA in hours, Dec in degrees). Proper motion is not modelled.' },
  { key: 'campaign', title: '`campaign` (optional)', intro: 'When the target is watched, in UTC. `moonsieve calendar` needs `site`, `target` and `campaign`.' },
  { key: 'visibility', title: '`visibility` (optional)', intro: 'A space instrument\'s periodic visibility of the target, instead of `site` and `constraints` (not with them): visible for `on`, hidden for `off`, from `start` on the BJD_TDB axis, optionally only inside observing blocks. With `campaign` (a `target` is optional), `moonsieve calendar`, sweep, simulate and budget observe only the visible parts of each transit, at the stated noise, without weather. Not modelled: Earth, Sun and Moon avoidance angles, the South Atlantic Anomaly, momentum dumps and downlinks (fold them into `on`/`off`).' },
  { key: 'constraints', title: '`constraints` (optional)', intro: 'When the target counts as observable: the Sun below `sun_altitude` and the target\'s air mass at most `airmass` (so above the horizon).' },
];

const KIND_WORDS: Record<QuantityKind, string> = {
  mass: 'mass', length: 'length', time: 'time', angle: 'angle', temperature: 'temperature', density: 'density', fraction: 'fraction', power: 'power',
};

function cell(text: string): string {
  return text.replace(/\|/g, '\\|').replace(/\n/g, ' ');
}

function typeText(f: ScenarioField): string {
  switch (f.type) {
    case 'quantity':
      return KIND_WORDS[f.kind as QuantityKind];
    case 'level':
      return 'level per time ("200 ppm per 1 h")';
    case 'separation':
      return 'length, "N Rp" or "f hill"';
    case 'choice':
      return 'one of ' + (f.choices ?? []).map((c) => `\`${c}\``).join(', ');
    case 'mapping':
      return 'block';
    default:
      return f.type;
  }
}

function unitText(f: ScenarioField): string {
  if (f.type !== 'quantity' && f.type !== 'level' && f.type !== 'separation') return '—';
  const bare = f.bare ? `bare number: ${f.bare[1]}` : 'unit required';
  if (f.type === 'level') return f.bare ? `ppm, %, … per a time; bare number: ${f.bare[1]} per exposure` : 'ppm, %, … per a time';
  const shown = f.show ? `e.g. ${f.show[1]}; ` : '';
  return shown + bare;
}

function defaultText(f: ScenarioField): string {
  if (f.required) return f.required === 'yes' ? '**required**' : `required ${f.required}`;
  if (typeof f.default === 'number') {
    const u = f.show;
    return u ? `${formatNumber(f.default / u[0])} ${u[1] === 'a fraction' ? '' : u[1]}`.trim() : formatNumber(f.default);
  }
  if (typeof f.default === 'string') return `\`${f.default}\``;
  return f.defaultText ?? '—';
}

function allowedText(f: ScenarioField): string {
  const unit = f.show ? { name: f.show[1], si: f.show[0] } : null;
  const parts: string[] = [];
  const b = boundsText(f, unit).trim();
  if (b) parts.push(b);
  if (f.rangeNote) parts.push(f.rangeNote);
  if (f.type === 'choice' && parts.length === 0) parts.push('the words listed');
  return parts.join('; ') || 'any';
}

function sectionOf(path: string): string {
  const dot = path.indexOf('.');
  return dot < 0 ? (SECTIONS.some((s) => s.key === path) ? path : '') : path.slice(0, dot);
}

export function renderScenarioReference(): string {
  const out: string[] = [];
  out.push('# Scenario reference');
  out.push('');
  out.push('<!-- Generated by `npm run docs:scenario` from src/scenario/fields.ts (the validator\'s own table) and');
  out.push('     src/sweep/axisFields.ts. Do not edit by hand: a test fails when this file and the table differ. -->');
  out.push('');
  out.push('A scenario is a YAML file. A value with a unit is a string `"number unit"` (`"0.3 Mjup"`, `"148 d"`);');
  out.push('a bare number is read in the field\'s bare-number unit, and a field without one needs a unit.');
  out.push('Unknown keys are errors. Problems are reported all at once, each with its field, line and column,');
  out.push('the value and what is allowed (a range in the unit you wrote). Odd but legal inputs (a moon');
  out.push('heavier than its planet, a baseline longer than half the period) run, with a `note:` line.');
  out.push('"Sweepable" fields can be a `sweep.axes` field.');
  out.push('');
  out.push('Units known without lookup (others go through mathjs, e.g. `km/s`, `mas`):');
  out.push('');
  const byKind = new Map<string, string[]>();
  for (const [name, u] of Object.entries(COMMON_UNITS)) byKind.set(u.kind, [...(byKind.get(u.kind) ?? []), `\`${name === 'percent' ? '%' : name}\``]);
  for (const [kind, names] of byKind) out.push(`- ${kind}: ${names.join(', ')}`);
  out.push('');
  out.push('Astropy-style spellings are accepted too (`M_jup`, `R_earth`, `au`, `M_sun`, …).');
  for (const s of SECTIONS) {
    out.push('');
    out.push(`## ${s.title}`);
    out.push('');
    out.push(s.intro);
    out.push('');
    out.push('| field | type | unit | default | allowed | sweepable | meaning |');
    out.push('| --- | --- | --- | --- | --- | --- | --- |');
    for (const f of SCENARIO_FIELDS) {
      if (sectionOf(f.path) !== s.key) continue;
      out.push(
        `| \`${f.path}\` | ${cell(typeText(f))} | ${cell(unitText(f))} | ${cell(defaultText(f))} | ${cell(allowedText(f))} | ${AXIS_FIELDS.has(f.path) ? 'yes' : '—'} | ${cell(f.meaning)} |`,
      );
    }
  }
  out.push('');
  return out.join('\n');
}
