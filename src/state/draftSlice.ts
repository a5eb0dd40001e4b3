import type { StateCreator } from 'zustand';
import type { AnalyticResults } from '../core/analyticResults';
import type { FieldProvenance, Plan } from '../core/plan';
import { draftToCandidate, planToDraft, setDraftField, type FieldProblem, type PlanDraft, type PretestMode } from './planDraft';
import { canonicalField } from './covariateDraft';
import type { MeanwardDeps } from './deps';
import { samePlan } from './samePlan';
import type { MeanwardState } from './store';
import { plainErrorMessage } from '../core/plainErrorMessage';
import { ICC_PRESETS, type IccPreset } from '../core/clusters/iccPresets';
import { PLAN_LIMITS } from '../core/planSchema';
import { MissingEngineError, missingEngines, type EngineName } from '../core/engineRegistry';

/**
 * The plan being edited: the raw draft, the last valid plan, the problems
 * per field, and the closed-form results. Results are recomputed on every
 * change while the draft is valid; when it is not, the last valid results
 * stay on screen, marked stale.
 */
export interface DraftSlice {
  draft: PlanDraft;
  /** The last draft that passed validation, as a Plan. */
  validPlan: Plan;
  /** Problems in the current draft, all at once; empty when valid. */
  problems: FieldProblem[];
  analytic: AnalyticResults | null;
  /** True when the shown analytic results belong to an earlier plan than the draft. */
  analyticStale: boolean;
  /**
   * True while the draft is valid but not yet adopted as the plan: the
   * researcher is typing, and the results underneath still belong to
   * `validPlan` until the field is committed or typing pauses.
   */
  draftPending: boolean;
  /** Set one field by dotted path (raw text for numbers, booleans and option strings as they are); the plan follows at once. */
  setField(path: string, value: string | boolean): void;
  /**
   * One keystroke into a text field. The draft (and its problems) change at
   * once; a valid result becomes the plan only when the field is committed
   * (commitDraft: blur, Enter) or typing pauses for TYPING_PAUSE_MS, so a
   * half-typed value ("0" on the way to "0.95") is never shown as the last
   * complete plan, and the quick figures are not asked for on every keystroke.
   */
  typeField(path: string, value: string): void;
  /** Adopt the typed draft as the plan now, if it is valid and waiting (blur, Enter). */
  commitDraft(): void;
  /** Switch between entering a reliability and entering an SEM; both texts are kept. */
  setPretestMode(mode: PretestMode): void;
  /**
   * Put a preset ICC (core's ICC_PRESETS) into the pretest or posttest ICC as a
   * starting value, recording where it came from beside the field (typing over
   * it drops that note). An unknown preset id changes nothing.
   */
  applyIccPreset(field: IccField, presetId: string): void;
  /** Replace the whole plan (example, file, link, reset). */
  replacePlan(plan: Plan): void;
  /**
   * Replace the whole draft (restoring an autosave, covariate edits, undo).
   * With how = 'typing' (a keystroke in a matrix cell) a valid draft waits as in typeField.
   */
  replaceDraft(draft: PlanDraft, how?: 'commit' | 'typing'): void;
}

/** The two ICC fields a preset can fill. */
export type IccField = 'clusters.pretestICC' | 'clusters.posttestICC';

/** The note recorded beside an ICC taken from a preset: its label and source (within the plan file's note limit). */
export function iccPresetNote(preset: IccPreset): string {
  const note = `Starting value from a preset: ${preset.label}. Source: ${preset.source}`;
  const max = PLAN_LIMITS.provenanceNoteMaxLength;
  return note.length <= max ? note : `${note.slice(0, max - 1)}\u2026`;
}

/** How long typing must pause before a valid typed draft becomes the plan (ms). */
export const TYPING_PAUSE_MS = 700;

/**
 * Check a draft and, when valid, analyse it. Pure apart from the injected functions.
 * A draft whose checks or closed forms need an engine not registered yet
 * (src/core/engineRegistry.ts) is neither checked nor analysed: the result names the engines to
 * wait for (`waitingFor`), and the store shows its working state until they arrive. Without `deps.loadEngines` that is a wiring fault and throws
 * MissingEngineError (never a figure from another design's formulas).
 */
export function evaluateDraft(
  draft: PlanDraft,
  deps: Pick<MeanwardDeps, 'validatePlan' | 'analysePlan' | 'loadEngines'>,
): { plan: Plan; analytic: AnalyticResults } | { problems: FieldProblem[] } | { waitingFor: EngineName[] } {
  const { candidate: read, problems: readProblems } = draftToCandidate(draft);
  const candidate = withCandidateProvenance(read, draftProvenance(draft));
  let check: ReturnType<MeanwardDeps['validatePlan']>;
  try {
    check = deps.validatePlan(candidate);
  } catch (e) {
    // The covariate or cluster checks are not loaded yet: wait for them rather than guess.
    if (e instanceof MissingEngineError && deps.loadEngines) return { waitingFor: [e.engine] };
    throw e;
  }
  if (!check.ok || readProblems.length > 0) {
    // Keep one message per field: "not a number" first, then the validator's.
    const seen = new Set<string>();
    const problems: FieldProblem[] = [];
    for (const p of [...readProblems, ...(check.ok ? [] : check.problems)]) {
      // A correlation and its mirror cell are one field.
      const key = canonicalField(p.field);
      if (seen.has(key)) continue;
      seen.add(key);
      problems.push(p);
    }
    return { problems };
  }
  const waitingFor = missingEngines(check.plan);
  if (waitingFor.length > 0) {
    if (!deps.loadEngines) throw new MissingEngineError(waitingFor[0]!);
    return { waitingFor };
  }
  try {
    return { plan: check.plan, analytic: deps.analysePlan(check.plan) };
  } catch (e) {
    if (e instanceof MissingEngineError) throw e;
    // Inputs can be valid one by one and still contradict each other
    // (e.g. a pre–post correlation above the square root of the reliability).
    const message = plainErrorMessage(e, ANALYSIS_FAILED);
    return { problems: [{ field: fieldForMessage(message), message }] };
  }
}

/** Shown when the closed forms a plan's design needs could not be fetched (e.g. offline before the page's files were kept). */
export const ENGINES_FAILED =
  'The figures for this kind of plan could not be loaded (the connection may have dropped). Reload the page to try again; nothing you typed is lost.';

/** Shown when checking or analysing the draft fails with program text rather than a plain message. */
const ANALYSIS_FAILED =
  'The figures for this plan could not be computed. Check the values near the ends of their ranges; the last results stay shown and nothing you typed is lost.';

/**
 * evaluateDraft, never throwing: an unexpected failure (a fault of ours, not of
 * the draft) becomes one plain problem, so a bad autosave, link or keystroke
 * can never blank the page; the draft itself is kept as typed.
 */
export function evaluateDraftSafely(
  draft: PlanDraft,
  deps: Pick<MeanwardDeps, 'validatePlan' | 'analysePlan' | 'loadEngines'>,
): ReturnType<typeof evaluateDraft> {
  try {
    return evaluateDraft(draft, deps);
  } catch (e) {
    // A missing engine is a fault in how the program was put together: it fails loudly.
    if (e instanceof MissingEngineError) throw e;
    return { problems: [{ field: '', message: plainErrorMessage(e, ANALYSIS_FAILED) }] };
  }
}

/**
 * Where the draft's values came from (e.g. a pilot file), by dotted plan path.
 * It rides on the draft object, so autosave keeps it; typing into a field
 * drops that field's entry, so a typed value is never credited to a pilot.
 */
export type DraftProvenance = Record<string, FieldProvenance>;

/** The provenance carried by a draft, if any. */
export function draftProvenance(draft: PlanDraft): DraftProvenance | undefined {
  return (draft as PlanDraft & { provenance?: DraftProvenance }).provenance;
}

/** The draft with this provenance (none when empty); the input is not mutated. */
export function withDraftProvenance(draft: PlanDraft, provenance: DraftProvenance | undefined): PlanDraft {
  const { provenance: _dropped, ...rest } = draft as PlanDraft & { provenance?: DraftProvenance };
  return (provenance && Object.keys(provenance).length > 0 ? { ...rest, provenance } : rest) as PlanDraft;
}

/** The candidate plan with the provenance entries of the fields it holds (an SEM-mode plan has no reliability to credit). */
function withCandidateProvenance(candidate: unknown, provenance: DraftProvenance | undefined): unknown {
  if (!provenance) return candidate;
  const at = (path: string) =>
    path.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), candidate);
  const kept = Object.fromEntries(Object.entries(provenance).filter(([path]) => at(path) !== undefined));
  return Object.keys(kept).length > 0 ? { ...(candidate as object), provenance: kept } : candidate;
}

/** Attach a cross-field message to the field a researcher would change. */
function fieldForMessage(message: string): string {
  if (/pre.post correlation/i.test(message)) return 'outcome.prePostCorrelation';
  if (/\bSEM\b/.test(message)) return 'pretest.reliability';
  return '';
}

/** The draft slice, starting from `initial` (with `fallback`'s results underneath when `initial` is not valid). */
export const createDraftSlice =
  (deps: MeanwardDeps, initial: PlanDraft, fallback: Plan): StateCreator<MeanwardState, [], [], DraftSlice> =>
  (set, get) => {
    const schedule =
      deps.schedule ??
      ((fn: () => void, ms: number) => {
        const t = setTimeout(fn, ms);
        return () => clearTimeout(t);
      });
    // A valid typed draft waiting to be adopted, with its results; and the pause timer's cancel.
    let waiting: { draft: PlanDraft; plan: Plan; analytic: AnalyticResults } | null = null;
    let cancelPause: (() => void) | null = null;
    const stopWaiting = () => {
      cancelPause?.();
      cancelPause = null;
      waiting = null;
    };
    /** The new plan and results, keeping the current objects when the plan is the same (no needless recomputation downstream). */
    const adopt = (plan: Plan, analytic: AnalyticResults): Pick<DraftSlice, 'validPlan' | 'analytic'> => {
      const s = get();
      return s?.analytic && samePlan(plan, s.validPlan) ? { validPlan: s.validPlan, analytic: s.analytic } : { validPlan: plan, analytic };
    };
    /**
     * The draft is valid but its design's engine is still loading: ask for it, and when it arrives
     * evaluate the draft again if it is still the one in the form (a newer draft decided for itself).
     * A failed load becomes one plain problem; the draft is kept as typed.
     */
    const awaitEngines = (draft: PlanDraft, how: 'commit' | 'typing', names: EngineName[]): void => {
      void deps.loadEngines!(names).then(
        () => {
          if (get().draft === draft) set(apply(draft, how));
        },
        () => {
          if (get().draft === draft) set({ problems: [{ field: '', message: ENGINES_FAILED }], analyticStale: get().analytic != null, draftPending: false });
        },
      );
    };
    const apply = (draft: PlanDraft, how: 'commit' | 'typing' = 'commit'): Partial<MeanwardState> => {
      stopWaiting();
      const r = evaluateDraftSafely(draft, deps);
      if ('waitingFor' in r) {
        // The working state: the last plan's results stay, marked as about to change (never another design's figures).
        awaitEngines(draft, how, r.waitingFor);
        return { draft, problems: [], analyticStale: false, draftPending: true };
      }
      if ('problems' in r) {
        return { draft, problems: r.problems, analyticStale: get()?.analytic != null, draftPending: false };
      }
      const next = adopt(r.plan, r.analytic);
      if (how === 'commit' || next.validPlan === get().validPlan) {
        return { draft, problems: [], ...next, analyticStale: false, draftPending: false };
      }
      waiting = { draft, plan: r.plan, analytic: r.analytic };
      cancelPause = schedule(() => get().commitDraft(), TYPING_PAUSE_MS);
      return { draft, problems: [], analyticStale: false, draftPending: true };
    };
    // First evaluation: the initial draft, else the fallback plan's results underneath.
    const first = evaluateDraftSafely(initial, deps);
    const base = evaluateDraftSafely(planToDraft(fallback), deps);
    const baseOk = 'plan' in base ? base : null;
    // A restored draft whose engine is still loading: the fallback's results underneath, working until it arrives.
    if ('waitingFor' in first) awaitEngines(initial, 'commit', first.waitingFor);
    const initialState: Pick<DraftSlice, 'draft' | 'validPlan' | 'problems' | 'analytic' | 'analyticStale' | 'draftPending'> =
      'plan' in first
        ? { draft: initial, validPlan: first.plan, problems: [], analytic: first.analytic, analyticStale: false, draftPending: false }
        : 'waitingFor' in first
          ? { draft: initial, validPlan: baseOk ? baseOk.plan : fallback, problems: [], analytic: baseOk ? baseOk.analytic : null, analyticStale: false, draftPending: true }
          : {
            draft: initial,
            validPlan: baseOk ? baseOk.plan : fallback,
            problems: first.problems,
            analytic: baseOk ? baseOk.analytic : null,
            analyticStale: baseOk !== null,
            draftPending: false,
          };
    const edited = (path: string, value: string | boolean): PlanDraft => {
      let next = setDraftField(get().draft, path, value);
      // A one-group study is only meaningful for people a rule selected: choosing it with
      // "existing groups" moves the rule to a cut-off (the fields typed for it are kept).
      if (path === 'design' && value === 'one-group' && next.assignment.rule === 'existing-groups') {
        next = setDraftField(next, 'assignment.rule', 'cut-off');
      }
      const provenance = draftProvenance(next);
      if (!provenance?.[path]) return next;
      const { [path]: _typed, ...rest } = provenance;
      return withDraftProvenance(next, rest);
    };
    return {
      ...initialState,
      setField: (path, value) => set(apply(edited(path, value))),
      typeField: (path, value) => set(apply(edited(path, value), 'typing')),
      commitDraft: () => {
        const w = waiting;
        if (!w) return;
        stopWaiting();
        if (get().draft !== w.draft) return; // the draft changed since; that change decided
        set({ ...adopt(w.plan, w.analytic), analyticStale: false, draftPending: false });
      },
      setPretestMode: (mode) => {
        const d = get().draft;
        set(apply({ ...d, pretest: { ...d.pretest, mode } }));
      },
      applyIccPreset: (field, presetId) => {
        const preset = ICC_PRESETS.find((p) => p.id === presetId);
        if (!preset) return;
        const next = setDraftField(get().draft, field, String(preset.icc));
        const note: FieldProvenance = { source: 'entered', note: iccPresetNote(preset) };
        set(apply(withDraftProvenance(next, { ...draftProvenance(next), [field]: note })));
      },
      replacePlan: (plan) => set(apply(withDraftProvenance(planToDraft(plan), plan.provenance))),
      replaceDraft: (draft, how = 'commit') => set(apply(draft, how)),
    };
  };
