/** The observing budget: public API of src/budget/. */
export { planBudget, evaluationText } from '../app/planBudget.js';
export { readBudgetFlags, resolveBudgetTarget, type BudgetFlags } from './budgetSpec.js';
export { formatBudget } from './formatBudget.js';
export { renderBudgetPage, budgetFigure } from '../report/budgetPage.js';
export { searchCheapestPassing, type MonotoneSearchOutcome } from './monotoneSearch.js';
export type {
  BudgetTarget, BudgetResult, BudgetAnswer, BudgetEvaluation, BudgetSolve, BudgetChannel, HabitableTarget, PlanBudgetOptions,
  BudgetForecastCurve, BudgetTargetMoon, BudgetQuantityInfo, ResolvedBudgetTarget,
} from './budgetTypes.js';
export { budgetToJson, BUDGET_SCHEMA, type BudgetJson } from './budgetJson.js';
export { nightsPlan, budgetObservability, rampCoverage, WHOLE_TRANSITS_ASSUMED, type NightsPlan, type NightBooking, type Observability } from './nightsBudget.js';
export { observingPlanToJson, type ObservingPlanJson } from './nightsJson.js';
