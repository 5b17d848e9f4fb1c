/**
 * A small self-contained HTML page for a budget: detection probability (or
 * the fraction of target moons reaching it) against the solved quantity,
 * the forecast as a line, the Monte Carlo evaluations with their Wilson
 * intervals, the target as a dashed line and the chosen value marked.
 */
import { escapeHtml } from './escape.js';
import { renderPlotlyPage, type Figure } from './plotlyPage.js';
import type { BudgetResult } from '../budget/budgetTypes.js';
import { formatQuantity } from '../budget/solvedQuantity.js';
import { calendarSectionHtml, seasonFigure } from './seasonChart.js';

export function budgetFigure(r: BudgetResult): Figure {
  const q = r.quantity;
  const x = q.values.map((v) => v / q.displayFactor);
  const level = r.habitable ? r.habitable.fraction : r.probability_target;
  const yTitle = r.habitable ? `fraction of target moons at ≥ ${(100 * r.probability_target).toFixed(0)} % detection` : `detection probability (${r.channel})`;
  const fx: number[] = [];
  const fy: number[] = [];
  r.forecast.probability.forEach((p, i) => {
    if (p !== null) {
      fx.push(x[i]);
      fy.push(p);
    }
  });
  const ev = [...r.evaluations].sort((a, b) => a.index - b.index);
  const data: unknown[] = [
    { type: 'scatter', mode: 'lines', name: `analytic forecast${r.forecast.applies ? '' : ' (first guess only)'}`, x: fx, y: fy, line: { color: '#7a7a7a', dash: r.forecast.applies ? 'solid' : 'dot' } },
    {
      type: 'scatter', mode: 'markers', name: 'Monte Carlo (Wilson 95 %)',
      x: ev.map((e) => e.value / q.displayFactor), y: ev.map((e) => e.probability),
      error_y: { type: 'data', symmetric: false, array: ev.map((e) => e.upper - e.probability), arrayminus: ev.map((e) => e.probability - e.lower) },
      marker: { color: ev.map((e) => (e.passed ? '#1f77b4' : '#d62728')), size: 8 },
    },
    { type: 'scatter', mode: 'lines', name: `target ${(100 * level).toFixed(0)} %`, x: [x[0], x[x.length - 1]], y: [level, level], line: { color: '#2ca02c', dash: 'dash' } },
  ];
  const a = r.answer.index;
  if (a !== null) {
    const y = r.answer.at ? r.answer.at.probability : (r.forecast.probability[a] ?? level);
    data.push({ type: 'scatter', mode: 'markers', name: `chosen: ${formatQuantity(q, q.values[a])}`, x: [x[a]], y: [y], marker: { symbol: 'star', size: 18, color: '#ff7f0e', line: { color: '#000', width: 1 } } });
  }
  const xTitle = q.solve === 'transits' ? 'transits' : q.solve === 'cadence' ? 'cadence (min)' : `white noise (${q.displayUnit})`;
  // Transits: show the searched part of the grid (to twice the furthest index of interest), not all of it.
  const far = Math.max(0, r.forecast.index ?? 0, r.answer.index ?? 0, ...ev.map((e) => e.index));
  const xRange = q.solve === 'transits' ? [x[0] - 0.5, x[Math.min(x.length - 1, 2 * far + 3)] + 0.5] : undefined;
  return {
    id: 'budget',
    data,
    layout: {
      title: { text: `${r.scenario}: ${yTitle} against ${xTitle}` },
      xaxis: { title: { text: xTitle }, type: q.solve === 'transits' ? 'linear' : 'log', ...(xRange ? { range: xRange } : {}) },
      yaxis: { title: { text: yTitle }, range: [-0.02, 1.05] },
      legend: { orientation: 'h', y: -0.2 },
      margin: { t: 50 },
    },
  };
}

export function renderBudgetPage(r: BudgetResult): string {
  const q = r.quantity;
  const list = (xs: string[]) => (xs.length ? `<ul>${xs.map((x) => `<li>${escapeHtml(x)}</li>`).join('')}</ul>` : '');
  const rows = [...r.evaluations].sort((a, b) => a.index - b.index).map((e) =>
    `<tr><td>${escapeHtml(formatQuantity(q, e.value))}${e.index === r.answer.index ? ' ◀' : ''}</td><td>${fmt(r.forecast.probability[e.index])}</td><td>${fmt(e.probability)}</td><td>${fmt(e.lower)} – ${fmt(e.upper)}</td><td>${e.passed ? 'reaches' : 'short'}</td><td>${e.seconds.toFixed(1)} s</td></tr>`).join('\n');
  const body = `<h1>${escapeHtml(r.scenario)}: observing budget</h1>
<p class="${r.answer.reached ? '' : 'caution'}">${escapeHtml(r.answer.statement)}</p>
${r.observability.plan ? '' : `<p class="caution" id="whole-transits">${escapeHtml(r.observability.statement)}</p>`}
<div id="budget" class="plot"></div>
${r.observability.plan ? calendarSectionHtml(r.observability.statement, r.observability.plan, 'Observing calendar: the nights to book') : ''}
${rows ? `<h2>Monte Carlo evaluations</h2>
<table><thead><tr><th>value</th><th>forecast</th><th>${r.habitable ? 'fraction of moons' : 'probability'}</th><th>Wilson 95 %</th><th></th><th>time</th></tr></thead><tbody>
${rows}
</tbody></table>
<p>${r.realizations} moon realizations${r.habitable ? ` for each of ${r.habitable.simulated} moons` : ''} and ${r.no_moon_realizations} no-moon realizations per value; false-alarm probability ${r.false_alarm} per channel.</p>` : ''}
${r.answer.reasons.length ? `<h2>Why not</h2>${list(r.answer.reasons)}` : ''}
${r.forecast.why.length ? `<h2>Forecast</h2>${list(r.forecast.why)}` : ''}
${r.notes.length ? `<h2>Notes</h2>${list(r.notes)}` : ''}
<h2>Assumptions</h2>${list(r.assumptions)}`;
  return renderPlotlyPage({ title: `${r.scenario}: observing budget`, bodyHtml: body, figures: [budgetFigure(r), ...(r.observability.plan ? [seasonFigure(r.observability.plan)] : [])] });
}

function fmt(p: number | null | undefined): string {
  return p === null || p === undefined || !Number.isFinite(p) ? '—' : p.toFixed(3);
}
