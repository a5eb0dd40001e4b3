import { analyseSelectionPlan } from './analyseSelectionPlan';

/**
 * The selection designs' closed forms as analysePlan reaches them through the engine registry
 * (src/core/engineRegistry.ts), registered by src/core/allEngines.ts. The selection model and the
 * derived groups (selectionModel, derivedGroups) stay on the first screen because validation and
 * the form need them.
 */
export const selectionEngine = { analyseSelectionPlan };

export type SelectionEngine = typeof selectionEngine;
