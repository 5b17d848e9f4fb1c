/**
 * What a ground campaign can observe, as exposures: the calendar's observable
 * stretches of every transit of the campaign at every site
 * (sky/observableWindows.ts, the same as `moonsieve calendar`), sampled on
 * the instrument's cadence, each exposure with its site, its night (for the
 * weather) and its own white-noise level at the air mass it is taken at
 * (groundAirmass.ts).
 *
 * Time axis: the simulation's, s since the barycentre conjunction of its
 * epoch 0, which is the campaign's first transit (calendar epoch
 * `firstEpoch`). An exposure at geocentric UTC u of calendar epoch n lies at
 * (n − firstEpoch)·P + (u − mid_n), mid_n the transit's geocentric UTC
 * mid-time. Within a window the two clocks differ by the light-time terms,
 * which change at most at the Earth's orbital speed over c (≤ 1e-4 s per s):
 * a stretch of ≤ 2 s over the ±5 h of a long window, symmetric about the
 * mid-time, well below a cadence (calendar.ts, barycentric.ts).
 * The planet's period is the barycentric one, so the simulated epochs are
 * exactly P apart, as the ephemeris says.
 *
 * The plan depends only on the scenario without its moon, so a sweep computes
 * it once per class of cells: it is remembered (memo.ts) under the JSON of
 * the fields it reads; the result is never written to.
 *
 * Space instruments (scenario `visibility`, no site): the exposures are
 * those inside the visible stretches of the pattern (sky/visibilityPattern.ts,
 * the same as `moonsieve calendar`), on the BJD_TDB axis, which is the
 * simulation's own (offsets from each transit's mid-time); every exposure has
 * the instrument's stated noise, no air mass (NaN) and no weather (one
 * "site", index 0, and one night per transit, never drawn: clear_fraction is
 * 1 since constraints are not allowed with visibility).
 *
 * Left out (what the model does not know): one extinction coefficient per
 * band (groundAirmass.ts), no Moon or sky-brightness change over the night,
 * the same telescope and throughput at every site, nights clear or lost
 * whole (no partial clouds), no meridian flip or pointing limits.
 *
 * Weather: each (site, night) is clear with probability
 * `constraints.clear_fraction`, independently; a night runs from local mean
 * noon to noon (longitude / 15° h from Greenwich), so a transit across
 * midnight stays one night (common practice, no source).
 */
import { remembered } from '../memo.js';
import type { Scenario } from '../scenario/types.js';
import { airmassKastenYoung } from '../sky/airmass.js';
import { campaignObservability } from '../sky/observableWindows.js';
import { DAY_S } from '../physics/constants.js';
import { groundSigmaAtAirmass } from './groundAirmass.js';
import { whiteNoiseSigma } from './whiteNoise.js';

const DEG = Math.PI / 180;

export interface ObservingPlan {
  /** Calendar epoch of the simulation's epoch 0. */
  firstEpoch: number;
  /** Transits of the campaign (simulation epochs 0 … epochs − 1), observable or not. */
  epochs: number;
  /** Half-width of each epoch's window around its conjunction, s (T14/2 + baseline). */
  halfWindowS: number;
  /** Exposures, in time order (ties: site order): mid-exposure time, s since the simulation's t0. */
  timeS: Float64Array;
  epoch: Int32Array;
  /** Index of the site in `scenario.sky.sites` (0 for a space instrument). */
  site: Int32Array;
  /** Index of the (site, night) in the weather draws, 0 … nights − 1, in order of first exposure. */
  night: Int32Array;
  nights: number;
  /** Air mass of each exposure; NaN for a space instrument. */
  airmass: Float64Array;
  /** White noise per exposure (relative flux). */
  sigma: Float64Array;
  /** Whether `sigma` differs between exposures (a ground budget); false for a stated noise level. */
  sigmaVaries: boolean;
  /** Observable transit epochs per site (at least one exposure between first and last contact). */
  transitsSeenPerSite: number[];
}

/** Whether the scenario asks for a simulated campaign: a site, a target and a campaign, or a space instrument's visibility and a campaign. */
export function hasCampaign(s: Scenario): boolean {
  if (!s.sky || s.sky.campaign === null) return false;
  if (s.sky.visibility) return true;
  return s.sky.sites.length > 0 && s.sky.target !== null;
}

const PLAN_MEMO = new Map<string, ObservingPlan>();
const PLAN_MEMO_SIZE = 4;

/** The observing plan of a scenario with site, target and campaign, or visibility and campaign (see the file header); null without them. */
export function observingPlan(s: Scenario): ObservingPlan | null {
  if (!hasCampaign(s)) return null;
  // Every input of computePlan (the transit's shape: scenarioDurations' arguments); not
  // observation.transits: the campaign decides the epochs, so both forms share one plan.
  const p = s.planet;
  const i = s.instrument;
  const key = `${JSON.stringify(s.sky)}|${p.periodS},${p.semiMajorAxisM},${s.star.radiusM},${p.radiusM},${p.impactParameter},${p.inclinationRad},${p.eccentricity},${p.omegaRad}|${s.observation.t0BjdTdb},${s.observation.baselineS}|${i.cadenceS},${i.exposureS},${i.noiseFraction},${i.noiseTimescaleS}|${JSON.stringify(i.ground)}`;
  return remembered(PLAN_MEMO, PLAN_MEMO_SIZE, key, () => computePlan(s));
}

/** The scenario with `observation.transits` set to the campaign's transits (unchanged without a campaign). */
export function withCampaignEpochs(s: Scenario): Scenario {
  const plan = observingPlan(s);
  if (plan === null || plan.epochs === s.observation.transits) return s;
  return { ...s, observation: { ...s.observation, transits: plan.epochs } };
}

interface Sample {
  t: number;
  epoch: number;
  site: number;
  nightKey: string;
  airmass: number;
  sigma: number;
}

function computePlan(s: Scenario): ObservingPlan {
  const obs = campaignObservability(s);
  const P = s.planet.periodS;
  const cad = s.instrument.cadenceS;
  const exp = s.instrument.exposureS;
  const ground = s.instrument.ground;
  const stated = ground ? NaN : whiteNoiseSigma(s.instrument.noiseFraction, s.instrument.noiseTimescaleS, exp);
  const first = obs.epochs.length > 0 ? obs.epochs[0].epoch : 0;
  const samples: Sample[] = [];
  // One list of stretches per site, or one for a space instrument.
  const observers = obs.visibility ? 1 : obs.sites.length;
  const seen = new Array<number>(observers).fill(0);
  for (const e of obs.epochs) {
    const k = e.epoch - first;
    const centre = k * P;
    for (let j = 0; j < observers; j++) {
      const site = obs.visibility ? null : obs.sites[j];
      let inTransit = false;
      const lonS = site ? (site.longitudeRad / (2 * Math.PI)) * DAY_S : 0;
      for (const [x, y] of e.intervals[j]) {
        const k0 = Math.ceil((centre + x) / cad);
        const k1 = Math.floor((centre + y) / cad);
        for (let g = k0; g <= k1; g++) {
          const t = g * cad;
          const off = t - centre;
          if (Math.abs(off) < obs.halfT14S) inTransit = true;
          if (site === null || e.sky === null) {
            // Space: no air mass, the stated noise, no weather (one "night" per transit, never drawn).
            samples.push({ t, epoch: k, site: 0, nightKey: `space:${k}`, airmass: NaN, sigma: stated });
            continue;
          }
          const utc = e.midUtcS + off;
          const X = airmassKastenYoung(e.sky.targetAltitude(utc, site) / DEG);
          // Local mean solar time from J2000.0 (12:00 UTC): a night is one local noon-to-noon day.
          const night = Math.floor((utc + lonS) / DAY_S);
          samples.push({ t, epoch: k, site: j, nightKey: `${j}:${night}`, airmass: X, sigma: ground ? groundSigmaAtAirmass(ground, exp, cad, X, site.altitudeM) : stated });
        }
      }
      if (inTransit) seen[j]++;
    }
  }
  samples.sort((a, b) => a.t - b.t || a.site - b.site);
  const n = samples.length;
  const plan: ObservingPlan = {
    firstEpoch: first,
    epochs: obs.epochs.length,
    halfWindowS: obs.halfT14S + obs.baselineS,
    timeS: new Float64Array(n),
    epoch: new Int32Array(n),
    site: new Int32Array(n),
    night: new Int32Array(n),
    nights: 0,
    airmass: new Float64Array(n),
    sigma: new Float64Array(n),
    sigmaVaries: false,
    transitsSeenPerSite: seen,
  };
  const nightIndex = new Map<string, number>();
  samples.forEach((p, i) => {
    plan.timeS[i] = p.t;
    plan.epoch[i] = p.epoch;
    plan.site[i] = p.site;
    plan.airmass[i] = p.airmass;
    plan.sigma[i] = p.sigma;
    let idx = nightIndex.get(p.nightKey);
    if (idx === undefined) {
      idx = nightIndex.size;
      nightIndex.set(p.nightKey, idx);
    }
    plan.night[i] = idx;
  });
  plan.nights = nightIndex.size;
  for (let i = 1; i < n && !plan.sigmaVaries; i++) if (plan.sigma[i] !== plan.sigma[0]) plan.sigmaVaries = true;
  return plan;
}
