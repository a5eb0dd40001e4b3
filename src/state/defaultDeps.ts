import { analysePlan } from '../core/analysePlan';
import { validatePlan } from '../core/validatePlan';
import { EXAMPLE_PLANS } from '../io/examplePlans';
import { parsePlanText, serializePlan } from '../io/planFile';
import { decodePlanFromLink, encodePlanForLink } from '../io/shareLink';
import { loadPageEngines } from './pageEngines';
import type { GridRunner, MeanwardDeps, PlannedProcedureRunner, SimulationRunner } from './deps';

/** The browser's localStorage (or this tab's sessionStorage), or null when it is blocked (some private modes). */
function browserStorage(which: 'localStorage' | 'sessionStorage' = 'localStorage'): MeanwardDeps['storage'] {
  try {
    const s = globalThis[which];
    if (!s) return null;
    s.getItem('meanward.probe');
    return s;
  } catch {
    return null;
  }
}

/** The real dependencies: core, io, and (when given) the worker pool's single-run and grid runners. */
export function defaultDeps(
  simulation: SimulationRunner | null,
  plannedProcedure: PlannedProcedureRunner | null = null,
  grid: GridRunner | null = null,
): MeanwardDeps {
  return {
    validatePlan,
    analysePlan,
    loadEngines: loadPageEngines,
    simulation,
    grid,
    plannedProcedure,
    storage: browserStorage(),
    session: browserStorage('sessionStorage'),
    examples: EXAMPLE_PLANS,
    parsePlanText,
    serializePlan,
    encodePlanForLink,
    decodePlanFromLink,
  };
}
