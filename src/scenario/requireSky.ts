/** The check that a scenario holds the sky blocks the calendar needs (site, target, campaign). */
import { InputError } from './errors.js';
import type { CampaignSpec, SkySpec, TargetSpec } from './types.js';

/** The blocks `moonsieve calendar` needs; an InputError naming every missing one. */
export function requireCalendarBlocks(sky: SkySpec | undefined, source: string): asserts sky is SkySpec & { target: TargetSpec; campaign: CampaignSpec } {
  const missing: Array<[string, string]> = [];
  if (!sky || sky.sites.length === 0) missing.push(['site', 'site: {latitude: -30.2 deg, longitude: -70.8 deg, altitude: 2400 m} (or a list of sites)']);
  if (!sky || !sky.target) missing.push(['target', 'target: {ra: "08:41:12.5", dec: "-12:33:10"}']);
  if (!sky || !sky.campaign) missing.push(['campaign', 'campaign: {start: 2027-01-01, end: 2028-12-31}']);
  if (missing.length === 0) return;
  throw new InputError(missing.map(([path, example]) => ({ path, value: undefined, allowed: `required by calendar: add e.g. ${example}` })), source);
}
