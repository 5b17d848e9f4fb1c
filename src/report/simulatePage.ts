/**
 * The HTML page of `moonsieve simulate`: the light curve of each transit
 * against time from the barycentre's conjunction, and the planet's true
 * TTV/TDV series from the model.
 */
import type { Scenario } from '../scenario/types.js';
import type { Observation } from '../noise/observe.js';
import type { PlanetTransitTruth } from '../physics/planetTransitTruth.js';
import { gapsText, noiseModelText } from './assumptionsTable.js';
import { windowsOverlap } from '../photometry/transitWindows.js';
import { escapeHtml } from './escape.js';
import { renderPlotlyPage, type Figure } from './plotlyPage.js';
import { HOUR_S, M_EARTH_KG, R_EARTH_M, DAY_S } from '../physics/constants.js';
import { VERSION } from '../version.js';

export function renderSimulatePage(s: Scenario, obs: Observation, truth: PlanetTransitTruth[], noiseless: boolean): string {
  const traces: unknown[] = [];
  for (const w of obs.windows) {
    const x: number[] = [];
    const yObs: number[] = [];
    const yMod: number[] = [];
    for (let i = 0; i < obs.timeS.length; i++) {
      if (obs.epoch[i] !== w.epoch) continue;
      x.push((obs.timeS[i] - w.centreS) / HOUR_S);
      yObs.push((obs.flux[i] - 1) * 1e6);
      yMod.push((obs.model[i] - 1) * 1e6);
    }
    if (!noiseless) {
      traces.push({ x, y: yObs, type: 'scattergl', mode: 'markers', name: `transit ${w.epoch} data`, marker: { size: 3, opacity: 0.5 }, legendgroup: `e${w.epoch}` });
    }
    traces.push({ x, y: yMod, type: 'scattergl', mode: 'lines', name: `transit ${w.epoch} model`, line: { width: 1.5 }, legendgroup: `e${w.epoch}` });
  }
  const epochs = truth.map((t) => t.epoch);
  const ttvMin = truth.map((t) => (t.midS - t.epoch * s.planet.periodS) / 60);
  const meanDur = truth.reduce((a, t) => a + t.durationS, 0) / Math.max(1, truth.length);
  const tdvMin = truth.map((t) => (t.durationS - meanDur) / 60);
  const figures: Figure[] = [
    {
      id: 'lc',
      data: traces,
      layout: {
        title: { text: noiseless ? 'Noiseless light curve, each transit' : 'Simulated light curve, each transit' },
        xaxis: { title: { text: 'time from barycentre conjunction (h)' } },
        yaxis: { title: { text: 'relative flux − 1 (ppm)' } },
        margin: { t: 50 },
      },
    },
    {
      id: 'ttv',
      data: [
        { x: epochs, y: ttvMin, type: 'scatter', mode: 'lines+markers', name: 'TTV (model truth)' },
        { x: epochs, y: tdvMin, type: 'scatter', mode: 'lines+markers', name: 'TDV (model truth)', yaxis: 'y2' },
      ],
      layout: {
        title: { text: 'Planet transit timing and duration variations (model truth)' },
        xaxis: { title: { text: 'epoch' }, dtick: 1 },
        yaxis: { title: { text: 'TTV (min)' } },
        yaxis2: { title: { text: 'TDV (min)' }, overlaying: 'y', side: 'right' },
        margin: { t: 50 },
      },
    },
  ];
  const m = s.moon;
  const rows: Array<[string, string]> = [
    ['scenario', s.name],
    ['star', `M = ${(s.star.massKg / 1.98841e30).toFixed(3)} M☉, R = ${(s.star.radiusM / 6.957e8).toFixed(3)} R☉, Teff = ${s.star.teffK.toFixed(0)} K, u1 = ${s.star.u1}, u2 = ${s.star.u2}`],
    ['planet', `P = ${(s.planet.periodS / DAY_S).toFixed(4)} d, Rp/R* = ${(s.planet.radiusM / s.star.radiusM).toFixed(5)}, b = ${s.planet.impactParameter.toFixed(3)}`],
    ['moon', m ? `M = ${(m.massKg / M_EARTH_KG).toFixed(4)} M⊕, R = ${(m.radiusM / R_EARTH_M).toFixed(3)} R⊕, a = ${(m.separationM / s.planet.radiusM).toFixed(2)} Rp, ${m.retrograde ? 'retrograde' : 'prograde'}` : 'none'],
    ['instrument', `cadence ${(s.instrument.cadenceS / 60).toFixed(2)} min, exposure ${(s.instrument.exposureS / 60).toFixed(2)} min, white noise ${(obs.sigma * 1e6).toFixed(1)} ppm per exposure${noiseless ? ' (not added: noiseless)' : ''}`],
    ['noise model', noiseless ? 'none (noiseless model, no gaps)' : noiseModelText(s)],
    ['gaps', noiseless ? 'none (noiseless model)' : gapsText(s)],
    ['transits', `${s.observation.transits}, t0 = BJD_TDB ${s.observation.t0BjdTdb}${windowsOverlap(s) ? '; windows cut at the midpoints between conjunctions (the baseline reaches past half the period)' : ''}`],
    ['seed', String(s.seed)],
    ['moonsieve', VERSION],
  ];
  const body = `
<h1>${escapeHtml(s.name)}: simulated transits</h1>
<table>${rows.map(([k, v]) => `<tr><th>${escapeHtml(k)}</th><td>${escapeHtml(v)}</td></tr>`).join('')}</table>
<div id="lc" class="plot"></div>
<div id="ttv" class="plot"></div>
<p class="caution">A model, not an observation: the planet and moon follow nested Kepler orbits (no mutual
perturbations beyond the two-body barycentric motion, no stellar activity, spots, other planets or
instrumental systematics); the noise and gaps are those listed above.</p>`;
  return renderPlotlyPage({ title: `${s.name}: simulated transits`, bodyHtml: body, figures });
}
