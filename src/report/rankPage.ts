/**
 * The page of a ranked planet list (`rank.html`): a scatter of cost (transits
 * the target moon needs, forecast) against reach (the smallest detectable
 * moon mass), one point per planet, temperate target moons marked; and the
 * ranking as a table, with the Monte Carlo's answer and interval where it ran.
 * A pure function of rank.json.
 */
import { escapeHtml } from './escape.js';
import { renderPlotlyPage, type Figure } from './plotlyPage.js';
import type { RankJson, RankedPlanetJson } from '../rank/rankJson.js';
import { HOUR_S, M_EARTH_KG } from '../physics/constants.js';
import { detailCommand } from '../rank/detailSweep.js';

/** Rows of the ranking shown in the page's table (all are in rank.json and rank.ecsv). */
export const RANK_PAGE_ROWS = 200;

export function rankScatter(r: RankJson): Figure {
  const shown = r.planets.filter((p) => p.best_min_moon_mass_kg !== null && p.target_transits_needed !== null);
  const trace = (name: string, ps: RankedPlanetJson[], color: string, symbol: string) => ({
    type: 'scatter', mode: 'markers', name,
    x: ps.map((p) => p.best_min_moon_mass_kg! / M_EARTH_KG),
    y: ps.map((p) => p.target_transits_needed!),
    text: ps.map((p) => `#${p.rank} ${p.name}`),
    hovertemplate: '%{text}<br>smallest moon %{x:.3g} Mearth<br>%{y} transits<extra></extra>',
    marker: { color, symbol, size: 8, line: { color: '#333', width: 0.5 } },
  });
  const temperate = shown.filter((p) => p.target_habitability === 'temperate');
  const other = shown.filter((p) => p.target_habitability !== 'temperate');
  return {
    id: 'rank-scatter',
    data: [
      trace('target moon not temperate', other, '#1f77b4', 'circle'),
      trace('target moon temperate (energy budget)', temperate, '#2ca02c', 'diamond'),
    ],
    layout: {
      title: { text: `${r.scenario}: cost against reach (${shown.length} of ${r.planets_ranked} planets with both)` },
      xaxis: { title: { text: `smallest moon detectable (forecast pdet ≥ ${r.pdet_threshold}), Mearth` }, type: 'log' },
      yaxis: { title: { text: `transits for the target moon at ${r.transits_probability} (forecast)` }, type: 'log' },
      legend: { orientation: 'h', y: -0.2 },
      margin: { t: 50 },
    },
  };
}

const me = (kg: number | null) => (kg === null ? '–' : (kg / M_EARTH_KG).toPrecision(3));
const orDash = (x: number | null, f: (v: number) => string = String) => (x === null ? '–' : f(x));

/** The smallest moon's range over the planet-mass scatter of a mass_from_radius row. */
function massRange(p: RankedPlanetJson): string {
  if (!p.flags.includes('mass_from_radius')) return '';
  const hi = p.best_min_moon_mass_high_kg === null ? 'none found' : me(p.best_min_moon_mass_high_kg);
  return `${me(p.best_min_moon_mass_low_kg)}–${hi}`;
}

/** The planet's detail: a link to its sweep report, else the command that makes it from its scenario file, else how to get that file. */
function detailCell(p: RankedPlanetJson): string {
  if (p.detail_report !== null) return `<a href="${escapeHtml(encodeURI(p.detail_report))}">sweep report</a>`;
  if (p.detail_scenario !== null) {
    const dir = p.detail_scenario.replace(/\/scenario\.yaml$/, '');
    return `<small>not run; in this folder: <code>${escapeHtml(detailCommand(dir))}</code></small>`;
  }
  return '<small>none written: <code>moonsieve rank --detail N</code> (N ≥ 1; with --shard, the same N on every shard, then <code>merge</code>) writes each listed planet\'s detail scenario</small>';
}

export function renderRankPage(r: RankJson): string {
  const head = ['rank (interval)', 'name', ...r.separations_hill.map((f) => `${f} R<sub>H</sub> (M⊕)`), 'smallest moon over the planet-mass scatter (M⊕)', 'bound, per separation (M⊕)', 'transits (forecast)', 'transits (Monte Carlo, pdet 95 % interval)', 'campaign whole transits', 'nights', 'hours', 'target moon', 'detail', 'notes'];
  const rows = r.planets.slice(0, RANK_PAGE_ROWS).map((p) => {
    const mc = p.mc_realizations === null ? '' : p.mc_transits_needed === null ? 'not reached' : `${p.mc_transits_needed} (${p.mc_pdet!.toFixed(2)}, ${p.mc_pdet_lower!.toFixed(2)}–${p.mc_pdet_upper!.toFixed(2)})`;
    const cells = [
      String(p.rank) + (p.rank_best === p.rank_worst ? '' : ` <small>(${p.rank_best}–${p.rank_worst})</small>`), escapeHtml(p.name) + (p.flags.length ? ` <small>(${escapeHtml(p.flags.join(', '))})</small>` : ''),
      ...p.min_moon_mass_kg.map((m, k) => (m === null ? `<small>${escapeHtml(p.min_moon_mass_notes[k] ?? '–')}</small>` : me(m))),
      massRange(p),
      p.bound_min_moon_mass_kg ? p.bound_min_moon_mass_kg.map(me).join(', ') : '',
      orDash(p.target_transits_needed), mc, orDash(p.campaign_expected_whole_transits, (v) => v.toFixed(1)),
      orDash(p.nights), orDash(p.on_sky_s, (v) => (v / HOUR_S).toFixed(1)),
      escapeHtml([p.target_habitability ?? '', p.habitable_moon_in_reach ? 'in reach' : ''].filter(Boolean).join(', ')),
      detailCell(p),
      `<small>${escapeHtml(p.notes.join(' '))}</small>`,
    ];
    return `<tr>${cells.map((c) => `<td>${c}</td>`).join('')}</tr>`;
  });
  const skipped = r.skipped.map((s) => `<li>row ${s.row} (line ${s.line}${s.name ? `, ${escapeHtml(s.name)}` : ''}): ${escapeHtml(s.problems.join('; '))}</li>`);
  const body = `
<h1>${escapeHtml(r.scenario)}: planets ranked by the moons they could reveal</h1>
<p>${r.planets_ranked} of ${r.planets_in_list} planets ranked${r.shard ? ` (shard ${escapeHtml(r.shard)})` : ''}; ${r.skipped.length} rows skipped; Monte Carlo confirmation for the top ${r.mc_confirmed}.
The masses are the smallest moons whose analytic forecast reaches pdet ${r.pdet_threshold} at each separation (Hill radii), a lower estimate of the sensitivity; the known-template bound (top ${r.bound_computed}) is the best any analysis can do. The forecast has no interval of its own; the Monte Carlo column gives one. A planet whose mass comes from its radius (Chen &amp; Kipping 2017) gets the range of its smallest moon over that relation's stated radius scatter (±1 σ) and the rank interval it allows against the others; rows with a stated mass carry no interval (the list gives no mass error), so the intervals are a floor on the ranking's uncertainty.</p>
<div id="rank-scatter" class="plot"></div>
<h2>Ranking${r.planets.length > RANK_PAGE_ROWS ? ` (first ${RANK_PAGE_ROWS}; all in rank.json and rank.ecsv)` : ''}</h2>
<table><thead><tr>${head.map((h) => `<th>${h}</th>`).join('')}</tr></thead><tbody>
${rows.join('\n')}
</tbody></table>
${skipped.length ? `<h2>Skipped rows</h2><ul>${skipped.join('\n')}</ul>` : ''}
<h2>What this leaves out</h2>
<ul>${r.assumptions.map((a) => `<li>${escapeHtml(a)}</li>`).join('\n')}</ul>`;
  return renderPlotlyPage({ title: `${r.scenario}: ranked planets`, bodyHtml: body, figures: [rankScatter(r)] });
}
