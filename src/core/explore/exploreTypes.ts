import type { AnalysisId, Plan } from '../plan';

/**
 * The design explorer's shared types: a grid of plan variants, one or two
 * inputs varied over ranges, each cell simulated (src/sim) beside its closed
 * form (src/core). The functions that fill them live beside this file
 * (see docs/explorer.md); the page, the PDF and `meanward explore` all read
 * these shapes, never recompute them.
 */

/** A plan input the explorer can vary. Which ones apply depends on the plan's design (exploreInputs). */
export type ExploreInput =
  | 'reliability'
  | 'caliper'
  | 'ratio'
  | 'programmePool'
  | 'comparisonPool'
  | 'groupGap'
  | 'cutOff'
  | 'clusterSize';

/** One varied input: `steps` evenly spaced values from `from` to `to` inclusive (steps ≥ 2; whole-number inputs rounded). */
export interface ExploreAxis {
  input: ExploreInput;
  from: number;
  to: number;
  steps: number;
}

/** What to explore: one or two axes, the analysis judged, and the simulation size of every cell. */
export interface ExploreSpec {
  axes: [ExploreAxis] | [ExploreAxis, ExploreAxis];
  /** The analysis whose artefact is mapped (default: the design's headline analysis). */
  analysisId: AnalysisId;
  /** Replications per cell. */
  replications: number;
  /** Seed of every cell (the same seed in every cell: common random numbers, so neighbouring cells differ by the input, not by chance). */
  seed: number;
}

/** One cell of the grid before it is simulated. */
export interface ExploreCell {
  /** Row-major index: axis 0 varies slowest. */
  index: number;
  /** The value of each axis in this cell, in axis order. */
  values: number[];
  /** The variant plan (valid), or null when the inputs make an impossible plan. */
  plan: Plan | null;
  /** Why the variant is impossible (plain words), when plan is null. */
  problem?: string;
  /** The closed form's regression artefact as a share of the hoped-for effect (signed), when plan is valid. */
  closedFormShare?: number;
}

/** One cell with its simulation's figures (everything from src/sim results, through the core's cell summary). */
export interface ExploreCellSummary extends ExploreCell {
  status: 'pending' | 'done' | 'failed' | 'impossible';
  /** Simulated regression artefact (mean estimate − effect), points, with its Monte Carlo SE. */
  artefact?: number;
  artefactMCSE?: number;
  /** Simulated artefact ÷ the hoped-for effect (signed), with its Monte Carlo SE. */
  artefactShare?: number;
  artefactShareMCSE?: number;
  /** Share of the programme pool discarded by matching (0 for analyses without matching). */
  discardedShare?: number;
  /** Simulated power (rejection rate at the hoped-for effect) with its Monte Carlo SE. */
  power?: number;
  powerMCSE?: number;
  /** Share of replications significant in the direction opposite to the hoped-for effect (counted inside `power`), with its Monte Carlo SE. */
  wrongSignRate?: number;
  wrongSignRateMCSE?: number;
  /** Whether the cell's artefact is tolerable by the plan's own rule, and the plain reason. */
  tolerable?: boolean;
  tolerableReason?: string;
  /** When status is 'failed': the engine's message. */
  failure?: string;
}

/** A whole exploration: the base plan, the spec and every cell. */
export interface ExploreResult {
  plan: Plan;
  spec: ExploreSpec;
  cells: ExploreCellSummary[];
}
