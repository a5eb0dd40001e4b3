import { describe, expect, it } from 'vitest';
import type { Plan } from '../../src/core/plan';
import type { PlannedProcedureEstimates } from '../../src/core/plannedProcedure';
import { demoPlan } from '../../src/io/demoPlan';
import { estimatePlannedProcedure } from '../../src/sim/estimatePlannedProcedure';
import { QuickFiguresClient, STALE_AFTER_MS, type QuickWorkerFactory } from '../../src/sim/quickFiguresClient';
import type { FromQuickWorker, ToQuickWorker } from '../../src/sim/quickFiguresProtocol';
import { defaultDeps } from '../../src/state/defaultDeps';
import type { PlannedProcedureRunner } from '../../src/state/deps';
import { createMeanwardStore } from '../../src/state/store';

/** A quick-figures runner the test resolves by hand. */
function heldRunner() {
  const calls: { plan: Plan; resolve: (e: PlannedProcedureEstimates | null) => void }[] = [];
  const runner: PlannedProcedureRunner = {
    estimate: (plan) => new Promise((resolve) => calls.push({ plan, resolve })),
  };
  return { runner, calls };
}

const flush = () => new Promise((r) => setTimeout(r, 0));

describe('store: quick figures for the planned procedure', () => {
  it('shows the closed forms at once, then the planned-procedure figures for the same plan', async () => {
    const { runner, calls } = heldRunner();
    const store = createMeanwardStore({ deps: { ...defaultDeps(null, runner), storage: null }, demo: demoPlan });
    expect(store.getState().analytic?.procedure.basis).toBe('formula');
    expect(calls).toHaveLength(1);
    const call = calls[0]!;
    call.resolve(estimatePlannedProcedure(call.plan));
    await flush();
    const a = store.getState().analytic!;
    expect(a.procedure.basis).toBe('planned-procedure');
    expect(a.analyses.matchedDifference!.basis).toBe('planned-procedure');
  });

  it('ignores figures that arrive for a plan the researcher has since changed', async () => {
    const { runner, calls } = heldRunner();
    const store = createMeanwardStore({ deps: { ...defaultDeps(null, runner), storage: null }, demo: demoPlan });
    store.getState().setField('matching.caliper', '0.1');
    expect(calls).toHaveLength(2);
    const old = calls[0]!;
    old.resolve(estimatePlannedProcedure(old.plan));
    await flush();
    expect(store.getState().analytic?.procedure.basis).toBe('formula');
    const current = calls[1]!;
    expect(current.plan.matching.caliper).toBe(0.1);
    current.resolve(estimatePlannedProcedure(current.plan));
    await flush();
    expect(store.getState().analytic?.procedure.basis).toBe('planned-procedure');
  });

  it('keeps the closed forms when no figures come back (worker failed)', async () => {
    const { runner, calls } = heldRunner();
    const store = createMeanwardStore({ deps: { ...defaultDeps(null, runner), storage: null }, demo: demoPlan });
    calls[0]!.resolve(null);
    await flush();
    expect(store.getState().analytic?.procedure.basis).toBe('formula');
  });
});

describe('QuickFiguresClient', () => {
  it('sends only the newest of several requests made while one is running; replaced requests resolve with null', async () => {
    const sent: ToQuickWorker[] = [];
    let worker: ReturnType<QuickWorkerFactory> | null = null;
    const factory: QuickWorkerFactory = () => {
      worker = { onmessage: null, onerror: null, terminate: () => undefined, postMessage: (m: ToQuickWorker) => void sent.push(m) };
      return worker;
    };
    const reply = (m: ToQuickWorker) =>
      worker!.onmessage?.({ data: { type: 'estimates', id: m.id, estimates: estimatePlannedProcedure(m.plan) } } as MessageEvent<FromQuickWorker>);
    const client = new QuickFiguresClient(factory);
    const plans = [0.1, 0.15, 0.25].map((c) => {
      const p = demoPlan();
      p.matching.caliper = c;
      return p;
    });
    const first = client.estimate(plans[0]!);
    const second = client.estimate(plans[1]!);
    const third = client.estimate(plans[2]!);
    expect(sent).toHaveLength(1);
    reply(sent[0]!);
    expect(await first).not.toBeNull();
    expect(await second).toBeNull();
    expect(sent).toHaveLength(2);
    expect(sent[1]!.plan.matching.caliper).toBe(0.25);
    reply(sent[1]!);
    expect((await third)?.analyses.matchedDifference!).toBeDefined();
  });

  it('abandons a quick run that has taken longer than STALE_AFTER_MS when a newer plan arrives (fresh worker)', async () => {
    let clock = 0;
    let created = 0;
    let terminated = 0;
    const sent: ToQuickWorker[] = [];
    const factory: QuickWorkerFactory = () => {
      created++;
      return { onmessage: null, onerror: null, terminate: () => void terminated++, postMessage: (m: ToQuickWorker) => void sent.push(m) };
    };
    const client = new QuickFiguresClient(factory, () => clock);
    const slow = client.estimate(demoPlan());
    clock = STALE_AFTER_MS + 1;
    const p = demoPlan();
    p.matching.caliper = 0.3;
    void client.estimate(p);
    expect(await slow).toBeNull();
    expect(terminated).toBe(1);
    expect(created).toBe(2);
    expect(sent.map((m) => m.plan.matching.caliper)).toEqual([0.2, 0.3]);
  });
});
