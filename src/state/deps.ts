import type { AnalyticResults } from '../core/analyticResults';
import type { Plan } from '../core/plan';
import type { SimulationResult } from '../sim/types';
import type { RunTimeEstimate } from '../sim/estimateRunSeconds';
import type { PlanCheck } from '../core/validatePlan';
import type { PlannedProcedureEstimates } from '../core/plannedProcedure';
import type { EngineName } from '../core/engineRegistry';

/** Computes the planned procedure's quick figures off the main thread (src/sim/quickFiguresClient). */
export interface PlannedProcedureRunner {
  /** Resolves with the estimates, or null when a newer request replaced this one or the run failed. */
  estimate(plan: Plan): Promise<PlannedProcedureEstimates | null>;
}

/** Outcome of checking a candidate plan (src/core/validatePlan). */
export type { PlanCheck };

/** Runs the Monte Carlo simulation off the main thread (src/sim/simulationClient). */
export interface SimulationRunner {
  /**
   * Resolves with the result; rejects when cancelled or on failure. progress is in [0, 1].
   * options.maxSeconds: stop after the timed pilot when its estimate exceeds this, rejecting with an
   * error whose `reason` is 'too-long' and whose `estimate` is the estimate; options.onEstimate receives
   * the estimate early in every run. A rejection with reason 'stalled' means the worker went silent.
   */
  run(
    plan: Plan,
    onProgress: (progress: number) => void,
    options?: { maxSeconds?: number; onEstimate?: (estimate: RunTimeEstimate) => void },
  ): Promise<SimulationResult>;
  cancel(): void;
}

/** One grid cell's simulation job for the GridRunner. */
export interface GridJob {
  plan: Plan;
  replications: number;
  seed: number;
}

/**
 * Runs many simulations at once (the design explorer's grid cells) on the
 * worker pool (src/sim/pool): each cell whole on one worker, cells in parallel.
 * Each cell's result arrives as it finishes; cancel() stops every cell still
 * running or queued (no further callbacks after it).
 */
export interface GridRunner {
  runGrid(
    jobs: readonly GridJob[],
    handlers: {
      onCellResult(index: number, result: SimulationResult): void;
      onCellError(index: number, message: string): void;
      /** Replications done over all cells ÷ all replications, in [0, 1]. */
      onProgress(share: number): void;
    },
  ): { done: Promise<void>; cancel(): void };
}

/** One built-in example plan (src/io/examplePlans). */
export interface ExamplePlan {
  id: string;
  name: string;
  description: string;
  plan: Plan;
}

/** Storage the store autosaves into (window.localStorage in the browser). */
export type DraftStorage = Pick<Storage, 'getItem' | 'setItem' | 'removeItem'>;

/**
 * Everything the store needs from the rest of the program, injected so the
 * store can be tested as plain logic. Parsers never throw: they return a
 * PlanCheck whose problems explain to a researcher what is wrong.
 */
export interface MeanwardDeps {
  validatePlan(input: unknown): PlanCheck;
  /** Closed forms; with `planned`, the matching-based analyses from the quick simulation of the planned procedure. */
  analysePlan(plan: Plan, planned?: PlannedProcedureEstimates): AnalyticResults;
  /**
   * Load engines a plan needs that are not registered yet (src/core/engineRegistry.ts); resolves
   * once they are. The page passes its dynamic import (src/state/pageEngines.ts); absent (tests,
   * which register every engine in test/setup.ts): a plan needing a missing engine is an error.
   */
  loadEngines?: (names: readonly EngineName[]) => Promise<void>;
  simulation: SimulationRunner | null;
  /** Runs the design explorer's grid cells in parallel; null or absent: the explorer cannot simulate (tests, no Worker). */
  grid?: GridRunner | null;
  /** The quick figures for the planned procedure; null shows the closed forms only (tests, no Worker). */
  plannedProcedure?: PlannedProcedureRunner | null;
  /** Where the browser-wide "last draft" is kept (window.localStorage); null: not kept. */
  storage: DraftStorage | null;
  /** Where this tab's own draft is kept (window.sessionStorage); null or absent: only the shared draft. */
  session?: DraftStorage | null;
  /**
   * Run `fn` once after `ms` milliseconds and return a function that cancels it
   * (default: setTimeout). Used for "typing has paused"; tests pass a manual clock.
   */
  schedule?: (fn: () => void, ms: number) => () => void;
  examples: readonly ExamplePlan[];
  /** Parse and check the text of a plan file. */
  parsePlanText(text: string): PlanCheck;
  /** Write a plan file's text. */
  serializePlan(plan: Plan): string;
  /** The URL fragment that carries a plan ("#plan=…"). */
  encodePlanForLink(plan: Plan): string;
  /** Read a plan back from a fragment or whole address, and check it. */
  decodePlanFromLink(hashOrUrl: string): PlanCheck;
}
