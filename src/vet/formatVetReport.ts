/** The readable text report of `moonsieve vet`. */
import type { Verdict, VetResult } from './vetTypes.js';
import { earthMasses, planetRadii, sig3, timeText } from './describe.js';

/** The verdict in words, as the screen shows it (the JSON carries the snake_case value). */
export const VERDICT_WORDS: Record<Verdict, string> = {
  no_signal: 'NO SIGNAL',
  consistent: 'CONSISTENT WITH A MOON',
  tension: 'IN TENSION',
  implausible: 'IMPLAUSIBLE',
};

export function formatVetReport(r: VetResult): string {
  const lines: string[] = [];
  const rp = r.system.planetRadiusM;
  const row = (label: string, value: string) => lines.push(`  ${label.padEnd(34)} ${value}`);
  // null in the result: unbounded (no moon can make the signal there), printed as ∞.
  const un = (x: number | null) => (x === null ? Infinity : x);
  let unbounded = false;
  const iv = (q: { median: number | null; lo2: number | null; hi2: number | null }, f: (x: number) => string) => {
    if (q.median === null || q.lo2 === null || q.hi2 === null) unbounded = true;
    return `${f(un(q.median))}  (2σ ${f(un(q.lo2))} – ${f(un(q.hi2))})`;
  };
  lines.push(`${r.claim}: vetting a claimed moon signal (${r.input === 'table' ? 'table of transit times' : 'claimed amplitudes'})`, '');
  lines.push(`VERDICT: ${VERDICT_WORDS[r.verdict]}`);
  r.reasons.forEach((s, i) => lines.push(`  ${i + 1}. ${s}`));

  lines.push('', 'Signal');
  const a = r.amplitudes;
  if (a.ttvRmsS !== null) row('TTV rms', `${timeText(a.ttvRmsS)} ± ${timeText(a.ttvRmsErrS ?? NaN)}`);
  if (a.tdvRmsS !== null) row('TDV rms', `${timeText(a.tdvRmsS)} ± ${timeText(a.tdvRmsErrS ?? NaN)}`);
  const t = r.tableSignificance;
  if (t) {
    row('transits', `${t.transits}`);
    row('TTV χ² about linear ephemeris', `${sig3(t.ttv.chiSquare)} / ${t.ttv.dof} dof, p = ${sig3(t.ttv.pValue)}`);
    if (t.tdv) row('TDV χ² about mean duration', `${sig3(t.tdv.chiSquare)} / ${t.tdv.dof} dof, p = ${sig3(t.tdv.pValue)}`);
    if (t.joint) row('joint χ²', `${sig3(t.joint.chiSquare)} / ${t.joint.dof} dof, p = ${sig3(t.joint.pValue)}`);
    row('ΔBIC TTV (k 2 → 5)', `${sig3(t.bicTtv.delta)} at ${sig3(t.bicTtv.frequencyPerEpoch)} cycles/epoch`);
    if (t.bicTdv) row('ΔBIC TDV (k 1 → 4)', `${sig3(t.bicTdv.delta)} at ${sig3(t.bicTdv.frequencyPerEpoch)} cycles/epoch`);
    if (t.bicJoint) row('ΔBIC joint (k 3 → 8)', `${sig3(t.bicJoint.delta)} at ${sig3(t.bicJoint.frequencyPerEpoch)} cycles/epoch`);
    const noSignal = r.verdict === 'no_signal';
    // The periodogram's power is scale-free (relative to the scatter itself): without excess scatter its FAP means nothing.
    const scaleFree = noSignal ? '; the scatter is within the errors, so this peak is not a signal' : '';
    row('TTV periodogram peak', `${sig3(t.periodogramTtv.peakFrequencyPerEpoch)} cycles/epoch, power ${sig3(t.periodogramTtv.peakPower)}, FAP ${sig3(t.periodogramTtv.falseAlarmProbability)} over the frequencies searched (Baluev 2008)${scaleFree}`);
    if (t.periodogramTdv) row('TDV periodogram peak', `${sig3(t.periodogramTdv.peakFrequencyPerEpoch)} cycles/epoch, FAP ${sig3(t.periodogramTdv.falseAlarmProbability)}`);
    row('sinusoid semi-amplitudes', `TTV ${timeText(t.ttvSemiAmplitudeS)} ± ${timeText(t.ttvSemiAmplitudeErrS)}${t.tdvSemiAmplitudeS !== null ? `, TDV ${timeText(t.tdvSemiAmplitudeS)} ± ${timeText(t.tdvSemiAmplitudeErrS!)}` : ''}`);
    const fam = t.aliasFamily;
    if (!noSignal) row('moon periods with this alias', `${fam.count} between the stable limit and the Roche limit; first: ${fam.periodsS.slice(0, 5).map(timeText).join(', ')}${fam.nearestToImpliedS !== null ? `; nearest the TDV/TTV period: ${timeText(fam.nearestToImpliedS)}` : ''}`);
  }
  row('detection (look-elsewhere counted)', `${r.signal.detected ? 'signal' : 'no signal'}: Bonferroni-adjusted p = ${sig3(r.signal.adjustedPValue)} vs α = ${sig3(r.signal.falseAlarm)}, set by ${r.signal.tests.find((x) => x.id === r.signal.strongest)?.label ?? r.signal.strongest}`);
  const s = r.amplitudeSignificance;
  if (s) {
    if (s.ttvZ !== null) row('claimed TTV significance', `${sig3(s.ttvZ)}σ`);
    if (s.tdvZ !== null) row('claimed TDV significance', `${sig3(s.tdvZ)}σ`);
    if (s.timingPrecisionS !== null) row('per-transit precision (Carter 2008)', `mid-time ${timeText(s.timingPrecisionS)}, duration ${timeText(s.durationPrecisionS ?? NaN)}`);
  }

  const imp = r.implied;
  if (!imp) {
    lines.push('', 'Implied moon: none (no signal to explain)');
  } else {
    lines.push('', `Implied moon (${imp.mode}; ${imp.draws} Monte Carlo draws, seed ${imp.seed}, ${imp.orientation} orientation)`);
    if (imp.moonPeriodS) row('moon period', iv(imp.moonPeriodS, timeText));
    if (imp.separationM) row('separation', `${iv(imp.separationM, (x) => planetRadii(x, rp))}  = ${sig3(un(imp.separationM.median) / r.system.hillRadiusM)} Hill radii`);
    row(imp.mode === 'ttv+tdv' ? 'mass' : 'lightest mass', iv(imp.massKg, earthMasses));
    row('mass ratio M_S/M_P', iv(imp.massRatio, sig3));
    row('coplanar (minimum) mass', imp.coplanarMassKg === null ? 'none at the central amplitudes' : earthMasses(imp.coplanarMassKg));
    if (imp.degeneracy) {
      const d = imp.degeneracy;
      const pick = [0, Math.floor(d.separationM.length / 3), Math.floor((2 * d.separationM.length) / 3), d.separationM.length - 1];
      row('degeneracy curve M_S(a_S)', pick.map((i) => `${planetRadii(d.separationM[i], rp)}: ${earthMasses(un(d.massKg[i]))}`).join('; '));
      if (d.massKg.some((m) => m === null)) unbounded = true;
    }
    if (unbounded) lines.push('  (∞: no moon at the separation assumed can make the signal; its offset a_PB would exceed the separation)');
    lines.push(`  (${imp.note})`);
  }

  const ex = r.exclusion;
  if (ex) {
    lines.push('', `What the data exclude (${ex.level * 100} % of ${ex.realizations} injected moons per cell detected, α = ${sig3(ex.falseAlarm)})`);
    const js = ex.separationM.length <= 5 ? ex.separationM.map((_, j) => j) : [0, Math.round((ex.separationM.length - 1) / 4), Math.round((ex.separationM.length - 1) / 2), Math.round((3 * (ex.separationM.length - 1)) / 4), ex.separationM.length - 1];
    for (const j of js) {
      const lim = ex.upperLimitKg[j];
      row(`moon at ${planetRadii(ex.separationM[j], rp)}`, lim === null ? 'nothing excluded up to the planet\'s mass' : `heavier than ${earthMasses(lim)} excluded`);
    }
    if (r.verdict !== 'no_signal') lines.push('  (with a signal present: what these errors could detect, not a limit on the moon that makes the signal)');
  }

  if (r.alternatives) {
    lines.push('', 'Other explanations (most competitive first; ΔBIC = BIC(alternative) − BIC(moon), > 0 favours the moon)');
    r.alternatives.forEach((alt, i) => {
      lines.push(`  ${i + 1}. ${alt.title}${alt.bicDelta !== null ? `: ΔBIC ${sig3(alt.bicDelta)}` : ''}`);
      for (const f of alt.favourMoon) lines.push(`      for the moon: ${f}`);
      for (const f of alt.favourAlternative) lines.push(`      for this: ${f}`);
      lines.push(`      would tell: ${alt.test}`);
    });
  }

  lines.push('', 'Where a moon can orbit');
  row('Hill radius', planetRadii(r.system.hillRadiusM, rp));
  row('stable limit prograde / retrograde', `${planetRadii(r.system.stableProgradeM, rp)} / ${planetRadii(r.system.stableRetrogradeM, rp)}`);
  row('Roche limit rocky / icy', `${planetRadii(r.system.rocheRockyM, rp)} / ${planetRadii(r.system.rocheIcyM, rp)}`);
  row('tidal-survival mass', earthMasses(r.system.tidalMaxMassKg));

  lines.push('', 'Checks');
  for (const c of r.checks) {
    // Without a signal the significance check's "fail" means "no signal", not a contradiction.
    const label = c.id === 'significance' && c.status === 'fail' ? 'NO SIGNAL' : c.status.toUpperCase();
    lines.push(`  [${label}] ${c.title}${c.id === 'significance' ? '' : ` (${c.grade})`}`);
    lines.push(`      ${c.detail}`);
    lines.push(`      source: ${c.source}`);
  }
  lines.push('', 'Cautions (alternatives to rule out; not modelled here)');
  for (const c of r.cautions) lines.push(`  - ${c}`);
  lines.push('', 'Assumptions');
  for (const c of r.assumptions) lines.push(`  - ${c}`);
  return lines.join('\n') + '\n';
}
