/**
 * The HTML page of `moonsieve vet` (same look as the simulate page): the
 * verdict and its reasons, the checks with their grades, the TTV and TDV
 * series with the fitted sinusoid's values at the observed epochs, the same
 * data folded at the fitted frequency with the sinusoid as a continuous curve,
 * the TTV–TDV diagram with the fitted and the single-moon (quadrature)
 * ellipses, the periodograms, what the data exclude (injection map with the
 * stable band and Roche limit) and the implied moon against the limits.
 * One plot per figure (no shared panels, so no label runs into another); mass
 * ticks written out in Earth masses (no SI prefixes). All user text is escaped
 * (escape.ts; plotlyPage.ts escapes plot text).
 */
import { escapeHtml } from './escape.js';
import { renderPlotlyPage, type Figure } from './plotlyPage.js';
import { M_EARTH_KG } from '../physics/constants.js';
import { VERSION } from '../version.js';
import type { VetResult } from '../vet/vetTypes.js';
import { VERDICT_WORDS } from '../vet/formatVetReport.js';

/** Decade ticks of a mass axis in Earth masses, as plain numbers ("0.001", "10"), for log10 values lo…hi. */
function massTicks(lo: number, hi: number): { tickvals: number[]; ticktext: string[] } {
  const tickvals: number[] = [];
  const ticktext: string[] = [];
  for (let k = Math.floor(lo); k <= Math.ceil(hi); k++) {
    tickvals.push(k);
    ticktext.push(k >= 0 ? String(10 ** k) : (10 ** k).toFixed(-k));
  }
  return { tickvals, ticktext };
}

const PLOT_MARGIN = { t: 50, l: 80, r: 30, b: 60 };

function seriesFigures(r: VetResult, figures: Figure[]): void {
  const s = r.series;
  if (!s) return;
  const nu = s.sinusoid.frequencyPerEpoch;
  // Without a signal the best sinusoid is drawn for reference only, and says so.
  const caveat = r.verdict === 'no_signal' ? ' (best fit; not a significant signal)' : '';
  const sinAt = (c: number, d: number, e: number) => c * Math.cos(2 * Math.PI * nu * e) + d * Math.sin(2 * Math.PI * nu * e);
  const channels: Array<{ key: 'ttv' | 'tdv'; y: number[]; err: number[]; model: number[]; c: number; d: number }> = [
    { key: 'ttv', y: s.ttvS, err: s.ttvErrS, model: s.ttvModelS, c: s.sinusoid.ttvCosS, d: s.sinusoid.ttvSinS },
  ];
  if (s.tdvS && s.tdvErrS && s.tdvModelS && s.sinusoid.tdvCosS !== null && s.sinusoid.tdvSinS !== null) {
    channels.push({ key: 'tdv', y: s.tdvS, err: s.tdvErrS, model: s.tdvModelS, c: s.sinusoid.tdvCosS, d: s.sinusoid.tdvSinS });
  }
  const detrended: Record<string, number[]> = {};
  for (const ch of channels) {
    const name = ch.key.toUpperCase();
    // The model's base (a line for TTV, a constant for TDV) = model − sinusoid, removed for the fold and the diagram.
    const base = s.epochs.map((e, i) => ch.model[i] - sinAt(ch.c, ch.d, e));
    detrended[ch.key] = ch.y.map((v, i) => v - base[i]);
    figures.push({
      id: `series-${ch.key}`,
      data: [
        { x: s.epochs, y: ch.y, error_y: { type: 'data', array: ch.err, visible: true }, type: 'scatter', mode: 'markers', name: `${name} (measured)` },
        { x: s.epochs, y: ch.model, type: 'scatter', mode: 'markers', marker: { symbol: 'diamond-open', size: 9 }, name: `fitted sinusoid at the observed epochs${caveat}` },
      ],
      layout: {
        title: { text: `${name} by epoch` },
        xaxis: { title: { text: 'epoch (transit number)' } },
        yaxis: { title: { text: `${name} (s)` } },
        margin: PLOT_MARGIN,
      },
    });
    const phase = s.epochs.map((e) => ((nu * e) % 1 + 1) % 1);
    const grid = Array.from({ length: 201 }, (_, k) => k / 200);
    // The fold maps epoch E to phase νE mod 1; the sinusoid is continuous in that phase.
    const curve = grid.map((p) => ch.c * Math.cos(2 * Math.PI * p) + ch.d * Math.sin(2 * Math.PI * p));
    figures.push({
      id: `folded-${ch.key}`,
      data: [
        { x: phase, y: detrended[ch.key], error_y: { type: 'data', array: ch.err, visible: true }, type: 'scatter', mode: 'markers', name: `${name} minus the fitted ${ch.key === 'ttv' ? 'ephemeris' : 'mean duration'}` },
        { x: grid, y: curve, type: 'scatter', mode: 'lines', name: `sinusoid at ${nu.toPrecision(3)} cycles/epoch (continuous in phase)${caveat}` },
      ],
      layout: {
        title: { text: `${name} folded at the fitted frequency ${nu.toPrecision(3)} cycles per epoch` },
        xaxis: { title: { text: 'phase (fitted frequency × epoch, modulo 1)' }, range: [-0.03, 1.03] },
        yaxis: { title: { text: `${name} (s)` } },
        margin: PLOT_MARGIN,
      },
    });
  }
  if (channels.length === 2) {
    const t = channels[0];
    const d = channels[1];
    const th = Array.from({ length: 181 }, (_, k) => (2 * Math.PI * k) / 180);
    const aT = Math.hypot(t.c, t.d);
    const aD = Math.hypot(d.c, d.d);
    figures.push({
      id: 'ttv-tdv',
      data: [
        { x: detrended.ttv, y: detrended.tdv, type: 'scatter', mode: 'markers', name: 'transits (base removed)' },
        { x: th.map((x) => t.c * Math.cos(x) + t.d * Math.sin(x)), y: th.map((x) => d.c * Math.cos(x) + d.d * Math.sin(x)), type: 'scatter', mode: 'lines', name: `fitted sinusoids${caveat}` },
        // A single moon on a circular orbit: TDV in quadrature with TTV (Kipping 2009a), an ellipse with axes along TTV and TDV.
        { x: th.map((x) => aT * Math.sin(x)), y: th.map((x) => aD * Math.cos(x)), type: 'scatter', mode: 'lines', line: { dash: 'dash' }, name: 'single-moon prediction (quadrature)' },
      ],
      layout: {
        title: { text: 'TTV–TDV diagram' },
        xaxis: { title: { text: 'TTV (s)' }, zeroline: true },
        yaxis: { title: { text: 'TDV (s)' }, zeroline: true },
        margin: PLOT_MARGIN,
      },
    });
  }
}

export function renderVetPage(r: VetResult): string {
  const figures: Figure[] = [];
  const rp = r.system.planetRadiusM;
  seriesFigures(r, figures);
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
        margin: PLOT_MARGIN,
      },
    });
  }
  const lg = (m: number) => Math.log10(m / M_EARTH_KG);
  const lr = (a: number) => Math.log10(a / rp);
  const imp = r.implied;
  const limitLines = (yLo: number, yHi: number) => [
    { x: [lr(r.system.rocheRockyM), lr(r.system.rocheRockyM)], y: [yLo, yHi], type: 'scatter', mode: 'lines', name: 'Roche limit (rocky)', line: { dash: 'dot', color: '#444' } },
    { x: [lr(r.system.stableProgradeM), lr(r.system.stableProgradeM)], y: [yLo, yHi], type: 'scatter', mode: 'lines', name: 'stable limit (prograde)', line: { dash: 'dash', color: '#444' } },
    { x: [lr(r.system.stableRetrogradeM), lr(r.system.stableRetrogradeM)], y: [yLo, yHi], type: 'scatter', mode: 'lines', name: 'stable limit (retrograde)', line: { dash: 'dashdot', color: '#444' } },
  ];
  const sepTicks = (lo: number, hi: number) => {
    const tickvals: number[] = [];
    const ticktext: string[] = [];
    for (let k = Math.floor(lo); k <= Math.ceil(hi); k++) for (const m of [1, 2, 5]) {
      const v = Math.log10(m) + k;
      if (v >= lo - 0.05 && v <= hi + 0.05) {
        tickvals.push(v);
        ticktext.push(String(Number((m * 10 ** k).toPrecision(2))));
      }
    }
    return { tickvals, ticktext };
  };
  const impliedPoint = () => {
    const sep = imp?.separationM;
    const mass = imp?.massKg;
    if (!(sep && mass && sep.median !== null && mass.median !== null)) return [];
    const bar = (q: typeof sep, f: (x: number) => number) =>
      q.lo2 !== null && q.hi2 !== null && q.median !== null ? { type: 'data', symmetric: false, array: [f(q.hi2) - f(q.median)], arrayminus: [f(q.median) - f(q.lo2)] } : undefined;
    return [{ x: [lr(sep.median)], y: [lg(mass.median)], error_x: bar(sep, lr), error_y: bar(mass, lg), type: 'scatter', mode: 'markers', name: 'implied moon (2σ)', marker: { size: 10, color: '#b00020' } }];
  };

  const ex = r.exclusion;
  if (ex) {
    const x = ex.separationM.map(lr);
    const y = ex.massKg.map(lg);
    // z[mass][separation] for plotly; not simulated (far below the errors) shown as 0 detected.
    const z = y.map((_, i) => x.map((__, j) => ex.detectedFraction[j][i] ?? 0));
    const lim = ex.upperLimitKg.map((m, j) => ({ x: x[j], y: m === null ? null : lg(m) })).filter((p) => p.y !== null);
    figures.push({
      id: 'exclusion',
      data: [
        { x, y, z, type: 'heatmap', zmin: 0, zmax: 1, colorscale: 'Greys', reversescale: true, colorbar: { title: { text: 'detected' }, x: 1.02 }, name: 'fraction of injected moons detected' },
        { x: lim.map((p) => p.x), y: lim.map((p) => p.y), type: 'scatter', mode: 'lines+markers', line: { color: '#1f77b4', width: 3 }, name: `95 % upper limit (excluded above)` },
        ...limitLines(y[0], y[y.length - 1]),
        ...impliedPoint(),
      ],
      layout: {
        title: { text: `What the data exclude: fraction of ${ex.realizations} injected moons detected per cell` },
        xaxis: { title: { text: 'moon separation (planet radii)' }, zeroline: false, ...sepTicks(x[0], x[x.length - 1]) },
        yaxis: { title: { text: 'moon mass (Earth masses)' }, zeroline: false, ...massTicks(y[0], y[y.length - 1]) },
        legend: { orientation: 'h', y: -0.25 },
        margin: { ...PLOT_MARGIN, b: 120 },
      },
    });
  }

  // Mass–separation plane: the implied moon or its degeneracy curve against the limits.
  const sLo = lr(Math.max(r.system.rocheRockyM, rp) / 2);
  const sHi = lr(r.system.stableRetrogradeM * 1.5);
  const plane: unknown[] = [];
  let mLo = lg(r.system.tidalMaxMassKg) - 3;
  let mHi = lg(r.system.planetMassKg) + 0.5;
  if (imp?.degeneracy) {
    const d = imp.degeneracy;
    const xs = d.separationM.map(lr);
    const yOf = (m: number | null) => (m === null ? null : lg(m));
    plane.push({ x: xs, y: d.massKg.map(yOf), type: 'scatter', mode: 'lines', name: 'degeneracy curve (median)' });
    plane.push({ x: xs, y: d.massLoKg.map(yOf), type: 'scatter', mode: 'lines', name: '2σ low', line: { dash: 'dot' } });
    plane.push({ x: xs, y: d.massHiKg.map(yOf), type: 'scatter', mode: 'lines', name: '2σ high', line: { dash: 'dot' } });
    for (const m of d.massLoKg) if (m !== null && m > 0) mLo = Math.min(mLo, lg(m) - 0.5);
  }
  const ip = impliedPoint();
  if (imp?.massKg.lo2) mLo = Math.min(mLo, lg(imp.massKg.lo2) - 0.5);
  if (imp?.massKg.hi2) mHi = Math.max(mHi, lg(imp.massKg.hi2) + 0.5);
  plane.push(...limitLines(mLo, mHi), ...ip);
  plane.push({ x: [sLo, sHi], y: [lg(r.system.tidalMaxMassKg), lg(r.system.tidalMaxMassKg)], type: 'scatter', mode: 'lines', name: 'tidal-survival mass', line: { dash: 'dot', color: '#a05a00' } });
  plane.push({ x: [sLo, sHi], y: [lg(r.system.planetMassKg), lg(r.system.planetMassKg)], type: 'scatter', mode: 'lines', name: 'planet mass', line: { color: '#888' } });
  figures.push({
    id: 'plane',
    data: plane,
    layout: {
      title: { text: imp ? 'Implied moon against the limits' : 'Where a moon can orbit (no signal: no implied moon)' },
      xaxis: { title: { text: 'moon separation (planet radii)' }, range: [sLo, sHi], zeroline: false, ...sepTicks(sLo, sHi) },
      yaxis: { title: { text: 'moon mass (Earth masses)' }, range: [mLo, mHi], zeroline: false, ...massTicks(mLo, mHi) },
      legend: { orientation: 'h', y: -0.25 },
      margin: { ...PLOT_MARGIN, b: 120 },
    },
  });

  const statusClass = (s: string) => (s === 'fail' ? 'color:#b00020;font-weight:bold' : s === 'tension' ? 'color:#a05a00;font-weight:bold' : s === 'pass' ? 'color:#1b6e20' : 'color:#666');
  const alts = r.alternatives
    ? `<h2>Other explanations (most competitive first)</h2>
<table><tr><th>explanation</th><th>ΔBIC (alternative − moon; &gt; 0 favours the moon)</th><th>favours the moon</th><th>favours this</th><th>would tell</th></tr>
${r.alternatives.map((a) => `<tr><td>${escapeHtml(a.title)}</td><td>${a.bicDelta === null ? 'n/a' : escapeHtml(a.bicDelta.toPrecision(3))}</td><td>${escapeHtml(a.favourMoon.join('; '))}</td><td>${escapeHtml(a.favourAlternative.join('; '))}</td><td>${escapeHtml(a.test)}</td></tr>`).join('\n')}
</table>`
    : '';
  const limits = ex
    ? `<h2>What the data exclude</h2><table><tr><th>separation (planet radii)</th><th>moons heavier than this are excluded at 95 % (Earth masses)</th></tr>
${ex.separationM.map((a, j) => `<tr><td>${escapeHtml((a / rp).toPrecision(3))}</td><td>${ex.upperLimitKg[j] === null ? 'none up to the planet mass' : escapeHtml((ex.upperLimitKg[j]! / M_EARTH_KG).toPrecision(3))}</td></tr>`).join('\n')}
</table>`
    : '';
  const body = `
<h1>${escapeHtml(r.claim)}: vetting a claimed moon signal</h1>
<p><strong>Verdict: ${escapeHtml(VERDICT_WORDS[r.verdict])}</strong> (<code>${escapeHtml(r.verdict)}</code>)</p>
<ol>${r.reasons.map((x) => `<li>${escapeHtml(x)}</li>`).join('')}</ol>
<h2>Checks</h2>
<table><tr><th>check</th><th>grade</th><th>status</th><th>numbers</th><th>source</th></tr>
${r.checks.map((c) => `<tr><td>${escapeHtml(c.title)}</td><td>${c.id === 'significance' ? '' : escapeHtml(c.grade)}</td><td style="${statusClass(c.status)}">${escapeHtml(c.id === 'significance' && c.status === 'fail' ? 'no signal' : c.status)}</td><td>${escapeHtml(c.detail)}</td><td>${escapeHtml(c.source)}</td></tr>`).join('\n')}
</table>
${alts}
${limits}
${figures.map((f) => `<div id="${f.id}" class="plot"></div>`).join('\n')}
<h2>Cautions</h2>
<div class="caution"><ul>${r.cautions.map((c) => `<li>${escapeHtml(c)}</li>`).join('')}</ul></div>
<h2>Assumptions</h2>
<ul>${r.assumptions.map((c) => `<li>${escapeHtml(c)}</li>`).join('')}</ul>
<p>moonsieve ${escapeHtml(VERSION)}; ${imp ? `implied moon from ${imp.draws} seeded Monte Carlo draws (seed ${imp.seed})` : 'no implied moon (no signal)'}.</p>`;
  return renderPlotlyPage({ title: `${r.claim}: vet`, bodyHtml: body, figures });
}
