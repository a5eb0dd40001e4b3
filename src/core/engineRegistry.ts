import type { CovariateEngine } from './multivariate/covariateEngine';
import type { ClusterEngine } from './clusters/clusterEngine';
import type { SelectionEngine } from './design/selectionEngine';
import type { Plan } from './plan';
import { isClusterDesign, isSelectionDesign } from './design/studyDesign';
import { usesCovariateModel } from './multivariate/covariateUse';

/**
 * The engine registry: the closed forms for covariates (src/core/multivariate), clusters
 * (src/core/clusters) and selection rules (src/core/design) register themselves here, and
 * analysePlan and rankRemedies look the engine for a plan's design up through `engine(name)`
 * instead of importing it. That keeps those engines out of the page's first screen: the page
 * loads them with one dynamic import when a plan needs one (src/state/pageEngines.ts); everything
 * else (CLI, workers, tests, scripts, the PDF) registers all of them at once by importing
 * src/core/allEngines.ts. An engine that was never registered is an error naming it
 * (MissingEngineError), never a silent fallback to another design's formulas.
 *
 * validatePlan asks the registry too, for the covariate checks and the cluster model's checks: a
 * plan that needs one of them is not checked without it (MissingEngineError, never the catch-all
 * message), and the page's store waits for the engine and checks it then. What stays outside the
 * registry, on the first screen: the small design seam (studyDesign), which engine a plan needs
 * (covariateUse.ts), and the selection model with its derived groups (selectionModel,
 * derivedGroups), which the form and the draft use directly for a selection plan's group sizes.
 *
 * To add an engine: a name in EngineName and its type in Engines, one object of functions in its
 * folder (like multivariate/covariateEngine.ts), one registerEngine call in allEngines.ts, and a
 * case in enginesForPlan.
 */
export interface Engines {
  covariates: CovariateEngine;
  clusters: ClusterEngine;
  selection: SelectionEngine;
}

export type EngineName = keyof Engines;

export const ENGINE_NAMES: readonly EngineName[] = ['covariates', 'clusters', 'selection'];

/** Plain words for each engine, for messages. */
const ENGINE_WORDS: Record<EngineName, string> = {
  covariates: 'covariates (src/core/multivariate)',
  clusters: 'clusters (src/core/clusters)',
  selection: 'selection rules (src/core/design)',
};

/** Thrown when a plan needs an engine that was never registered: a wiring fault, never the plan's. */
export class MissingEngineError extends Error {
  readonly engine: EngineName;
  constructor(name: EngineName) {
    super(
      `The closed forms for ${ENGINE_WORDS[name]} are not registered ("${name}" engine). Import src/core/allEngines.ts before analysing such a plan (the page loads it on demand).`,
    );
    this.name = 'MissingEngineError';
    this.engine = name;
  }
}

const registered: Partial<Engines> = {};

/** Register an engine (allEngines.ts does this for all of them). Registering the same object again is harmless. */
export function registerEngine<K extends EngineName>(name: K, impl: Engines[K]): void {
  registered[name] = impl;
}

/** The registered engine; throws MissingEngineError (naming it) when it was never registered. */
export function engine<K extends EngineName>(name: K): Engines[K] {
  const impl = registered[name];
  if (!impl) throw new MissingEngineError(name);
  return impl as Engines[K];
}

/** True when the engine is registered. */
export function isEngineRegistered(name: EngineName): boolean {
  return registered[name] !== undefined;
}

/**
 * Take an engine out of the registry again. Only for tests that check what happens before an
 * engine arrives (the page's on-demand loading); production code never unregisters.
 */
export function unregisterEngineForTests(name: EngineName): void {
  delete registered[name];
}

/** The engines analysePlan needs for this (validated) plan: one for a selection rule, clusters or covariates; none for one pretest. */
export function enginesForPlan(plan: Plan): EngineName[] {
  if (isSelectionDesign(plan)) return ['selection'];
  if (isClusterDesign(plan)) return ['clusters'];
  if (usesCovariateModel(plan)) return ['covariates'];
  return [];
}

/** The engines this plan needs that are not registered yet (empty: analysePlan can run now). */
export function missingEngines(plan: Plan): EngineName[] {
  return enginesForPlan(plan).filter((name) => !isEngineRegistered(name));
}
