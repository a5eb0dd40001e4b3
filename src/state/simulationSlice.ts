import type { StateCreator } from 'zustand';
import type { SimulationResult } from '../sim/types';
import { BROWSER_RUN_LIMIT_SECONDS, type RunTimeEstimate } from '../sim/estimateRunSeconds';
import type { MeanwardDeps } from './deps';
import { samePlan } from './samePlan';
import type { MeanwardState } from './store';

/** 'too-long': the timed pilot estimated more than BROWSER_RUN_LIMIT_SECONDS; waiting for the go-ahead. */
export type SimulationStatus = 'idle' | 'running' | 'done' | 'error' | 'cancelled' | 'too-long';

export interface SimulationState {
  status: SimulationStatus;
  /** Share of replications finished, 0..1. */
  progress: number;
  /** The last completed result (kept while a new run is going or after a cancel). */
  result: SimulationResult | null;
  error: string | null;
  /** True when the plan on screen differs from the plan the result was simulated for. */
  stale: boolean;
  /** Start a run automatically a moment after the plan stops changing. */
  autoRun: boolean;
  /** The latest run's time estimate (from its timed pilot), or null before it arrives. */
  estimate: RunTimeEstimate | null;
  /** With status 'error': 'stalled' when the background process went silent, else 'failed'. */
  errorKind: 'failed' | 'stalled' | null;
}

export interface SimulationSlice {
  simulation: SimulationState;
  /**
   * Start a run. Runs whose timed pilot estimates more than BROWSER_RUN_LIMIT_SECONDS stop at
   * status 'too-long' unless `confirmed` (the researcher's go-ahead) is true.
   */
  runSimulation(options?: { confirmed?: boolean }): Promise<void>;
  cancelSimulation(): void;
  setAutoRun(on: boolean): void;
  /** Re-check whether the result still matches the plan (called after every plan change). */
  refreshSimulationStale(): void;
}

export const createSimulationSlice =
  (deps: MeanwardDeps): StateCreator<MeanwardState, [], [], SimulationSlice> =>
  (set, get) => {
    let runId = 0;
    const patch = (p: Partial<SimulationState>) => set((s) => ({ simulation: { ...s.simulation, ...p } }));
    const isStale = (result: SimulationResult | null): boolean => {
      const s = get();
      return result !== null && (s.problems.length > 0 || !samePlan(result.plan, s.validPlan));
    };
    return {
      simulation: { status: 'idle', progress: 0, result: null, error: null, stale: false, autoRun: false, estimate: null, errorKind: null },
      runSimulation: async (options = {}) => {
        const s = get();
        if (!deps.simulation) {
          patch({ status: 'error', errorKind: 'failed', error: 'The simulation is not available in this browser (Web Workers are needed).' });
          return;
        }
        if (s.problems.length > 0) {
          patch({
            status: 'error',
            errorKind: 'failed',
            error: `The plan has ${s.problems.length === 1 ? 'a problem' : `${s.problems.length} problems`} to fix before a simulation can run (see the marked fields).`,
          });
          return;
        }
        if (s.simulation.status === 'running') deps.simulation.cancel();
        const id = ++runId;
        const plan = s.validPlan;
        patch({ status: 'running', progress: 0, error: null, errorKind: null, estimate: null });
        try {
          const result = await deps.simulation.run(
            plan,
            (progress) => {
              if (id === runId && get().simulation.status === 'running') {
                patch({ progress: Math.min(1, Math.max(0, Number.isFinite(progress) ? progress : 0)) });
              }
            },
            {
              maxSeconds: options.confirmed ? undefined : BROWSER_RUN_LIMIT_SECONDS,
              onEstimate: (estimate) => {
                if (id === runId && get().simulation.status === 'running') patch({ estimate });
              },
            },
          );
          if (id !== runId) return;
          patch({ status: 'done', progress: 1, result, error: null, stale: isStale(result) });
        } catch (e) {
          if (id !== runId) return;
          if (get().simulation.status === 'cancelled') return;
          const reason = (e as { reason?: unknown } | null)?.reason;
          const estimate = (e as { estimate?: RunTimeEstimate } | null)?.estimate;
          if (reason === 'too-long' && estimate) {
            patch({ status: 'too-long', progress: 0, estimate, error: null, errorKind: null });
            return;
          }
          const message = e instanceof Error ? e.message : String(e);
          if (reason === 'stalled') {
            patch({ status: 'error', errorKind: 'stalled', error: message });
            return;
          }
          patch({ status: 'error', errorKind: 'failed', error: `The simulation stopped with an error: ${message}` });
        }
      },
      cancelSimulation: () => {
        if (get().simulation.status === 'too-long') {
          patch({ status: 'cancelled', progress: 0 });
          return;
        }
        if (get().simulation.status !== 'running') return;
        runId++;
        deps.simulation?.cancel();
        patch({ status: 'cancelled', progress: 0 });
      },
      setAutoRun: (on) => patch({ autoRun: on }),
      refreshSimulationStale: () => {
        const { result, stale } = get().simulation;
        const now = isStale(result);
        if (now !== stale) patch({ stale: now });
      },
    };
  };
