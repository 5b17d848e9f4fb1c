/**
 * The HTML page of `moonsieve vet` (same look as the simulate page): the
 * verdict and checks as tables, the TTV/TDV series with the fitted sinusoid,
 * the periodograms, and the mass–separation plane with the stable band.
 * All user text is escaped (escape.ts; plotlyPage.ts escapes plot text).
 */
import { escapeHtml } from './escape.js';
import { renderPlotlyPage, type Figure } from './plotlyPage.js';
import { M_EARTH_KG } from '../physics/constants.js';
import { VERSION } from '../version.js';
import type { VetResult } from '../vet/vetTypes.js';

export function renderVetPage(r: VetResult): string {
  const figures: Figure[] = [];
  const rp = r.system.planetRadiusM;
  if (r.series) {
    const s = r.series;
    const data: unknown[] = [
      { x: s.epochs, y: s.ttvS, error_y: { type: 'data', array: s.ttvErrS, visible: true }, type: 'scatter', mode: 'markers', name: 'TTV' },
      { x: s.epochs, y: s.ttvModelS, type: 'scatter', mode: 'lines', name: 'TTV sinusoid fit' },
    ];
    if (s.tdvS && s.tdvErrS && s.tdvModelS) {
      data.push({ x: s.epochs, y: s.tdvS, error_y: { type: 'data', array: s.tdvErrS, visible: true }, type: 'scatter', mode: 'markers', name: 'TDV', yaxis: 'y2' });
      data.push({ x: s.epochs, y: s.tdvModelS, type: 'scatter', mode: 'lines', name: 'TDV sinusoid fit', yaxis: 'y2' });
    }
    figures.push({
      id: 'series',
      data,
      layout: {
        title: { text: 'Timing residuals and the fitted moon sinusoid' },
        xaxis: { title: { text: 'epoch' } },
        yaxis: { title: { text: 'TTV (s)' }, domain: [0.55, 1] },
        yaxis2: { title: { text: 'TDV (s)' }, domain: [0, 0.45] },
        margin: { t: 50 },
      },
    });
  }
  const t = r.tableSignificance;
  if (t) {
    const data: unknown[] = [{ x: t.periodogramTtv.frequency, y: t.periodogramTtv.power, type: 'scatter', mode: 'lines', name: 'TTV' }];
    if (t.periodogramTdv) data.push({ x: t.periodogramTdv.frequency, y: t.periodogramTdv.power, type: 'scatter', mode: 'lines', name: 'TDV' });
    figures.push({
      id: 'periodogram',
      data,
      layout: {
        title: { text: 'Generalised Lomb–Scargle periodograms' },
        xaxis: { title: { text: 'frequency (cycles per epoch)' } },
        yaxis: { title: { text: 'power Z' } },
        margin: { t: 50 },
      },
    });
  }
  // Mass–separation plane: stable band and Roche limits, the implied moon or its degeneracy curve.
  const imp = r.implied;
  const sysLines = (x: number, name: string, dash: string) => ({ x: [x / rp, x / rp], y: [1e-4, 1e4], type: 'scatter', mode: 'lines', name, line: { dash } });
  const plane: unknown[] = [
    sysLines(r.system.rocheRockyM, 'Roche limit (rocky)', 'dot'),
    sysLines(r.system.rocheIcyM, 'Roche limit (icy)', 'dot'),
    sysLines(r.system.stableProgradeM, 'stable limit (prograde)', 'dash'),
    sysLines(r.system.stableRetrogradeM, 'stable limit (retrograde)', 'dashdot'),
    { x: [r.system.hillRadiusM / rp * 0.01, r.system.hillRadiusM / rp], y: [(r.system.tidalMaxMassKg) / M_EARTH_KG, r.system.tidalMaxMassKg / M_EARTH_KG], type: 'scatter', mode: 'lines', name: 'tidal-survival mass', line: { dash: 'dot' } },
  ];
  // Unbounded quantiles (null: no moon can make the signal there) are left out of the plot.
  const sep = imp?.separationM;
  const mass = imp?.massKg;
  if (sep && mass && sep.median !== null && mass.median !== null) {
    const bar = (q: typeof sep, scale: number) =>
      q.lo2 !== null && q.hi2 !== null && q.median !== null ? { type: 'data', symmetric: false, array: [(q.hi2 - q.median) / scale], arrayminus: [(q.median - q.lo2) / scale] } : undefined;
    plane.push({
      x: [sep.median / rp],
      y: [mass.median / M_EARTH_KG],
      error_x: bar(sep, rp),
      error_y: bar(mass, M_EARTH_KG),
      type: 'scatter', mode: 'markers', name: 'implied moon (2σ)', marker: { size: 10 },
    });
  }
  if (imp?.degeneracy) {
    const d = imp.degeneracy;
    const x = d.separationM.map((a) => a / rp);
    const earth = (m: number | null) => (m === null ? null : m / M_EARTH_KG);
    plane.push({ x, y: d.massKg.map(earth), type: 'scatter', mode: 'lines', name: 'degeneracy curve (median)' });
    plane.push({ x, y: d.massLoKg.map(earth), type: 'scatter', mode: 'lines', name: '2σ low', line: { dash: 'dot' } });
    plane.push({ x, y: d.massHiKg.map(earth), type: 'scatter', mode: 'lines', name: '2σ high', line: { dash: 'dot' } });
  }
  figures.push({
    id: 'plane',
    data: plane,
    layout: {
      title: { text: 'Implied moon against the limits' },
      xaxis: { title: { text: 'separation (planet radii)' }, type: 'log' },
      yaxis: { title: { text: 'moon mass (Earth masses)' }, type: 'log' },
      margin: { t: 50 },
    },
  });

  const statusClass = (s: string) => (s === 'fail' ? 'color:#b00020;font-weight:bold' : s === 'tension' ? 'color:#a05a00;font-weight:bold' : s === 'pass' ? 'color:#1b6e20' : 'color:#666');
  const body = `
<h1>${escapeHtml(r.claim)}: vetting a claimed moon signal</h1>
<p><strong>Verdict: ${escapeHtml(r.verdict)}</strong></p>
<ol>${r.reasons.map((x) => `<li>${escapeHtml(x)}</li>`).join('')}</ol>
<h2>Checks</h2>
<table><tr><th>check</th><th>status</th><th>numbers</th><th>source</th></tr>
${r.checks.map((c) => `<tr><td>${escapeHtml(c.title)}</td><td style="${statusClass(c.status)}">${escapeHtml(c.status)}</td><td>${escapeHtml(c.detail)}</td><td>${escapeHtml(c.source)}</td></tr>`).join('\n')}
</table>
${figures.map((f) => `<div id="${f.id}" class="plot"></div>`).join('\n')}
<h2>Cautions</h2>
<div class="caution"><ul>${r.cautions.map((c) => `<li>${escapeHtml(c)}</li>`).join('')}</ul></div>
<h2>Assumptions</h2>
<ul>${r.assumptions.map((c) => `<li>${escapeHtml(c)}</li>`).join('')}</ul>
<p>moonsieve ${escapeHtml(VERSION)}; ${imp ? `implied moon from ${imp.draws} seeded Monte Carlo draws (seed ${imp.seed})` : 'no implied moon (no detectable signal)'}.</p>`;
  return renderPlotlyPage({ title: `${r.claim}: vet`, bodyHtml: body, figures });
}
