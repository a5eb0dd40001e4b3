import { axisValues, exploreCells } from '../core/explore';
import type { ExploreCell, ExploreSpec } from '../core/explore/exploreTypes';
import type { Plan } from '../core/plan';

/** Longest stretch (ms) of cell building before the main thread is given back (well under a 50 ms long task). */
export const CELL_BUILD_SLICE_MS = 8;

/**
 * The core's exploreCells(plan, spec), built one cell at a time and giving the
 * main thread back every CELL_BUILD_SLICE_MS, so a page never freezes while a
 * grid's closed forms are computed (each cell runs analysePlan, a few ms).
 * Each cell is exploreCells of the one-cell grid at that cell's axis values
 * (axisValues' own values, whose rounding is idempotent), re-indexed to its
 * place in the whole grid; a test checks the result equals exploreCells.
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
  const grids = spec.axes.map((axis) => axisValues(plan, axis));
  const combos: number[][] = grids.length === 1 ? grids[0]!.map((v) => [v]) : grids[0]!.flatMap((a) => grids[1]!.map((b) => [a, b]));
  const cells: ExploreCell[] = [];
  let sliceStart = performance.now();
  for (const [index, values] of combos.entries()) {
    if (performance.now() - sliceStart > sliceMs) {
      await pause();
      if (stopped()) return null;
      sliceStart = performance.now();
    }
    const one = spec.axes.map((axis, k) => ({ ...axis, from: values[k]!, to: values[k]!, steps: 1 }));
    const cell = exploreCells(plan, { ...spec, axes: one.length === 2 ? [one[0]!, one[1]!] : [one[0]!] })[0]!;
    cells.push({ ...cell, index });
  }
  return stopped() ? null : cells;
}
