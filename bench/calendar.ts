/**
 * Transit calendar: ten years of a 13.8-day planet's transits for three
 * sites (the demo system, sites spread in longitude). Issue 18's goal is
 * under 100 ms.
 */
import { readFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { parseScenarioText } from '../src/scenario/loadScenario.js';
import { transitCalendar } from '../src/sky/calendar.js';
import { median, type BenchMedian } from './measure.js';

export function benchCalendar(repeats = 5, scenarioPath = 'scenarios/demo-calendar.yaml'): BenchMedian[] {
  const demo = readFileSync(scenarioPath, 'utf8');
  const text = demo.slice(0, demo.indexOf('\nsite:')) + `
site:
  - {name: A, latitude: -30.17, longitude: -70.80, altitude: 2400}
  - {name: B, latitude: 28.76, longitude: -17.88, altitude: 2300}
  - {name: C, latitude: -31.27, longitude: 149.06, altitude: 1150}
target: {ra: "08:41:12.5", dec: "-12:33:10"}
campaign: {start: 2027-01-01, end: 2036-12-31}
`;
  const s = parseScenarioText(text, 'bench calendar');
  let transits = transitCalendar(s).network_counts.transits; // warm-up
  const ms: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const t0 = performance.now();
    transits = transitCalendar(s).network_counts.transits;
    ms.push(performance.now() - t0);
  }
  return [{ label: `calendar, ten years (${transits} transits) × 3 sites; goal < 100 ms`, median: median(ms), unit: 'ms', repeats }];
}
