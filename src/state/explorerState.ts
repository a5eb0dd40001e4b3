import type { StateCreator } from 'zustand';
import type { ExploreInput, ExploreResult } from '../core/explore/exploreTypes';
import type { AnalysisId } from '../core/plan';
import type { MeanwardDeps } from './deps';
import type { MeanwardState } from './store';

/** One axis of the explorer's form, as typed. An empty input means "not used" (only the second axis may be unused). */
export interface ExploreAxisDraft {
  input: ExploreInput | '';
  from: string;
  to: string;
  steps: string;
}

/** The explorer's form as typed: nothing the researcher types is lost, even when it is not a number. */
export interface ExplorerDraft {
  axes: [ExploreAxisDraft, ExploreAxisDraft];
  /** '' = the design's headline analysis. */
  analysisId: AnalysisId | '';
  replications: string;
  /**
   * The ranges typed for each input, kept when the researcher switches an axis to
   * another input, so switching back brings them back.
   */
  typedRanges: Partial<Record<ExploreInput, { from: string; to: string; steps: string }>>;
}

/** A field of the explorer's form: 'axis0.from', 'axis1.steps', 'replications', 'analysisId', or '' for the spec as a whole. */
export interface ExplorerProblem {
  field: string;
  message: string;
}

export type ExplorerStatus = 'idle' | 'running' | 'done' | 'cancelled' | 'error';

export interface ExplorerState {
  draft: ExplorerDraft;
  problems: ExplorerProblem[];
  status: ExplorerStatus;
  /** Replications done over all cells ÷ all replications of the grid, in [0, 1]. */
  progress: number;
  /** The grid of the latest run, its cells filled in as they finish (kept after a cancel, pending cells marked). */
  result: ExploreResult | null;
  /** With status 'error': the message. */
  error: string | null;
  /** A message about the last candidate plan made from a cell (shown and announced in the panel). */
  message: string | null;
}

export interface ExplorerSlice {
  explorer: ExplorerState;
  /** Fill the first axis with the first input that applies to the plan and its default range, when the form is still empty. */
  prepareExplorer: () => void;
  /** Choose the input of an axis ('' to stop using the second axis); the range typed for it before (or its default) comes back. */
  setExplorerInput: (axis: 0 | 1, input: ExploreInput | '') => void;
  setExplorerAxisField: (axis: 0 | 1, field: 'from' | 'to' | 'steps', text: string) => void;
  setExplorerField: (field: 'replications' | 'analysisId', text: string) => void;
  /** Check the form, build the grid and send its possible cells to the grid runner; cells fill in as they finish. */
  startExplore: () => Promise<void>;
  /** Stop the grid: cells not done stay pending (shown as not run). */
  cancelExplore: () => void;
  /** Add the cell's variant plan as a named candidate plan and put it in the comparison. */
  makeCandidateFromCell: (index: number) => void;
}

/** Default replications per cell: enough for a first look, small enough to stay quick. */
export const EXPLORER_DEFAULT_REPLICATIONS = 1000;

/** An axis of the explorer's form with nothing chosen. */
export const emptyAxis = (): ExploreAxisDraft => ({ input: '', from: '', to: '', steps: '' });

export function emptyExplorerDraft(): ExplorerDraft {
  return { axes: [emptyAxis(), emptyAxis()], analysisId: '', replications: String(EXPLORER_DEFAULT_REPLICATIONS), typedRanges: {} };
}

/** The explorer's actions (src/state/explorerSlice.ts), built once per store. */
export type ExplorerActions = Omit<ExplorerSlice, 'explorer'>;

/** Builds a store's explorer actions from its deps and zustand's set/get. */
export type ExplorerActionsFactory = (
  deps: MeanwardDeps,
  set: Parameters<StateCreator<MeanwardState, [], [], ExplorerSlice>>[0],
  get: () => MeanwardState,
) => ExplorerActions;

let installed: ExplorerActionsFactory | null = null;

/**
 * Install the explorer's actions. src/state/explorerSlice.ts does this when it is imported: the
 * explorer panel's chunk imports it (the panel is the only caller of these actions), and so do
 * tests; the first screen carries only this state module, not the explorer's core
 * (src/core/explore) nor its actions.
 */
export function installExplorerActions(factory: ExplorerActionsFactory): void {
  installed = factory;
}

/**
 * The explorer's slice: its state from the start, and actions that run the installed
 * implementation (built on first use). An action called before the implementation was installed
 * is a wiring fault and throws, naming the module to import.
 */
export const createExplorerSlice =
  (deps: MeanwardDeps): StateCreator<MeanwardState, [], [], ExplorerSlice> =>
  (set, get) => {
    let actions: ExplorerActions | null = null;
    const impl = (): ExplorerActions => {
      if (!actions) {
        if (!installed) throw new Error('The design explorer\'s actions are not loaded: import src/state/explorerSlice.ts (the explorer panel does) before using them.');
        actions = installed(deps, set, get);
      }
      return actions;
    };
    return {
      explorer: { draft: emptyExplorerDraft(), problems: [], status: 'idle', progress: 0, result: null, error: null, message: null },
      prepareExplorer: () => impl().prepareExplorer(),
      setExplorerInput: (axis, input) => impl().setExplorerInput(axis, input),
      setExplorerAxisField: (axis, field, text) => impl().setExplorerAxisField(axis, field, text),
      setExplorerField: (field, text) => impl().setExplorerField(field, text),
      startExplore: () => impl().startExplore(),
      cancelExplore: () => impl().cancelExplore(),
      makeCandidateFromCell: (index) => impl().makeCandidateFromCell(index),
    };
  };
