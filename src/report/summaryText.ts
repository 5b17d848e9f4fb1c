/**
 * The plain-language summary at the top of the report, written only from a
 * `SweepSummary` (summary.json), so the page quotes exactly those numbers.
 * Every quoted number is wrapped as
 *   <span class="num" data-summary-key="path.in.summary" data-value="<JSON>" data-format="count|percent|sig3">text</span>
 * which the tests read back and compare with summary.json.
 */
import { escapeHtml } from './escape.js';
import { M_EARTH_KG } from '../physics/constants.js';
import { axisDisplay, formatNumber } from './axisDisplay.js';
import { combinedMeaning } from './reportGrid.js';
import type { SweepSummary, SummaryCell } from './summary.js';
import type { SweepMeta } from '../sweep/sweepMeta.js';

type Format = 'count' | 'percent' | 'sig3';

/** Display text of a summary number in a format (shared with the tests' read-back). */
export function formatSummaryValue(v: number, format: Format): string {
  if (format === 'count') return String(v);
  if (format === 'percent') return `${formatNumber(100 * v)} %`;
  return formatNumber(v);
}

/** A quoted number: `v` as in summary.json, shown as v / divisor with a display unit. */
function span(key: string, v: number, format: Format, unit = '', divisor = 1): string {
  const text = formatSummaryValue(v / divisor, format) + (unit ? ` ${unit}` : '');
  return `<span class="num" data-summary-key="${escapeHtml(key)}" data-value="${escapeHtml(JSON.stringify(v))}" data-divisor="${divisor}" data-format="${format}">${escapeHtml(text)}</span>`;
}

/** An axis value (SI) in the axis's display unit (the sweep's axis when it has the field, for its unit choices). */
function axisSpan(key: string, v: number, field: string, unit: string, meta?: SweepMeta): string {
  const axis = meta?.axes.find((a) => a.field === field);
  const d = axisDisplay(axis ? { ...axis, spacing: 'linear' } : { field, unit, spacing: 'linear' });
  return span(key, v, 'sig3', d.unitLabel, d.divisor);
}

function describeCell(key: string, c: SummaryCell, meta: SweepMeta): string {
  const parts: string[] = [];
  if (c.moon_mass_kg !== null) parts.push(span(`${key}.moon_mass_kg`, c.moon_mass_kg, 'sig3', 'M⊕', M_EARTH_KG));
  if (c.moon_separation_m !== null) parts.push(`at ${span(`${key}.moon_separation_m`, c.moon_separation_m, 'sig3', '×10³ km', 1e6)}`);
  if (c.moon_separation_hill !== null) parts.push(`(${span(`${key}.moon_separation_hill`, c.moon_separation_hill, 'sig3')} Hill radii)`);
  const other = meta.axes
    .map((a, k) => ({ a, k }))
    .filter(({ a }) => a.field !== 'moon.mass' && a.field !== 'moon.separation')
    .map(({ a, k }) => {
      const d = axisDisplay(a);
      return `${escapeHtml(d.title.replace(/ \(.*\)$/, ''))} ${axisSpan(`${key}.coords.${k}`, c.coords[k], a.field, a.unit, meta)}`;
    });
  if (other.length) parts.push(`with ${other.join(', ')}`);
  parts.push(`(cell ${span(`${key}.index`, c.index, 'count')}, probability ${span(`${key}.probability`, c.probability, 'percent')})`);
  return parts.join(' ');
}

/**
 * The detector against the known-template bound: the line no analysis can
 * beat, and per x value how many times the bound's 50 % minimum the
 * detector's is (summary.efficiency_50).
 */
function boundParagraph(s: SweepSummary, meta: SweepMeta): string | null {
  const md = s.min_detectable;
  if (!md || md.efficiency_50.length === 0) return null;
  const xa = meta.axes.find((a) => a.field === md.x_field);
  const fa = md.facet_field ? meta.axes.find((a) => a.field === md.facet_field) : undefined;
  const yName = axisDisplay(meta.axes.find((a) => a.field === md.y_field) ?? { field: md.y_field, unit: '', spacing: 'linear' }).title.replace(/ \(.*\)$/, '');
  const kindText = { value: '', 'at most': 'at most ', 'at least': 'at least ', unknown: '' } as const;
  const items = md.efficiency_50.map((e, k) => {
    const at = axisSpan(`min_detectable.efficiency_50.${k}.x`, e.x, md.x_field, xa?.unit ?? '', meta);
    const facet = e.facet !== undefined && fa ? ` (${escapeHtml(axisDisplay(fa).title.replace(/ \(.*\)$/, ''))} ${axisSpan(`min_detectable.efficiency_50.${k}.facet`, e.facet, fa.field, fa.unit, meta)})` : '';
    const r = e.ratio === null ? 'not known on this grid' : `${kindText[e.ratio_kind]}${span(`min_detectable.efficiency_50.${k}.ratio`, e.ratio, 'sig3')}×`;
    return `${at}${facet}: ${r}`;
  });
  const what = md.direction === 'increasing'
    ? `how many times the bound's 50 % ${escapeHtml(yName)} this detector needs`
    : `how many times this detector's 50 % ${escapeHtml(yName)} the bound tolerates`;
  return `<p data-role="bound"><strong>Against the best possible analysis:</strong> the cyan lines are the known-template bound, the detection probability of a matched filter that knows the moon's light curve up to its phase (and node and periapsis where they are drawn), after the planet-only model's own freedoms are fitted out, under white noise. It is the line no analysis of the same data can beat; where red noise, gaps or missed transits are in the scenario, they are not in the bound (see the assumptions). Efficiency at 50 % (${what}; 1 is the bound itself): ${items.join('; ')}. An analysis that does not know the moon's phase cannot reach 1: the best phase-blind test (the likelihood ratio averaged over the phase) needs more, most where the moon's own dip carries the signal (small separations); on the project's invented reference system it needs 1.62× the bound's mass at 0.15 Hill radii, 1.41× at 0.30 and 1.31× at 0.45 (npm run bench -- bank-phases).</p>`;
}

export function renderSummaryHtml(s: SweepSummary, meta: SweepMeta): string {
  const out: string[] = [];
  const basis = s.basis === 'forecast'
    ? 'analytic forecast only (no simulations were run: <code>--forecast-only</code>); probabilities are the forecast of the Monte Carlo\'s combined rule over TTV and TDV (the moon dip is not forecast), averaged over the moon\'s angles as the Monte Carlo draws them; cells the Monte Carlo would not simulate (a moon not physically allowed) are left blank as on Monte Carlo maps'
    : `Monte Carlo injection–recovery, ${span('realizations', s.realizations as number, 'count')} realizations per cell, combined channel (template search, TTV, TDV and moon dip, weighted min-p), false-alarm probability ${span('false_alarm', s.false_alarm, 'sig3')}`;
  out.push(`<p><strong>Basis:</strong> ${basis}.</p>`);
  out.push(`<p class="note" data-role="combined-meaning">${escapeHtml(combinedMeaning(s.basis === 'forecast', s.false_alarm))}</p>`);
  const hz = `Of the ${span('cells', s.cells, 'count')} cells, ${span('cells_habitable', s.cells_habitable, 'count')} hold a habitable-zone moon (physically allowed and with a temperate energy budget).`;
  if (s.cells_habitable > 0) {
    let t = `${hz} Detected with at least 90 % probability: ${span('habitable_detected_90', s.habitable_detected_90, 'count')}`;
    if (s.habitable_detected_90_confident !== null) t += ` (${span('habitable_detected_90_confident', s.habitable_detected_90_confident, 'count')} with the 95 % lower bound above 90 %)`;
    t += `; with at least 50 %: ${span('habitable_detected_50', s.habitable_detected_50, 'count')}.`;
    out.push(`<p class="headline">${t}</p>`);
    if (s.smallest_habitable_detected_90) {
      out.push(`<p class="headline">The lightest habitable-zone moon detected at 90 %: ${describeCell('smallest_habitable_detected_90', s.smallest_habitable_detected_90, meta)}.</p>`);
    } else if (s.habitable_detected_90 === 0) {
      out.push('<p class="headline">No habitable-zone moon on this grid reaches 90 % detection probability.</p>');
    }
    if (!s.moon_mass_varies && s.habitable_detected_90_axis_ranges.length) {
      const r = s.habitable_detected_90_axis_ranges.map((a, k) => {
        const d = axisDisplay({ field: a.field, unit: a.unit, spacing: 'linear' });
        return `${escapeHtml(d.title.replace(/ \(.*\)$/, ''))} from ${axisSpan(`habitable_detected_90_axis_ranges.${k}.min`, a.min, a.field, a.unit, meta)} to ${axisSpan(`habitable_detected_90_axis_ranges.${k}.max`, a.max, a.field, a.unit, meta)}`;
      });
      out.push(`<p>The habitable-zone cells detected at 90 % span ${r.join('; ')}.</p>`);
    }
  } else {
    out.push(`<p class="headline">${hz} Over all ${span('cells_allowed', s.cells_allowed, 'count')} physically allowed cells, ${span('allowed_detected_90', s.allowed_detected_90, 'count')} are detected with at least 90 % probability.</p>`);
    if (s.smallest_allowed_detected_90) {
      out.push(`<p>The lightest physically allowed moon detected at 90 %: ${describeCell('smallest_allowed_detected_90', s.smallest_allowed_detected_90, meta)}.</p>`);
    }
  }
  const bound = boundParagraph(s, meta);
  if (bound) out.push(bound);
  const change: string[] = [];
  if (s.closest_habitable_miss) {
    change.push(`The nearest miss among habitable-zone moons: ${describeCell('closest_habitable_miss', s.closest_habitable_miss, meta)}.`);
  }
  change.push(
    'The TTV amplitude grows in proportion to moon mass × separation (Kipping 2009, MNRAS 392, 181), and the timing signal-to-noise ratio as √(transits observed) divided by the per-transit timing precision, which scales with the photometric noise per √time (Carter et al. 2008, ApJ 689, 499). Roughly, detecting a moon half as massive at the same separation needs four times as many transits or twice the timing precision; more transits also help the TDV and moon-dip channels.',
  );
  out.push(`<p><strong>What would change it:</strong> ${change.join(' ')}</p>`);
  return `<section id="summary">\n<h2>Summary</h2>\n${out.join('\n')}\n</section>`;
}
