import { describe, expect, it } from 'vitest';
import { exploreCells, exploreVariantName, summariseExploreCell } from '../../src/core/explore';
import type { ExploreCellSummary, ExploreSpec } from '../../src/core/explore/exploreTypes';
import { demoPlan } from '../../src/io/demoPlan';
import { exploreCellsInSteps } from '../../src/state/exploreCellsInSteps';
import type { GridJob, GridRunner } from '../../src/state/deps';
import { EXPLORER_UPDATE_MS, explorerCellCounts, explorerStale, explorerUpdateBatcher, type ExplorerState } from '../../src/state/explorerSlice';
import { simulatePlan } from '../../src/sim/simulatePlan';
import type { SimulationResult } from '../../src/sim/types';
import { makeStore } from './helpers';

/**
 * A grid runner under the test's control: it records every grid's jobs and
 * handlers; the test answers cells in any order (with a real simulation of
 * the job, or an error) and sees whether the store cancelled.
 */
function fakeGrid() {
  const grids: {
    jobs: readonly GridJob[];
    handlers: Parameters<GridRunner['runGrid']>[1];
    finish: () => void;
    cancelled: boolean;
  }[] = [];
  const runner: GridRunner = {
    runGrid: (jobs, handlers) => {
      let finish = () => {};
      const done = new Promise<void>((resolve) => (finish = resolve));
      const g = { jobs, handlers, finish, cancelled: false };
      grids.push(g);
      return {
        done,
        cancel: () => {
          g.cancelled = true;
          finish();
        },
      };
    },
  };
  /** Simulate job j for real (the engine, the job's own replications and seed) and hand its result to the store. */
  const answer = (g: (typeof grids)[number], j: number): SimulationResult => {
    const job = g.jobs[j]!;
    const result = simulatePlan(job.plan, { replications: job.replications, seed: job.seed });
    g.handlers.onCellResult(j, result);
    return result;
  };
  return { runner, grids, answer };
}

const flush = () => new Promise((r) => setTimeout(r, 0));

/** Wait (real timers) until the store has handed its grid to the runner: the cells are built in short slices first. */
async function gridSent(g: ReturnType<typeof fakeGrid>, n = 1) {
  for (let i = 0; i < 500 && g.grids.length < n; i++) await flush();
  expect(g.grids).toHaveLength(n);
  return g.grids[n - 1]!;
}

/** The demo plan (invented) with a 2 × 2 grid: reliability .6 and .9 × caliper .1 and .4, ANCOVA judged. */
function setTwoByTwo(store: ReturnType<typeof makeStore>, analysis = 'ancova', reps = '400') {
  const s = store.getState();
  s.setExplorerInput(0, 'reliability');
  s.setExplorerAxisField(0, 'from', '0.6');
  s.setExplorerAxisField(0, 'to', '0.9');
  s.setExplorerAxisField(0, 'steps', '2');
  s.setExplorerInput(1, 'caliper');
  s.setExplorerAxisField(1, 'from', '0.1');
  s.setExplorerAxisField(1, 'to', '0.4');
  s.setExplorerAxisField(1, 'steps', '2');
  s.setExplorerField('replications', reps);
  s.setExplorerField('analysisId', analysis);
}

describe('design explorer in the store', () => {
  it('sends one job per cell in row-major order and fills cells as they finish, in any order', async () => {
    const g = fakeGrid();
    const store = makeStore({ grid: g.runner });
    setTwoByTwo(store);
    const started = store.getState().startExplore();
    expect(store.getState().explorer.status).toBe('running');
    const grid = await gridSent(g);
    // Evenly spaced values, axis 0 varying slowest (row-major; common practice for grids).
    expect(grid.jobs.map((j) => [j.plan.pretest.reliability, j.plan.matching.caliper])).toEqual([
      [0.6, 0.1],
      [0.6, 0.4],
      [0.9, 0.1],
      [0.9, 0.4],
    ]);
    expect(grid.jobs.every((j) => j.replications === 400 && j.seed === store.getState().validPlan.simulation.seed)).toBe(true);
    // Out of order: the last cell first, then the first.
    g.answer(grid, 3);
    grid.handlers.onProgress(0.25);
    // Results reach the store in batches (at most EXPLORER_UPDATE_MS later).
    expect(store.getState().explorer.result!.cells.map((c) => c.status)).toEqual(['pending', 'pending', 'pending', 'pending']);
    await new Promise((r) => setTimeout(r, EXPLORER_UPDATE_MS + 20));
    expect(store.getState().explorer.result!.cells.map((c) => c.status)).toEqual(['pending', 'pending', 'pending', 'done']);
    expect(store.getState().explorer.progress).toBeCloseTo(0.25, 12);
    g.answer(grid, 0);
    g.answer(grid, 2);
    g.answer(grid, 1);
    grid.finish();
    await started;
    const ex = store.getState().explorer;
    expect(ex.status).toBe('done');
    expect(explorerCellCounts(ex.result)).toEqual({ finished: 4, toRun: 4, impossible: 0 });
    // Every cell's simulated ANCOVA artefact lies within 4 Monte Carlo SEs of its closed form
    // (ANCOVA on a fallible covariate: bias beta(1 - rho_w)Delta, Lord 1960; Porter 1967).
    for (const c of ex.result!.cells) {
      expect(c.status).toBe('done');
      expect(Math.abs(c.artefactShare! - c.closedFormShare!)).toBeLessThan(4 * c.artefactShareMCSE!);
    }
    // Lower reliability, larger artefact (same sign): the regression artefact shrinks as rho_w grows.
    const [lo, , hi] = ex.result!.cells;
    expect(Math.abs(lo!.artefactShare!)).toBeGreaterThan(Math.abs(hi!.artefactShare!));
  });

  it('cancel stops the grid: finished cells keep their figures, the rest stay pending, late answers are ignored', async () => {
    const g = fakeGrid();
    const store = makeStore({ grid: g.runner });
    setTwoByTwo(store, 'ancova', '200');
    const started = store.getState().startExplore();
    const grid = await gridSent(g);
    g.answer(grid, 1);
    store.getState().cancelExplore();
    await started;
    expect(grid.cancelled).toBe(true);
    g.answer(grid, 0);
    await flush();
    const ex = store.getState().explorer;
    expect(ex.status).toBe('cancelled');
    expect(ex.result!.cells.map((c) => c.status)).toEqual(['pending', 'done', 'pending', 'pending']);
  });

  it('a failure in one cell marks that cell failed with the message and the rest still finish', async () => {
    const g = fakeGrid();
    const store = makeStore({ grid: g.runner });
    setTwoByTwo(store, 'ancova', '200');
    const started = store.getState().startExplore();
    const grid = await gridSent(g);
    grid.handlers.onCellError(2, 'The worker stopped unexpectedly.');
    for (const j of [0, 1, 3]) g.answer(grid, j);
    grid.finish();
    await started;
    const cells = store.getState().explorer.result!.cells;
    expect(cells.map((c) => c.status)).toEqual(['done', 'done', 'failed', 'done']);
    expect(cells[2]!.failure).toBe('The worker stopped unexpectedly.');
    expect(store.getState().explorer.status).toBe('done');
  });

  it('never sends impossible cells: a ratio above the comparison pool is marked impossible with the reason', async () => {
    const g = fakeGrid();
    const store = makeStore({ grid: g.runner });
    const s = store.getState();
    s.setExplorerInput(0, 'ratio');
    s.setExplorerAxisField(0, 'from', '1');
    s.setExplorerAxisField(0, 'to', '5');
    s.setExplorerAxisField(0, 'steps', '2');
    s.setExplorerInput(1, 'comparisonPool');
    s.setExplorerAxisField(1, 'from', '2');
    s.setExplorerAxisField(1, 'to', '1200');
    s.setExplorerAxisField(1, 'steps', '2');
    s.setExplorerField('replications', '200');
    const started = store.getState().startExplore();
    expect(store.getState().explorer.problems).toEqual([]);
    const grid = await gridSent(g);
    const cells = store.getState().explorer.result!.cells;
    // Ratio 5 with 2 comparison people: no programme member can get five partners (validatePlan's rule).
    expect(cells.map((c) => c.status)).toEqual(['pending', 'pending', 'impossible', 'pending']);
    expect(cells[2]!.problem).toMatch(/ratio/i);
    expect(grid.jobs).toHaveLength(3);
    expect(grid.jobs.some((j) => j.plan.matching.ratio === 5 && j.plan.groups.comparison.poolSize === 2)).toBe(false);
    store.getState().cancelExplore();
    await started;
  });

  it('bad input keeps the text as typed, says what is wrong per field, and sends nothing', async () => {
    const g = fakeGrid();
    const store = makeStore({ grid: g.runner });
    const s = store.getState();
    s.setExplorerInput(0, 'reliability');
    s.setExplorerAxisField(0, 'from', '0,6x');
    s.setExplorerAxisField(0, 'steps', '2.5');
    s.setExplorerField('replications', 'lots');
    await store.getState().startExplore();
    const ex = store.getState().explorer;
    expect(g.grids).toHaveLength(0);
    expect(ex.draft.axes[0].from).toBe('0,6x');
    expect(ex.draft.replications).toBe('lots');
    expect(ex.problems.find((p) => p.field === 'axis0.from')?.message).toContain('"From" of the first input must be a number');
    expect(ex.problems.find((p) => p.field === 'axis0.steps')?.message).toContain('whole number');
    expect(ex.problems.find((p) => p.field === 'replications')?.message).toContain('must be a number');
    // Switching the axis to another input and back brings the typed range back.
    s.setExplorerInput(0, 'caliper');
    expect(store.getState().explorer.draft.axes[0].from).not.toBe('0,6x');
    s.setExplorerInput(0, 'reliability');
    expect(store.getState().explorer.draft.axes[0].from).toBe('0,6x');
    // A range outside what the explorer allows is refused by the core's check, in plain words naming the input.
    s.setExplorerAxisField(0, 'from', '0.6');
    s.setExplorerAxisField(0, 'to', '1.2');
    s.setExplorerAxisField(0, 'steps', '3');
    s.setExplorerField('replications', '200');
    await store.getState().startExplore();
    expect(g.grids).toHaveLength(0);
    expect(store.getState().explorer.problems.map((p) => p.message).join(' ')).toMatch(/reliability/i);
  });

  it('makes a cell a named candidate plan, beside the plan as planned in the comparison', async () => {
    const g = fakeGrid();
    const store = makeStore({ grid: g.runner });
    setTwoByTwo(store, '', '200');
    const started = store.getState().startExplore();
    const grid = await gridSent(g);
    for (const j of [0, 1, 2, 3]) g.answer(grid, j);
    grid.finish();
    await started;
    const ex = store.getState().explorer;
    expect(ex.result!.spec.analysisId).toBe('matchedDifference');
    store.getState().makeCandidateFromCell(2);
    const s = store.getState();
    const cell = ex.result!.cells[2]!;
    expect(s.variants.map((v) => v.name)).toEqual(['As planned', exploreVariantName(ex.result!.spec, cell)]);
    const v = s.variants[1]!;
    expect(v.plan.pretest.reliability).toBe(0.9);
    expect(v.plan.matching.caliper).toBe(0.1);
    expect(v.plan).toEqual(cell.plan);
    expect(v.analysisId).toBe('matchedDifference');
    expect(s.compareIds).toContain(v.id);
    expect(s.explorer.message).toContain(v.name);
    // The grid describes the plan it was run for: editing the plan marks it stale.
    expect(explorerStale(s)).toBe(false);
    s.setField('matching.caliper', '0.3');
    s.commitDraft();
    expect(explorerStale(store.getState())).toBe(true);
  });

  it('builds the cells in slices exactly as the core builds the whole grid, and stops when cancelled meanwhile', async () => {
    const plan = demoPlan();
    const two: ExploreSpec = {
      axes: [
        { input: 'reliability', from: 0.6, to: 0.95, steps: 5 },
        { input: 'comparisonPool', from: 2, to: 1200, steps: 4 },
      ],
      analysisId: 'matchedDifference',
      replications: 200,
      seed: 7,
    };
    let pauses = 0;
    const everyCell = async () => {
      pauses++;
    };
    // Pausing after every cell (slices of 0 ms) changes nothing in the cells.
    expect(await exploreCellsInSteps(plan, two, () => false, everyCell, 0)).toEqual(exploreCells(plan, two));
    expect(pauses).toBeGreaterThan(0);
    const one: ExploreSpec = { ...two, axes: [{ input: 'groupGap', from: -12, to: 4, steps: 6 }], analysisId: 'ancova' };
    expect(await exploreCellsInSteps(plan, one, () => false)).toEqual(exploreCells(plan, one));
    // Cancelled while building: nothing comes back.
    let stop = false;
    const slow = () => new Promise<void>((r) => setTimeout(r, 0));
    const building = exploreCellsInSteps(plan, two, () => stop, slow, 0);
    stop = true;
    expect(await building).toBeNull();
  });

  it('a burst of cell results and progress reaches the store as one update, with the same figures as one by one', async () => {
    const g = fakeGrid();
    const store = makeStore({ grid: g.runner });
    setTwoByTwo(store, 'ancova', '200');
    const started = store.getState().startExplore();
    const grid = await gridSent(g);
    let updates = 0;
    const stop = store.subscribe((now, before) => {
      if (now.explorer !== before.explorer) updates++;
    });
    const results = [2, 0, 3, 1].map((j) => {
      const r = g.answer(grid, j);
      grid.handlers.onProgress(0.25 * (j + 1));
      return [j, r] as const;
    });
    expect(updates).toBe(0);
    await new Promise((r) => setTimeout(r, EXPLORER_UPDATE_MS + 30));
    expect(updates).toBe(1);
    const ex = store.getState().explorer;
    expect(ex.result!.cells.every((c) => c.status === 'done')).toBe(true);
    expect(ex.progress).toBeCloseTo(0.5, 12); // the last progress reported (job 1: 0.25 × 2)
    // Each cell holds the core's summary of its own result (summariseExploreCell), as if applied alone.
    const built = exploreCells(store.getState().validPlan, ex.result!.spec);
    for (const [j, r] of results) expect(ex.result!.cells[j]).toEqual(summariseExploreCell(built[j]!, r, ex.result!.spec));
    grid.finish();
    await started;
    stop();
    expect(store.getState().explorer.status).toBe('done');
  });

  it('the update batcher waits for its timer, puts everything gathered at once, and skips progress within the same percent', () => {
    const timers: (() => void)[] = [];
    const schedule = (fn: () => void) => {
      timers.push(fn);
      return () => timers.splice(timers.indexOf(fn), 1);
    };
    const cell = (index: number) => ({ index, status: 'pending' }) as unknown as ExploreCellSummary;
    let state = { progress: 0.1, result: { cells: [cell(0), cell(1), cell(2)] } } as unknown as ExplorerState;
    const puts: Partial<ExplorerState>[] = [];
    const b = explorerUpdateBatcher(
      () => state,
      (p) => {
        puts.push(p);
        state = { ...state, ...p };
      },
      schedule,
    );
    b.progress(0.105);
    expect(timers).toHaveLength(1);
    timers[0]!();
    expect(puts).toEqual([]); // 10.5 % is still 10 %: nothing to repaint
    b.cell(2, (c) => ({ ...c, status: 'done' }));
    b.cell(0, (c) => ({ ...c, status: 'failed' }));
    b.progress(0.5);
    expect(timers).toHaveLength(1); // one timer for the whole burst
    expect(puts).toEqual([]);
    timers[0]!();
    expect(puts).toHaveLength(1);
    expect(puts[0]!.progress).toBe(0.5);
    expect(puts[0]!.result!.cells.map((c) => c.status)).toEqual(['failed', 'pending', 'done']);
    // flush() puts at once and cancels the timer; a grid no longer current gets nothing.
    b.cell(1, (c) => ({ ...c, status: 'done' }));
    b.flush();
    expect(timers).toHaveLength(0);
    expect(puts).toHaveLength(2);
    const gone = explorerUpdateBatcher(() => null, (p) => puts.push(p), schedule);
    gone.cell(0, (c) => c);
    gone.flush();
    expect(puts).toHaveLength(2);
  });

  it('says plainly when no grid runner is available', async () => {
    const store = makeStore({ grid: null });
    setTwoByTwo(store, 'ancova', '200');
    await store.getState().startExplore();
    expect(store.getState().explorer.status).toBe('error');
    expect(store.getState().explorer.error).toContain('Web Workers');
  });
});
