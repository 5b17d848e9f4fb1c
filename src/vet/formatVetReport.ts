/** The readable text report of `moonsieve vet`. */
import type { VetResult } from './vetTypes.js';
import { earthMasses, planetRadii, sig3, timeText } from './describe.js';

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
  lines.push(`VERDICT: ${r.verdict.toUpperCase()}`);
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
    const noSignal = r.verdict === 'no detectable signal';
    // The periodogram's power is scale-free (relative to the scatter itself): without excess scatter its FAP means nothing.
    const scaleFree = noSignal ? '; the scatter is within the errors, so this peak is not a signal' : '';
    row('TTV periodogram peak', `${sig3(t.periodogramTtv.peakFrequencyPerEpoch)} cycles/epoch, power ${sig3(t.periodogramTtv.peakPower)}, FAP ${sig3(t.periodogramTtv.falseAlarmProbability)} (Baluev 2008)${scaleFree}`);
    if (t.periodogramTdv) row('TDV periodogram peak', `${sig3(t.periodogramTdv.peakFrequencyPerEpoch)} cycles/epoch, FAP ${sig3(t.periodogramTdv.falseAlarmProbability)}`);
    row('sinusoid semi-amplitudes', `TTV ${timeText(t.ttvSemiAmplitudeS)} ± ${timeText(t.ttvSemiAmplitudeErrS)}${t.tdvSemiAmplitudeS !== null ? `, TDV ${timeText(t.tdvSemiAmplitudeS)} ± ${timeText(t.tdvSemiAmplitudeErrS!)}` : ''}`);
    const fam = t.aliasFamily;
    if (!noSignal) row('moon periods with this alias', `${fam.count} between the stable limit and the Roche limit; first: ${fam.periodsS.slice(0, 5).map(timeText).join(', ')}${fam.nearestToImpliedS !== null ? `; nearest the TDV/TTV period: ${timeText(fam.nearestToImpliedS)}` : ''}`);
  }
  const s = r.amplitudeSignificance;
  if (s) {
    if (s.ttvZ !== null) row('claimed TTV significance', `${sig3(s.ttvZ)}σ`);
    if (s.tdvZ !== null) row('claimed TDV significance', `${sig3(s.tdvZ)}σ`);
    if (s.timingPrecisionS !== null) row('per-transit precision (Carter 2008)', `mid-time ${timeText(s.timingPrecisionS)}, duration ${timeText(s.durationPrecisionS ?? NaN)}`);
  }

  const imp = r.implied;
  if (!imp) {
    lines.push('', 'Implied moon: none (no detectable signal to explain)');
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

  lines.push('', 'Where a moon can orbit');
  row('Hill radius', planetRadii(r.system.hillRadiusM, rp));
  row('stable limit prograde / retrograde', `${planetRadii(r.system.stableProgradeM, rp)} / ${planetRadii(r.system.stableRetrogradeM, rp)}`);
  row('Roche limit rocky / icy', `${planetRadii(r.system.rocheRockyM, rp)} / ${planetRadii(r.system.rocheIcyM, rp)}`);
  row('tidal-survival mass', earthMasses(r.system.tidalMaxMassKg));

  lines.push('', 'Checks');
  for (const c of r.checks) {
    lines.push(`  [${c.status.toUpperCase()}] ${c.title}`);
    lines.push(`      ${c.detail}`);
    lines.push(`      source: ${c.source}`);
  }
  lines.push('', 'Cautions (alternatives to rule out; not modelled here)');
  for (const c of r.cautions) lines.push(`  - ${c}`);
  lines.push('', 'Assumptions');
  for (const c of r.assumptions) lines.push(`  - ${c}`);
  return lines.join('\n') + '\n';
}
