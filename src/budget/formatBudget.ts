/** The readable form of a `BudgetResult`: the answer, a table of evaluated values, notes and assumptions. */
import { M_EARTH_KG } from '../physics/constants.js';
import type { BudgetResult } from './budgetTypes.js';
import { formatQuantity, pct } from './solvedQuantity.js';
import { formatObservability } from './formatNights.js';

const p3 = (p: number | null | undefined): string => (p === null || p === undefined || !Number.isFinite(p) ? '—' : p.toFixed(3));

function solveText(r: BudgetResult): string {
  const q = r.quantity;
  const first = formatQuantity(q, q.values[0]);
  const last = formatQuantity(q, q.values[q.values.length - 1]);
  if (q.solve === 'transits') return `the fewest transits (${q.values[0]} to ${q.values[q.values.length - 1]})`;
  if (q.solve === 'cadence') return `the coarsest cadence (${first} down to ${last}, ${q.values.length} values)`;
  return `the worst white-noise level (${first} down to ${last}, ${q.values.length} values)`;
}

export function formatBudget(r: BudgetResult): string {
  const lines: string[] = [];
  const q = r.quantity;
  lines.push(`${r.scenario}: observing budget`, '');
  if (r.target_moon) {
    const m = r.target_moon;
    lines.push(`  target     ${pct(r.probability_target)} ${r.channel} detection of a ${m.mass_text} moon (radius ${(m.radius_m / 1e3).toFixed(0)} km) at ${m.separation_text}; ${m.placement.join('; ')}${m.habitability ? `, ${m.habitability}` : ''}`);
  } else if (r.habitable) {
    const h = r.habitable;
    lines.push(`  target     ${(100 * h.fraction).toFixed(0)} % of the temperate, stable moons of ${(h.mass_from_kg / M_EARTH_KG).toPrecision(2)}–${(h.mass_to_kg / M_EARTH_KG).toPrecision(2)} Mearth (${h.targets.length} of ${h.candidates} on the grid) at ${pct(r.probability_target)} ${r.channel} detection each`);
  }
  lines.push(`  solve for  ${solveText(r)}, the rest of the scenario fixed`);
  lines.push(`  method     ${r.monte_carlo ? `analytic forecast as the first guess, then a Monte Carlo search: ${r.realizations} moon realizations${r.habitable ? ` for each of ${r.habitable.simulated} moons` : ''} and ${r.no_moon_realizations} no-moon realizations per value, false-alarm ${r.false_alarm} per channel` : 'analytic forecast only (no Monte Carlo)'}`);
  lines.push(`  window     ${(r.window_per_transit_s / 3600).toFixed(2)} h per transit (T14 + 2 × baseline)`);
  lines.push('', 'Answer', `  ${r.answer.statement}`);
  lines.push(...formatObservability(r.observability));

  const rows = new Map<number, string>();
  const ans = r.answer.index;
  const label = r.habitable ? 'fraction of moons [95 %]' : `Monte Carlo pdet_${r.channel} [95 %]`;
  for (const e of r.evaluations) {
    rows.set(e.index, `  ${(formatQuantity(q, e.value) + (e.index === ans ? '  ◀' : '')).padEnd(26)} ${p3(r.forecast.probability[e.index]).padStart(8)}   ${`${p3(e.probability)} [${p3(e.lower)}, ${p3(e.upper)}]`.padEnd(24)} ${e.passed ? 'reaches' : 'short'}   ${e.seconds.toFixed(1)} s`);
  }
  if (rows.size === 0 && ans !== null) {
    for (let i = Math.max(0, ans - 2); i <= Math.min(q.values.length - 1, ans + 2); i++) {
      rows.set(i, `  ${(formatQuantity(q, q.values[i]) + (i === ans ? '  ◀' : '')).padEnd(26)} ${p3(r.forecast.probability[i]).padStart(8)}`);
    }
  }
  if (rows.size > 0) {
    lines.push('', `  ${'value'.padEnd(26)} ${'forecast'.padStart(8)}   ${r.monte_carlo ? label : ''}`);
    for (const i of [...rows.keys()].sort((a, b) => a - b)) lines.push(rows.get(i)!);
  }
  if (!r.answer.reached && r.answer.reasons.length > 1) {
    lines.push('', 'Why not');
    for (const why of r.answer.reasons) lines.push(`  - ${why}`);
  }
  if (r.forecast.why.length > 0) {
    lines.push('', `Forecast (${r.forecast.applies ? 'its assumptions hold' : 'a first guess only'})`);
    for (const w of r.forecast.why) lines.push(`  - ${w}`);
  }
  if (r.notes.length > 0) {
    lines.push('', 'Notes');
    for (const n of r.notes) lines.push(`  - ${n}`);
  }
  lines.push('', 'Assumptions');
  for (const a of r.assumptions) lines.push(`  - ${a}`);
  lines.push('', `(${r.wall_time_s.toFixed(1)} s)`);
  return lines.join('\n') + '\n';
}
