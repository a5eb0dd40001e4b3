import { exploreCells, withExploreClosedForm } from '../core/explore';
import type { ExploreCell, ExploreSpec } from '../core/explore/exploreTypes';
import type { Plan } from '../core/plan';

/** Longest stretch (ms) of closed-form work before the main thread is given back (well under a 50 ms long task). */
export const CELL_BUILD_SLICE_MS = 8;

/**
 * The core's exploreCells(plan, spec), with the closed forms filled in one
 * cell at a time (withExploreClosedForm) and the main thread given back every
 * CELL_BUILD_SLICE_MS, so the page never freezes while a grid's closed forms
 * are computed (each cell runs analysePlan, a few ms). The variant plans
 * themselves are built at once (exploreCells without closed forms: validation
 * only, fast). A test checks the result equals exploreCells(plan, spec).
 * @param stopped returns true when the caller no longer wants the cells (then null is returned).
 * @param pause gives the main thread back (default: a zero-delay timer).
 * @param sliceMs longest stretch between pauses (default CELL_BUILD_SLICE_MS).
 */
export async function exploreCellsInSteps(
  plan: Plan,
  spec: ExploreSpec,
  stopped: () => boolean,
  pause: () => Promise<void> = () => new Promise((resolve) => setTimeout(resolve, 0)),
  sliceMs: number = CELL_BUILD_SLICE_MS,
): Promise<ExploreCell[] | null> {
  // Give the thread back first: the click that started the grid has its own rendering to do.
  await pause();
  if (stopped()) return null;
  const cells = exploreCells(plan, spec, { closedForms: false });
  // The variant plans (each validated) are one stretch of work; the closed forms start in the next.
  await pause();
  if (stopped()) return null;
  let sliceStart = performance.now();
  for (let i = 0; i < cells.length; i++) {
    if (performance.now() - sliceStart > sliceMs) {
      await pause();
      if (stopped()) return null;
      sliceStart = performance.now();
    }
    cells[i] = withExploreClosedForm(cells[i]!, spec);
  }
  return stopped() ? null : cells;
}
