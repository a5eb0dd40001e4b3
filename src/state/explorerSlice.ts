import { headlineAnalysisId } from '../core/design/studyDesign';
import type { ExploreAxis, ExploreCellSummary, ExploreInput, ExploreResult, ExploreSpec } from '../core/explore/exploreTypes';
import {
  exploreInputs,
  exploreResult,
  exploreVariantName,
  failedCellSummary,
  pendingCellSummary,
  summariseExploreCell,
  validateExploreSpec,
} from '../core/explore';
import { ANALYSIS_IDS, type AnalysisId } from '../core/plan';
import {
  emptyAxis,
  installExplorerActions,
  type ExploreAxisDraft,
  type ExplorerActions,
  type ExplorerActionsFactory,
  type ExplorerDraft,
  type ExplorerProblem,
  type ExplorerState,
} from './explorerState';
import type { GridJob } from './deps';
import { exploreCellsInSteps } from './exploreCellsInSteps';
import { readNumber } from './planDraft';
import { samePlan } from './samePlan';
import type { MeanwardState } from './store';

// The explorer's state and types are in explorerState.ts (on the first screen); this module, with
// the explorer's core, loads with the explorer panel.
export {
  EXPLORER_DEFAULT_REPLICATIONS,
  emptyExplorerDraft,
  type ExploreAxisDraft,
  type ExplorerDraft,
  type ExplorerProblem,
  type ExplorerSlice,
  type ExplorerState,
  type ExplorerStatus,
} from './explorerState';

/** True when the explorer's result was computed for another plan than the one now in the form (or the form has problems). */
export function explorerStale(s: Pick<MeanwardState, 'explorer' | 'validPlan' | 'problems'>): boolean {
  const r = s.explorer.result;
  if (r === null) return false;
  if (s.problems.length > 0) return true;
  // Memoised on the two plans: the selector runs on every store change (e.g. each progress step) and samePlan compares whole plans.
  if (r.plan !== lastStale.result || s.validPlan !== lastStale.plan) lastStale = { result: r.plan, plan: s.validPlan, stale: !samePlan(r.plan, s.validPlan) };
  return lastStale.stale;
}
let lastStale: { result: unknown; plan: unknown; stale: boolean } = { result: null, plan: null, stale: false };

/** Cells finished (done or failed) and cells to run (everything but impossible cells). */
export function explorerCellCounts(result: ExploreResult | null): { finished: number; toRun: number; impossible: number } {
  if (!result) return { finished: 0, toRun: 0, impossible: 0 };
  let finished = 0;
  let impossible = 0;
  for (const c of result.cells) {
    if (c.status === 'done' || c.status === 'failed') finished++;
    if (c.status === 'impossible') impossible++;
  }
  return { finished, toRun: result.cells.length - impossible, impossible };
}

const AXIS_WORDS = ['first input', 'second input'] as const;

/**
 * Read the explorer's form into a spec, or the problems per field (plain words;
 * the draft itself is never changed). Ranges, steps and sizes are then checked
 * by the core's validateExploreSpec.
 */
export function readExplorerDraft(draft: ExplorerDraft, plan: MeanwardState['validPlan']): { spec: ExploreSpec | null; problems: ExplorerProblem[] } {
  const problems: ExplorerProblem[] = [];
  const axes: ExploreAxis[] = [];
  draft.axes.forEach((a, i) => {
    if (a.input === '') {
      if (i === 0) problems.push({ field: 'axis0.input', message: 'Choose an input to vary.' });
      return;
    }
    const read = (field: 'from' | 'to' | 'steps', word: string) => {
      const r = readNumber(`axis${i}.${field}`, a[field], `"${word}" of the ${AXIS_WORDS[i]}`);
      if (r.problem) problems.push({ field: `axis${i}.${field}`, message: r.problem });
      return r.value;
    };
    const from = read('from', 'From');
    const to = read('to', 'To');
    const steps = read('steps', 'Steps');
    if (steps !== undefined && !Number.isInteger(steps)) problems.push({ field: `axis${i}.steps`, message: `"Steps" of the ${AXIS_WORDS[i]} must be a whole number; got "${a.steps}".` });
    if (from !== undefined && to !== undefined && steps !== undefined) axes.push({ input: a.input, from, to, steps });
  });
  const reps = readNumber('replications', draft.replications, 'Replications per cell');
  if (reps.problem) problems.push({ field: 'replications', message: reps.problem });
  else if (reps.value !== undefined && !Number.isInteger(reps.value)) problems.push({ field: 'replications', message: `Replications per cell must be a whole number; got "${draft.replications}".` });
  if (draft.analysisId !== '' && !(ANALYSIS_IDS as readonly string[]).includes(draft.analysisId)) problems.push({ field: 'analysisId', message: 'Choose one of the listed analyses.' });
  if (problems.length > 0 || axes.length === 0 || reps.value === undefined) return { spec: null, problems };
  const spec: ExploreSpec = {
    axes: axes.length === 2 ? [axes[0]!, axes[1]!] : [axes[0]!],
    analysisId: draft.analysisId === '' ? headlineAnalysisId(plan) : draft.analysisId,
    replications: reps.value,
    seed: plan.simulation.seed,
  };
  for (const message of validateExploreSpec(plan, spec)) problems.push({ field: '', message });
  return problems.length > 0 ? { spec: null, problems } : { spec, problems: [] };
}

/** Longest wait (ms) before finished cells and progress reach the store while a grid runs. */
export const EXPLORER_UPDATE_MS = 100;

/**
 * Gathers a running grid's cell results and progress and puts them into the
 * store in one update per EXPLORER_UPDATE_MS (the first one after a quiet spell
 * waits too, so a burst of messages is one update): each update is one render
 * of the panel and one redraw of its chart. Progress alone is put in only when
 * its whole percent changes. flush() puts anything gathered in at once (when
 * the grid ends or is cancelled).
 * @param current the explorer state to update, or null when the grid is no longer current (then nothing is put in).
 * @param put puts a partial explorer state into the store.
 * @param schedule runs a function once after some ms, returning a cancel function.
 */
export function explorerUpdateBatcher(
  current: () => ExplorerState | null,
  put: (p: Partial<ExplorerState>) => void,
  schedule: (fn: () => void, ms: number) => () => void,
  ms: number = EXPLORER_UPDATE_MS,
): { cell(at: number, make: (cell: ExploreCellSummary) => ExploreCellSummary): void; progress(share: number): void; flush(): void } {
  const cells: [number, (cell: ExploreCellSummary) => ExploreCellSummary][] = [];
  let share: number | null = null;
  let cancelTimer: (() => void) | null = null;
  const flush = (): void => {
    cancelTimer?.();
    cancelTimer = null;
    const ex = current();
    const gathered = cells.splice(0);
    const nextShare = share;
    share = null;
    if (!ex) return;
    const p: Partial<ExplorerState> = {};
    if (gathered.length > 0 && ex.result) {
      const next = ex.result.cells.slice();
      for (const [at, make] of gathered) if (next[at]) next[at] = make(next[at]!);
      p.result = { ...ex.result, cells: next };
    }
    // At most one repaint per whole percent: the pool reports far more often than anyone can read.
    if (nextShare !== null && Math.floor(nextShare * 100) !== Math.floor(ex.progress * 100)) p.progress = nextShare;
    if (p.result || p.progress !== undefined) put(p);
  };
  const later = (): void => {
    if (cancelTimer === null) cancelTimer = schedule(flush, ms);
  };
  return {
    cell: (at, make) => {
      cells.push([at, make]);
      later();
    },
    progress: (s) => {
      share = s;
      later();
    },
    flush,
  };
}

/**
 * The design explorer's actions for one store (installed into the slice in explorerState.ts when
 * this module loads; see there).
 */
export const createExplorerActions: ExplorerActionsFactory = (deps, set, get): ExplorerActions => {
  let runId = 0;
  let handle: { cancel(): void } | null = null;
  /** Puts the running grid's gathered cells into the store now (null when no grid runs). */
  let flushBatch: (() => void) | null = null;
  const patch = (p: Partial<ExplorerState>) => set((s) => ({ explorer: { ...s.explorer, ...p } }));
  const patchDraft = (d: Partial<ExplorerDraft>) => set((s) => ({ explorer: { ...s.explorer, draft: { ...s.explorer.draft, ...d } } }));
  const rangeFor = (input: ExploreInput) => {
    const kept = get().explorer.draft.typedRanges[input];
    if (kept) return kept;
    const info = exploreInputs(get().validPlan).find((x) => x.input === input);
    if (!info) return { from: '', to: '', steps: '' };
    return { from: String(info.defaultRange.from), to: String(info.defaultRange.to), steps: String(info.defaultRange.steps) };
  };
  return {
    prepareExplorer: () => {
      if (get().explorer.draft.axes[0].input !== '') return;
      const first = exploreInputs(get().validPlan).find((x) => x.applies);
      if (first) get().setExplorerInput(0, first.input);
    },
    setExplorerInput: (axis, input) => {
      const d = get().explorer.draft;
      const old = d.axes[axis];
      const typedRanges = old.input === '' ? d.typedRanges : { ...d.typedRanges, [old.input]: { from: old.from, to: old.to, steps: old.steps } };
      patchDraft({ typedRanges });
      const next: ExploreAxisDraft = input === '' ? emptyAxis() : { input, ...rangeFor(input) };
      const axes: [ExploreAxisDraft, ExploreAxisDraft] = axis === 0 ? [next, d.axes[1]] : [d.axes[0], next];
      patchDraft({ axes });
      patch({ problems: get().explorer.problems.filter((p) => !p.field.startsWith(`axis${axis}.`) && p.field !== '') });
    },
    setExplorerAxisField: (axis, field, text) => {
      const d = get().explorer.draft;
      const a = { ...d.axes[axis], [field]: text };
      const axes: [ExploreAxisDraft, ExploreAxisDraft] = axis === 0 ? [a, d.axes[1]] : [d.axes[0], a];
      const typedRanges = a.input === '' ? d.typedRanges : { ...d.typedRanges, [a.input]: { from: a.from, to: a.to, steps: a.steps } };
      patchDraft({ axes, typedRanges });
      patch({ problems: get().explorer.problems.filter((p) => p.field !== `axis${axis}.${field}` && p.field !== '') });
    },
    setExplorerField: (field, text) => {
      patchDraft(field === 'replications' ? { replications: text } : { analysisId: text as AnalysisId | '' });
      patch({ problems: get().explorer.problems.filter((p) => p.field !== field && p.field !== '') });
    },
    startExplore: async () => {
      const s = get();
      if (s.problems.length > 0) {
        patch({ status: 'error', error: 'The plan has problems to fix before the explorer can run (see the marked fields).', problems: [] });
        return;
      }
      const plan = s.validPlan;
      const read = readExplorerDraft(s.explorer.draft, plan);
      if (!read.spec) {
        patch({ problems: read.problems, error: null, status: s.explorer.status === 'running' ? 'running' : 'idle' });
        return;
      }
      const spec = read.spec;
      if (!deps.grid) {
        patch({ status: 'error', problems: [], error: 'The explorer cannot simulate in this browser (Web Workers are needed).' });
        return;
      }
      if (handle) handle.cancel();
      const id = ++runId;
      // The closed forms take a few ms per cell: build the cells in short slices, so the page stays responsive.
      patch({ status: 'running', progress: 0, problems: [], error: null, message: null, result: null });
      const built = await exploreCellsInSteps(plan, spec, () => id !== runId);
      if (built === null || id !== runId) return;
      const cells: ExploreCellSummary[] = built.map(pendingCellSummary);
      const jobs: GridJob[] = [];
      const cellOfJob: number[] = [];
      for (const c of cells) {
        if (!c.plan) continue;
        jobs.push({ plan: c.plan, replications: spec.replications, seed: spec.seed });
        cellOfJob.push(c.index);
      }
      patch({ result: exploreResult(plan, spec, cells) });
      // Cells and progress arrive in bursts (several workers, a message per step): they are
      // gathered and put into the store at most once per EXPLORER_UPDATE_MS, so the panel and
      // its chart redraw once per batch instead of once per message.
      const batch = explorerUpdateBatcher(
        () => (id === runId ? get().explorer : null),
        (p) => {
          if (id === runId) patch(p);
        },
        deps.schedule ?? ((fn, ms) => {
          const t = setTimeout(fn, ms);
          return () => clearTimeout(t);
        }),
      );
      flushBatch = batch.flush;
      const fill = (job: number, make: (cell: ExploreCellSummary) => ExploreCellSummary) => {
        const at = cellOfJob[job];
        if (id !== runId || at === undefined) return;
        batch.cell(at, make);
      };
      const h = deps.grid.runGrid(jobs, {
        onCellResult: (job, result) =>
          fill(job, (cell) => {
            try {
              return summariseExploreCell(cell, result, spec);
            } catch (e) {
              return failedCellSummary(cell, e instanceof Error ? e.message : String(e));
            }
          }),
        onCellError: (job, message) => fill(job, (cell) => failedCellSummary(cell, message)),
        onProgress: (share) => {
          if (id !== runId || get().explorer.status !== 'running') return;
          batch.progress(Math.min(1, Math.max(0, Number.isFinite(share) ? share : 0)));
        },
      });
      handle = h;
      try {
        await h.done;
      } catch (e) {
        if (id !== runId) return;
        handle = null;
        batch.flush();
        flushBatch = null;
        patch({ status: 'error', error: `The explorer stopped with an error: ${e instanceof Error ? e.message : String(e)}` });
        return;
      }
      if (id !== runId) return;
      handle = null;
      batch.flush();
      flushBatch = null;
      patch({ status: 'done', progress: 1 });
    },
    cancelExplore: () => {
      if (get().explorer.status !== 'running') return;
      // Cells that finished before the cancel keep their figures.
      flushBatch?.();
      flushBatch = null;
      runId++;
      handle?.cancel();
      handle = null;
      patch({ status: 'cancelled' });
    },
    makeCandidateFromCell: (index) => {
      const r = get().explorer.result;
      const cell = r?.cells[index];
      if (!r || !cell) return;
      if (!cell.plan) {
        patch({ message: `This cell cannot be a candidate plan: ${cell.problem ?? 'its inputs make an impossible plan'}.` });
        return;
      }
      const v = get().addCandidatePlan({
        name: exploreVariantName(r.spec, cell),
        plan: structuredClone(cell.plan),
        analysisId: r.spec.analysisId,
        note: 'Made from a cell of the design explorer.',
      });
      patch({ message: `Added the candidate plan "${v.name}" to the comparison (see "Candidate plans").` });
    },
  };
};

installExplorerActions(createExplorerActions);
