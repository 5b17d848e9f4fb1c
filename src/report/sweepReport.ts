/**
 * `renderSweepPage`: the self-contained HTML report of a sweep (plotly
 * inlined, opens offline): plain-language summary, detectability map with a
 * channel selector, contours at 50 % and 90 %, physical boundaries and the
 * habitable region, minimum detectable mass, Monte Carlo against the
 * analytic forecast, example cells, assumptions and cautions. Every piece of
 * user text is escaped (escape.ts); data reach the page's scripts only as
 * JSON made safe for <script> (jsonForScript).
 */
import type { CellResult } from '../sweep/cellTypes.js';
import type { SweepMeta, SweepRunInfo } from '../sweep/sweepMeta.js';
import { scenarioHash } from '../sweep/canonicalJson.js';
import { escapeHtml, jsonForScript } from './escape.js';
import { renderPlotlyPage, type Figure } from './plotlyPage.js';
import { buildSummary, type SweepSummary } from './summary.js';
import { renderSummaryHtml } from './summaryText.js';
import { gridFigures, mapTitles, MAP_Z_TRACES, type PhysicalBoundaries } from './mapFigures.js';
import { exampleFigures, type ExampleCell } from './exampleFigures.js';
import { assumptionRows } from './assumptionsTable.js';
import { axisDisplay, formatDisplay, formatNumber } from './axisDisplay.js';
import { MAP_CHANNELS, axisRoles, channelLabel, combinedMeaning } from './reportGrid.js';
import { parseQuantity } from '../scenario/units.js';
import { R_EARTH_M, R_JUP_M } from '../physics/constants.js';
import type { NightsPlan } from '../budget/nightsBudget.js';
import { calendarSectionHtml, seasonFigure } from './seasonChart.js';

export interface SweepPageInput {
  meta: SweepMeta;
  cells: readonly CellResult[];
  /** run.json of the run (null when unknown). */
  runInfo: SweepRunInfo | null;
  /**
   * The scenario document as plain values (the parsed YAML, with its sweep
   * block), as hashed into meta.scenario_hash; null when unavailable (then the
   * physical boundaries, example cells and most assumptions are omitted).
   */
  scenario: unknown;
  /** Example cells (app/exampleCells.ts computes them; [] for none). */
  examples: ExampleCell[];
  /** Physical boundaries of the base scenario (app/physicalBoundaries.ts), null when unknown. */
  boundaries: PhysicalBoundaries | null;
  /** The summary; built with buildSummary(meta, cells) when omitted. */
  summary?: SweepSummary;
  /** The campaign's calendar (every usable epoch) when the scenario gives site, target and campaign; null or absent otherwise. */
  calendar?: NightsPlan | null;
}

/**
 * The planet-mass caution: a planet-mass axis with the radius held at the
 * scenario's value (no radius axis, and a radius written as a length rather
 * than left to a mass–radius relation).
 */
export function planetMassCaution(meta: SweepMeta, scenarioDoc: unknown): string | null {
  const fields = new Set(meta.axes.map((a) => a.field));
  if (!fields.has('planet.mass') || fields.has('planet.radius')) return null;
  const planet = scenarioDoc !== null && typeof scenarioDoc === 'object' ? (scenarioDoc as Record<string, unknown>).planet : undefined;
  const radius = planet !== null && typeof planet === 'object' ? (planet as Record<string, unknown>).radius : undefined;
  let fixed = scenarioDoc === null || scenarioDoc === undefined;
  let radiusText = '';
  if (radius !== undefined && radius !== null) {
    try {
      const r = parseQuantity(radius, 'planet.radius', 'length');
      fixed = true;
      radiusText = ` at ${formatNumber(r / R_JUP_M)} R_J (${formatNumber(r / R_EARTH_M)} R⊕)`;
    } catch {
      fixed = false; // not a plain length: a relation or other rule sets it
    }
  }
  if (!fixed) return null;
  return `The planet-mass axis keeps the planet's radius fixed${radiusText}: along the axis the planet's bulk density, and with it the moon's Roche limit, changes as it would not for real planets of those masses, and the transit depth and duration stay the same. Give a mass–radius relation to let the radius follow.`;
}

const CAUTIONS = [
  'These are forecasts from a model, not a guarantee: real light curves carry correlated noise, systematics and gaps that make detection harder than shown.',
  'Astrophysical false positives are not modelled: stellar activity (spots, flares, granulation) and other planets in the system can also produce transit timing and duration variations.',
  'The planet and moon follow nested two-body (Kepler) orbits; the habitability verdict is a first screen from a globally averaged energy budget, not a climate model.',
  'A detection here means a statistical excess in a channel at the stated false-alarm probability; claiming a moon needs the full vetting (e.g. moonsieve vet) and independent data.',
];

function exampleSection(ex: ExampleCell, k: number, meta: SweepMeta): string {
  const coords = meta.axes.map((a, i) => `${escapeHtml(axisDisplay(a).title.replace(/ \(.*\)$/, ''))} ${escapeHtml(formatDisplay(axisDisplay(a), ex.coords[i]))}`).join(', ');
  const fam = ex.aliasFamilyPeriodsS.length
    ? ` Moon periods with the same folded TTV frequency: ${ex.aliasFamilyPeriodsS.map((p) => `${formatNumber(p / 86400)} d`).join(', ')}; the periodogram alone cannot tell them apart.`
    : '';
  const pg = ex.periodogram ? `<div id="ex${k}-ls" class="plot plot-small"></div>` : '<p>Fewer than four transits were fitted: no periodogram.</p>';
  return `<section class="example" data-cell="${ex.index}">
<h3>Cell ${ex.index} (${escapeHtml(ex.label)}, detection probability ${escapeHtml(formatNumber(100 * ex.probability))} %): ${coords}</h3>
<p>Realization 0 of this cell, drawn from the same seeded generator as in the sweep.${ex.aliasFrequencyPerEpoch !== null ? ` The moon's TTV frequency folds to ${escapeHtml(formatNumber(ex.aliasFrequencyPerEpoch))} cycles per epoch (green line).` : ''}${escapeHtml(fam)}</p>
<div id="ex${k}-lc" class="plot plot-small"></div>
<div id="ex${k}-timing" class="plot plot-small"></div>
${pg}
</section>`;
}

/** Throws a RangeError unless the scenario document (when given) is the one the sweep ran. */
export function checkScenarioHash(meta: SweepMeta, scenario: unknown): void {
  if (scenario === null || scenario === undefined) return;
  const h = scenarioHash(scenario);
  if (h !== meta.scenario_hash) throw new RangeError(`scenario must be the document the sweep ran (hash ${meta.scenario_hash.slice(0, 12)}…), got one with hash ${h.slice(0, 12)}…`);
}

/** The page from computed parts; renderSweepReport (app/sweepReport.ts) computes the parts and calls this. */
export function renderSweepPage(input: SweepPageInput): string {
  const { meta, runInfo } = input;
  const cells = [...input.cells].sort((a, b) => a.index - b.index);
  checkScenarioHash(meta, input.scenario);
  const scenarioDoc = input.scenario ?? null;
  const summary = input.summary ?? buildSummary(meta, cells);
  const boundaries = input.boundaries;
  const grid = gridFigures(meta, cells, boundaries, summary);
  const examples = input.examples;
  const calendar = input.calendar ?? null;
  const figures: Figure[] = [...grid.figures, ...examples.flatMap((ex, k) => exampleFigures(ex, k)), ...(calendar ? [seasonFigure(calendar)] : [])];
  const ids = new Set(grid.figures.map((f) => f.id));

  const buttons = MAP_CHANNELS.map((ch) => {
    const ok = grid.channelZ[ch] !== null;
    return `<button type="button" data-channel="${ch}" aria-pressed="${ch === 'combined'}"${ok ? '' : ' disabled title="not available in a forecast-only run"'}>${escapeHtml(channelLabel(ch, meta.forecast_only))}</button>`;
  }).join('');
  const selectorScript = `<script>
window.moonsieveMap = ${jsonForScript({ z: grid.channelZ, titles: mapTitles(meta), traces: grid.twoAxis ? grid.mapTraces : MAP_Z_TRACES, traceFacet: grid.mapTraceFacet, faceted: grid.faceted, twoAxis: grid.twoAxis, channels: MAP_CHANNELS })};
function moonsieveSelectChannel(ch) {
  var m = window.moonsieveMap, z = m.z[ch];
  if (!z) return;
  var el = document.getElementById('map');
  if (m.twoAxis) {
    Plotly.restyle(el, { z: m.traces.map(function (t, k) { return m.faceted ? z[m.traceFacet[k]] : z; }) }, m.traces);
    Plotly.relayout(el, { 'title.text': m.titles[ch] });
  } else {
    var vis = m.channels.map(function (c) { return c === ch ? true : 'legendonly'; });
    Plotly.restyle(el, { visible: vis.filter(function (v, i) { return m.z[m.channels[i]] !== null; }) }, m.channels.map(function (c, i) { return i; }).filter(function (i) { return m.z[m.channels[i]] !== null; }));
  }
  document.querySelectorAll('#channel-select button').forEach(function (b) { b.setAttribute('aria-pressed', String(b.getAttribute('data-channel') === ch)); });
}
document.addEventListener('click', function (e) {
  var b = e.target && e.target.closest ? e.target.closest('#channel-select button') : null;
  if (b && !b.disabled) moonsieveSelectChannel(b.getAttribute('data-channel'));
});
</script>`;

  // The limit lines drawn (mapFigures.boundaryTraces): separations across (x), the tidal-survival mass up (y).
  const roles = meta.axes.length >= 2 ? axisRoles(meta) : null;
  const sepLines = boundaries !== null && roles !== null && meta.axes[roles.xAxis].field === 'moon.separation';
  const massLine = boundaries !== null && roles !== null && roles.yAxis !== null && meta.axes[roles.yAxis].field === 'moon.mass';
  const linesText = [
    sepLines ? 'orange lines: Roche limit (dashed), stable limit for prograde (solid) and retrograde (dotted) moons' : '',
    massLine ? 'pink dash-dot: the largest moon that survives tidal migration' : '',
  ].filter((t) => t !== '').join('; ');
  const facetAxis = grid.faceted ? meta.axes[axisRoles(meta).facetAxis as number] : null;
  const facetNote = facetAxis ? `One map per value of ${axisDisplay(facetAxis).title}, all on the same colour scale; each panel is labelled with its value. ` : '';
  const mapNote = grid.twoAxis
    ? `${facetNote}White contours at 50 % (dashed) and 90 % (solid); cyan contours: the same levels of the known-template bound, which no analysis of these data can beat (white noise, the moon's orbit known up to its drawn angles). Green outline: cells whose energy budget is temperate (the habitable region). ${linesText ? `${linesText[0].toUpperCase()}${linesText.slice(1)} (of the base scenario). ` : ''}Crosses: cells whose moon is not physically allowed (by each cell's own limits); they are not simulated${meta.forecast_only ? ' (nor forecast)' : ''} and left blank. Colour scale Cividis: readable in greyscale and by colour-blind readers.`
    : 'Lines: detection probability per channel with 95 % Wilson intervals; cyan: the known-template bound, which no analysis of these data can beat; grey lines at 50 % and 90 %; green bands: temperate energy budget; crosses: cells whose moon is not physically allowed.';
  const cautions = [...CAUTIONS];
  const massCaution = planetMassCaution(meta, scenarioDoc);
  if (massCaution) cautions.push(massCaution);
  const mcSection = meta.forecast_only
    ? '<p>Not available: this is a forecast-only run (no Monte Carlo).</p>'
    : `<p>Red: the simulations detect more often than the analytic forecast predicts; blue: less often. Circles mark cells where the forecast falls outside the Monte Carlo 95 % interval.</p><div id="mcdiff" class="plot"${grid.faceted ? ` style="height: ${grid.mapHeightPx}px"` : ''}></div>`;
  const body = `
<header>
<h1>Exomoon detectability: ${escapeHtml(meta.scenario)}</h1>
<p class="meta">moonsieve ${escapeHtml(meta.moonsieve_version)} · seed ${meta.seed} · scenario hash <code>${escapeHtml(meta.scenario_hash.slice(0, 16))}…</code>${runInfo ? ` · ${escapeHtml(runInfo.finished)}` : ''}</p>
</header>
${renderSummaryHtml(summary, meta)}
<section id="cautions" class="caution">
<h2>Cautions</h2>
<ul>${cautions.map((c) => `<li>${escapeHtml(c)}</li>`).join('')}</ul>
</section>
<section id="map-section">
<h2>Detectability map</h2>
<div id="channel-select" role="group" aria-label="detection channel">Channel: ${buttons}</div>
<div id="map" class="plot plot-tall"${grid.faceted ? ` style="height: ${grid.mapHeightPx}px"` : ''}></div>
<p class="note">${escapeHtml(mapNote)}</p>
<p class="note" id="combined-note">${escapeHtml(combinedMeaning(meta.forecast_only, meta.false_alarm))}</p>
</section>
${ids.has('mindet') && summary.min_detectable ? `<section id="mindet-section"><h2>${summary.min_detectable.direction === 'increasing' ? 'Minimum' : 'Largest'} detectable ${escapeHtml(axisDisplay(meta.axes.find((a) => a.field === summary.min_detectable?.y_field) ?? meta.axes[0]).title.replace(/ \(.*\)$/, ''))}</h2>
<p class="note">For each column of the map, the ${summary.min_detectable.direction === 'increasing' ? 'smallest' : 'largest'} value reaching the level, interpolated between grid cells${facetAxis ? `, one pair of lines per value of ${escapeHtml(axisDisplay(facetAxis).title)}` : ''}; triangles: already reached at the ${summary.min_detectable.direction === 'increasing' ? 'lowest' : 'highest'} grid value (the true limit lies beyond the grid); gaps: not reached on the grid.</p>
<div id="mindet" class="plot"></div></section>` : ''}
<section id="mc-section">
<h2>Monte Carlo against the analytic forecast</h2>
${mcSection}
</section>
${calendar ? calendarSectionHtml(calendar.statement, calendar, 'Observing calendar: the campaign\'s observable transits') : ''}
<section id="examples">
<h2>Example cells</h2>
${examples.length ? examples.map((ex, k) => exampleSection(ex, k, meta)).join('\n') : `<p>${scenarioDoc === null ? 'Not available without the scenario document.' : 'No cell qualifies (no physically allowed, simulated cell).'}</p>`}
</section>
<section id="assumptions">
<h2>Assumptions</h2>
<table>${assumptionRows(meta, summary, scenarioDoc, runInfo, cells).map(([k, v]) => `<tr><th>${escapeHtml(k)}</th><td>${escapeHtml(v)}</td></tr>`).join('\n')}</table>
<p class="note">Tables beside this page: <code>cells.ecsv</code> and <code>cells.json</code> (every cell), <code>summary.json</code> (the numbers quoted above), <code>run.json</code>. To save a figure for a paper, use the camera icon in the plot's toolbar (PNG, works offline).</p>
</section>
${selectorScript}
<style>
.plot-tall { height: 640px; } .plot-small { height: 360px; }
#channel-select button { margin: 0 0.2rem; padding: 0.25rem 0.7rem; border: 1px solid #888; background: #fff; border-radius: 4px; cursor: pointer; }
#channel-select button[aria-pressed="true"] { background: #00204c; color: #fff; }
#channel-select button:disabled { opacity: 0.45; cursor: not-allowed; }
.note { font-size: 0.9rem; color: #444; } .meta { color: #555; }
.headline { font-size: 1.05rem; } .num { font-weight: 600; }
th { vertical-align: top; white-space: nowrap; }
</style>`;
  return renderPlotlyPage({ title: `moonsieve: ${meta.scenario}`, bodyHtml: body, figures });
}
