/**
 * The calendar's observable stretches as numbers, for the simulation: for
 * every transit epoch of the campaign (the same epochs, windows, limits and
 * sky samples as `transitCalendar`, calendar.ts) and every site, the
 * stretches of the window (first contact − baseline to last contact +
 * baseline) in which the Sun is low enough and the target's air mass within
 * the limit, as offsets in seconds from the transit's geocentric mid-time.
 * The epoch's `EpochSky` is returned with it, so that a caller can evaluate
 * the target's altitude (air mass) at each exposure.
 *
 * A space instrument (scenario `visibility`) has no site: each epoch then
 * holds one list of stretches, the visible ones of its pattern on the
 * BJD_TDB axis (visibilityPattern.ts), the same as its calendar, and no sky.
 *
 * Pure: a function of the Scenario alone.
 */
import { scenarioDurations } from '../physics/transitDuration.js';
import { requireCalendarBlocks } from '../scenario/requireSky.js';
import type { Scenario, SiteSpec, VisibilitySpec } from '../scenario/types.js';
import { visibleStretches } from './visibilityPattern.js';
import { altitudeForAirmass } from './airmass.js';
import { bjdTdbToUtc } from './barycentric.js';
import { approximateUtcOfBjd, calendarBaselineS, campaignEpochRange, MAX_CALENDAR_TRANSITS, observableIntervals } from './calendar.js';
import { EpochSky } from './skyPosition.js';
import { DAY_S } from '../physics/constants.js';
import { InputError } from '../scenario/errors.js';

const DEG = Math.PI / 180;

export interface EpochObservability {
  /** Calendar epoch n (mid-time t0 + nP, BJD_TDB). */
  epoch: number;
  /** Geocentric UTC of the mid-time, s since J2000.0 (calendar.ts time axis). */
  midUtcS: number;
  /** The epoch's sky (air mass at each exposure); null for a space instrument. */
  sky: EpochSky | null;
  /** Per site (in the scenario's order; one list for a space instrument): observable stretches [start, end], s from midUtcS, in time order. */
  intervals: Array<Array<[number, number]>>;
}

export interface CampaignObservability {
  /** The ground sites; empty for a space instrument. */
  sites: SiteSpec[];
  /** The space instrument's pattern; null for ground sites. */
  visibility: VisibilitySpec | null;
  /** Every epoch whose mid-time falls inside the campaign, in order (those with nothing observable included). */
  epochs: EpochObservability[];
  /** Half of first-to-last contact, s, and the baseline on each side used for the windows, s. */
  halfT14S: number;
  baselineS: number;
}

/**
 * Observable stretches of every transit of the campaign at every site. Needs
 * the scenario's site, target and campaign (InputError naming the missing ones).
 */
export function campaignObservability(s: Scenario, source = 'scenario'): CampaignObservability {
  if (s.sky?.visibility) return spaceObservability(s, s.sky.visibility, source);
  const sky = s.sky;
  requireCalendarBlocks(sky, source);
  const { target, campaign, constraints, sites } = sky;
  const { half, baseline, periodD, t0, nLo, nHi } = campaignTransits(s, campaign, source);
  const minAlt = altitudeForAirmass(constraints.airmass) * DEG;
  const epochs: EpochObservability[] = [];
  for (let n = nLo; n <= nHi; n++) {
    const mid = bjdTdbToUtc(t0 + n * periodD, target, null);
    if (mid < campaign.startUtcS || mid > campaign.endUtcS) continue;
    const a = mid - half - baseline;
    const b = mid + half + baseline;
    const epochSky = new EpochSky(a, b, target);
    const intervals = sites.map((site) =>
      observableIntervals(epochSky, site, a, b, constraints.sunAltitudeRad, minAlt).map(([x, y]) => [x - mid, y - mid] as [number, number]),
    );
    epochs.push({ epoch: n, midUtcS: mid, sky: epochSky, intervals });
  }
  return { sites, visibility: null, epochs, halfT14S: half, baselineS: baseline };
}

/** A space instrument's visible stretches of every transit of the campaign (see the header); needs the campaign. */
function spaceObservability(s: Scenario, v: VisibilitySpec, source: string): CampaignObservability {
  const campaign = s.sky!.campaign;
  if (!campaign) throw new InputError([{ path: 'campaign', value: undefined, allowed: 'required with visibility: add e.g. campaign: {start: 2027-01-01, end: 2028-12-31}' }], source);
  const { half, baseline, periodD, t0, nLo, nHi } = campaignTransits(s, campaign, source);
  const epochs: EpochObservability[] = [];
  for (let n = nLo; n <= nHi; n++) {
    const midBjd = t0 + n * periodD;
    const mid = approximateUtcOfBjd(midBjd, s.sky!.target);
    if (mid < campaign.startUtcS || mid > campaign.endUtcS) continue;
    epochs.push({ epoch: n, midUtcS: mid, sky: null, intervals: [visibleStretches(v, midBjd, -half - baseline, half + baseline)] });
  }
  return { sites: [], visibility: v, epochs, halfT14S: half, baselineS: baseline };
}

/**
 * What both kinds of campaign need first: half the first-to-last contact duration and the baseline (s),
 * the period (d), t0 (BJD_TDB) and the epochs the campaign may hold; refuses a planet that does not
 * transit and a campaign with more than MAX_CALENDAR_TRANSITS transits.
 */
function campaignTransits(s: Scenario, campaign: { startUtcS: number; endUtcS: number }, source: string): { half: number; baseline: number; periodD: number; t0: number; nLo: number; nHi: number } {
  const t14 = scenarioDurations(s).t14S;
  if (!(t14 > 0)) throw new InputError([{ path: 'planet', value: undefined, allowed: 'the planet does not transit (no first-to-last contact duration): an observing campaign needs a transit' }], source);
  const periodD = s.planet.periodS / DAY_S;
  const t0 = s.observation.t0BjdTdb;
  const [nLo, nHi] = campaignEpochRange(campaign, t0, periodD);
  if (nHi - nLo + 1 > MAX_CALENDAR_TRANSITS) {
    throw new InputError([{ path: 'campaign', value: undefined, allowed: `holds about ${nHi - nLo + 1} transits; at most ${MAX_CALENDAR_TRANSITS}: shorten the campaign` }], source);
  }
  return { half: t14 / 2, baseline: calendarBaselineS(s, t14), periodD, t0, nLo, nHi };
}
