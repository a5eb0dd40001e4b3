import type { StateCreator } from 'zustand';
import type { Plan } from '../core/plan';
import type { PilotReader } from '../pilot/pilotClient';
import type { PessimisticPlanResult } from '../pilot/pessimisticPlan';
import type { PilotPlanUpdateOptions } from '../pilot/pilotPlanUpdate';
import type { PilotTableSummary } from '../pilot/pilotWorkerProtocol';
import type {
  AppliedPilotField,
  Delimiter,
  PilotEstimates,
  PilotOffer,
  PilotPlanUpdate,
  PilotReliabilitySource,
  SkippedPilotField,
} from '../pilot/types';
import type { DraftStorage } from './deps';
import type { MeanwardState } from './store';

/** What the buttons would do to the current plan. */
export interface PilotPreview {
  update: PilotPlanUpdate;
  pessimistic: PessimisticPlanResult;
}

/** Where the pilot panel is: no file, reading, choosing columns, estimating, estimates shown. */
export type PilotStatus = 'empty' | 'reading' | 'mapping' | 'estimating' | 'estimated';

/** How the file is read; 'auto' = detected. */
export interface PilotReadOptions {
  delimiter: Delimiter | 'auto';
  header: boolean | 'auto';
}

/** The column mapping as chosen on screen ('' = not chosen / none). */
export interface PilotMappingDraft {
  group: string;
  programmeValue: string;
  pretestKind: 'total' | 'items';
  pretestColumn: string;
  itemColumns: string[];
  combine: 'sum' | 'mean';
  retest: string;
  posttest: string;
  /** Item columns to reverse (maximum + minimum − score). */
  reverseColumns: string[];
  /** The items' lowest and highest possible scores, as typed (needed to reverse). */
  scaleMin: string;
  scaleMax: string;
  /** One row per person ('wide') or one row per person per occasion ('long'). */
  layout: 'wide' | 'long';
  idColumn: string;
  occasionColumn: string;
  pretestOccasion: string;
  retestOccasion: string;
  posttestOccasion: string;
}

/** A bad file or mapping, as shown: the message names the column or row. */
export interface PilotProblem {
  stage: 'read' | 'map' | 'estimate' | 'apply';
  message: string;
  column?: string;
  row?: number;
}

/** What the last "Use these values" wrote into the plan and what it left out. */
export interface PilotApplyReport {
  applied: AppliedPilotField[];
  skipped: SkippedPilotField[];
  /** True when the reliability was set to the lower end of its interval. */
  pessimistic: boolean;
}

export interface PilotState {
  status: PilotStatus;
  fileName: string | null;
  summary: PilotTableSummary | null;
  readOptions: PilotReadOptions;
  mapping: PilotMappingDraft;
  /** True when the mapping was restored from earlier in this session. */
  mappingRemembered: boolean;
  estimates: PilotEstimates | null;
  problem: PilotProblem | null;
  lastApply: PilotApplyReport | null;
  /** Which reliability goes into the plan; null = the recommended one (pilotReliabilityOptions). */
  reliabilitySource: PilotReliabilitySource | null;
  /** Questions left by the last "Use these values" (e.g. the corrected ANCOVA's assumed reliability). */
  offers: PilotOffer[];
  /** The latest status in plain words, for the panel's live region. */
  announcement: string;
}

export interface PilotSlice {
  pilot: PilotState;
  /** Read a pilot file (CSV or TSV; a Blob or its text). The plan is not touched. */
  readPilotFile(file: Blob | string, fileName: string): Promise<void>;
  /** Change how the file is read (delimiter, header) and read it again. */
  setPilotReadOptions(options: Partial<PilotReadOptions>): Promise<void>;
  /** Change the column mapping (the shown estimates are dropped: they belonged to the old mapping). */
  setPilotMapping(patch: Partial<PilotMappingDraft>): void;
  /** Estimate from the file with the current mapping. */
  estimateFromPilot(): Promise<void>;
  /** Write the estimates into the plan (through the draft, so validation, autosave and results follow). */
  applyPilotEstimates(): void;
  /** As applyPilotEstimates, with the reliability at the lower end of its confidence interval. */
  applyPessimisticPilotEstimates(): void;
  /**
   * What "Use these values" would write into the current plan (and the
   * pessimistic reliability), without writing it; null before estimates.
   */
  previewPilotUpdate(): PilotPreview | null;
  /** Forget the file and its estimates. */
  clearPilot(): void;
  /** Choose which reliability "Use these values" writes (alpha or test–retest). */
  setPilotReliabilitySource(source: PilotReliabilitySource): void;
  /** Accept a question left by "Use these values" (writes that one value through the draft). */
  acceptPilotOffer(path: string): void;
  /** Leave the value as it is and drop the question. */
  dismissPilotOffer(path: string): void;
}

/** The pure functions the slice needs from src/pilot, and where it keeps the session's mappings. */
export interface PilotDeps {
  reader: PilotReader;
  planUpdate(plan: Plan, estimates: PilotEstimates, options?: PilotPlanUpdateOptions): PilotPlanUpdate;
  pessimisticPlan(plan: Plan): PessimisticPlanResult;
  /** Accept an offer (applyPilotOffer); optional for tests that never accept one. */
  applyOffer?(plan: Plan, offer: PilotOffer): Plan;
  /** window.sessionStorage in the browser (null: mappings are kept in the store only). */
  session: DraftStorage | null;
}

/** The column mapping with nothing chosen. */
export const EMPTY_MAPPING: PilotMappingDraft = {
  group: '',
  programmeValue: '',
  pretestKind: 'total',
  pretestColumn: '',
  itemColumns: [],
  combine: 'sum',
  reverseColumns: [],
  scaleMin: '',
  scaleMax: '',
  layout: 'wide',
  idColumn: '',
  occasionColumn: '',
  pretestOccasion: '',
  retestOccasion: '',
  posttestOccasion: '',
  retest: '',
  posttest: '',
};

/** The pilot panel's state before any file. */
export const initialPilot = (): PilotState => ({
  status: 'empty',
  fileName: null,
  summary: null,
  readOptions: { delimiter: 'auto', header: 'auto' },
  mapping: EMPTY_MAPPING,
  mappingRemembered: false,
  estimates: null,
  problem: null,
  lastApply: null,
  reliabilitySource: null,
  offers: [],
  announcement: '',
});


/** The pilot slice's actions (src/state/pilotSlice.ts), built once per store. */
export type PilotActions = Omit<PilotSlice, 'pilot'>;

/** Builds a store's pilot actions from the injected pilot deps (merged over the defaults) and zustand's set/get. */
export type PilotActionsFactory = (
  overrides: Partial<PilotDeps>,
  set: Parameters<StateCreator<MeanwardState, [], [], PilotSlice>>[0],
  get: () => MeanwardState,
) => PilotActions;

let installed: PilotActionsFactory | null = null;

/**
 * Install the pilot reader's actions. src/state/pilotSlice.ts does this when it is imported: the
 * pilot reader's body (src/ui/PilotBody.tsx, fetched when "Estimate from pilot data" is opened)
 * imports it, and so do tests; the first screen carries only this state module, not the reader's
 * client, the mapping guesses nor the plan update (src/pilot/pilotPlanUpdate.ts).
 */
export function installPilotActions(factory: PilotActionsFactory): void {
  installed = factory;
}

/**
 * The pilot slice: its state from the start, and actions that run the installed implementation
 * (built on first use, over `overrides`). An action called before the implementation was installed
 * is a wiring fault and throws, naming the module to import.
 */
export const createPilotSlice =
  (overrides: Partial<PilotDeps> = {}): StateCreator<MeanwardState, [], [], PilotSlice> =>
  (set, get) => {
    let actions: PilotActions | null = null;
    const impl = (): PilotActions => {
      if (!actions) {
        if (!installed) throw new Error('The pilot reader\'s actions are not loaded: import src/state/pilotSlice.ts (the pilot reader\'s body does) before using them.');
        actions = installed(overrides, set, get);
      }
      return actions;
    };
    return {
      pilot: initialPilot(),
      readPilotFile: (file, fileName) => impl().readPilotFile(file, fileName),
      setPilotReadOptions: (options) => impl().setPilotReadOptions(options),
      setPilotMapping: (patch) => impl().setPilotMapping(patch),
      estimateFromPilot: () => impl().estimateFromPilot(),
      applyPilotEstimates: () => impl().applyPilotEstimates(),
      applyPessimisticPilotEstimates: () => impl().applyPessimisticPilotEstimates(),
      previewPilotUpdate: () => impl().previewPilotUpdate(),
      clearPilot: () => impl().clearPilot(),
      setPilotReliabilitySource: (source) => impl().setPilotReliabilitySource(source),
      acceptPilotOffer: (path) => impl().acceptPilotOffer(path),
      dismissPilotOffer: (path) => impl().dismissPilotOffer(path),
    };
  };
