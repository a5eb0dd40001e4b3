import type { SimulationPool } from '../sim/pool/simulationPool';
import type { QuickFiguresClient } from '../sim/quickFiguresClient';
import type { GridRunner, PlannedProcedureRunner, SimulationRunner } from './deps';

/**
 * The page's one worker pool (src/sim/pool/simulationPool), shared by single runs and the
 * design explorer's grids; loaded and created on first use, so the page opens without the engine.
 */
let sharedPool: Promise<SimulationPool> | null = null;
const getPool = (): Promise<SimulationPool> =>
  (sharedPool ??= import('../sim/pool/simulationPool').then((m) => new m.SimulationPool()).catch((err: unknown) => {
    sharedPool = null; // try again next time (e.g. the chunk failed to load)
    throw err;
  }));

/**
 * The simulation runner the app uses: the worker pool (src/sim/pool/simulationPool, sized from
 * the machine's cores), loaded on first use. Its results are the same bit for bit on any number of
 * workers. Progress is passed on as a share, done / total.
 * @param poolSource where the pool comes from (tests pass one with stand-in workers).
 */
export function createSimulationRunner(poolSource: () => Promise<SimulationPool> = getPool): SimulationRunner {
  let pool: SimulationPool | null = null;
  return {
    run: async (plan, onProgress, options = {}) => {
      pool = await poolSource();
      return pool.run(plan, (done, total) => onProgress(total > 0 ? done / total : 0), options);
    },
    cancel: () => pool?.cancel(),
  };
}

/**
 * The design explorer's grid runner: the same worker pool's runBatch, each cell whole on one
 * worker, cells side by side (a single run started meanwhile goes ahead of queued cells).
 * Progress is passed on as a share of all cells' replications.
 * @param poolSource where the pool comes from (tests pass one with stand-in workers).
 */
export function createGridRunner(poolSource: () => Promise<SimulationPool> = getPool): GridRunner {
  return {
    runGrid: (jobs, handlers) => {
      let cancelled = false;
      let cancelBatch: (() => void) | null = null;
      const done = poolSource().then(
        (pool) => {
          if (cancelled) return;
          const batch = pool.runBatch(jobs, {
            onResult: (i, r) => handlers.onCellResult(i, r),
            onError: (i, m) => handlers.onCellError(i, m),
            onProgress: (d, total) => handlers.onProgress(total > 0 ? d / total : 1),
          });
          cancelBatch = batch.cancel;
          return batch.done;
        },
        (err: unknown) => {
          if (cancelled) return;
          const message = `Could not start the simulation: ${err instanceof Error ? err.message : String(err)}`;
          jobs.forEach((_, i) => handlers.onCellError(i, message));
        },
      );
      return {
        done,
        cancel: () => {
          cancelled = true;
          cancelBatch?.();
        },
      };
    },
  };
}

/**
 * The quick-figures runner the app uses: the worker client in
 * src/sim/quickFiguresClient (a short seeded simulation of the planned
 * procedure), loaded on first use. A failure resolves with null, so the
 * closed-form figures simply stay on screen.
 */
export function createPlannedProcedureRunner(): PlannedProcedureRunner {
  let client: QuickFiguresClient | null = null;
  return {
    estimate: async (plan) => {
      try {
        if (!client) {
          const m = await import('../sim/quickFiguresClient');
          client ??= new m.QuickFiguresClient();
        }
        return await client.estimate(plan);
      } catch {
        return null;
      }
    },
  };
}
