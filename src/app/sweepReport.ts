/**
 * Report assembly: computes what the sweep page shows beyond the cells (the
 * physical boundaries of the base scenario and the example cells, which
 * re-simulate realization 0 of chosen cells) and renders the page with the
 * pure renderer report/sweepReport.ts.
 */
import { checkScenarioHash, renderSweepPage, type SweepPageInput } from '../report/sweepReport.js';
import { computeExampleCells } from './exampleCells.js';
import { physicalBoundaries } from './physicalBoundaries.js';
import { campaignCalendar } from './campaignCalendar.js';

export interface SweepReportInput extends Omit<SweepPageInput, 'examples' | 'boundaries' | 'calendar'> {
  /** Example cells; computed from the scenario when omitted (pass [] for none). */
  examples?: SweepPageInput['examples'];
}

/** The self-contained HTML report of a sweep (see report/sweepReport.ts). */
export function renderSweepReport(input: SweepReportInput): string {
  checkScenarioHash(input.meta, input.scenario);
  const scenarioDoc = input.scenario ?? null;
  const boundaries = physicalBoundaries(scenarioDoc);
  const cells = [...input.cells].sort((a, b) => a.index - b.index);
  const examples = input.examples ?? (scenarioDoc !== null ? computeExampleCells(scenarioDoc, input.meta, cells) : []);
  return renderSweepPage({ ...input, examples, boundaries, calendar: campaignCalendar(scenarioDoc) });
}
