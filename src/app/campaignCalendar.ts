/**
 * The calendar a sweep page shows: every usable epoch of the base scenario's
 * campaign (src/budget/nightsBudget.ts with no count), when the scenario
 * gives site, target and campaign (or a space instrument's visibility and
 * campaign); null otherwise.
 */
import { nightsPlan, type NightsPlan } from '../budget/nightsBudget.js';
import { parseScenario } from '../scenario/parseScenario.js';

export function campaignCalendar(scenarioDoc: unknown): NightsPlan | null {
  if (scenarioDoc === null || scenarioDoc === undefined || typeof scenarioDoc !== 'object') return null;
  const doc = { ...(scenarioDoc as Record<string, unknown>) };
  delete doc.sweep;
  delete doc.budget;
  const s = parseScenario(doc, 'scenario');
  const sky = s.sky;
  if (!sky || !sky.campaign) return null;
  if (!sky.visibility && (sky.sites.length === 0 || !sky.target)) return null;
  return nightsPlan(s, null);
}
