import { describe, expect, it } from 'vitest';
import { SimulationClient, SimulationError, type WorkerFactory } from '../../src/sim/simulationClient';
import type { FromWorker, ToWorker } from '../../src/sim/protocol';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { testPlan } from './planFixtures';

/**
 * A stand-in worker that runs the real engine synchronously on 'run' (jsdom and
 * Node have no Worker; the real worker is exercised in the browser). It records
 * what it was sent so the protocol can be checked.
 */
function fakeWorker(opts: { fail?: string; hold?: boolean } = {}) {
  const sent: ToWorker[] = [];
  let created = 0;
  let deliver: (() => void) | null = null;
  const factory: WorkerFactory = () => {
    created++;
    const w: ReturnType<WorkerFactory> = {
      onmessage: null,
      onerror: null,
      terminate: () => undefined,
      postMessage: (msg: ToWorker) => {
        sent.push(msg);
        if (msg.type !== 'run') return;
        const emit = (m: FromWorker) => w.onmessage?.({ data: m } as MessageEvent<FromWorker>);
        const go = () => {
          emit({ type: 'progress', runId: msg.runId, done: 0, total: msg.plan.simulation.replications });
          if (opts.fail) emit({ type: 'error', runId: msg.runId, message: opts.fail });
          else emit({ type: 'result', runId: msg.runId, result: simulatePlan(msg.plan) });
        };
        if (opts.hold) deliver = go;
        else queueMicrotask(go);
      },
    };
    return w;
  };
  return { factory, sent, created: () => created, release: () => deliver?.() };
}

const plan = testPlan({ nP: 20, nC: 80, replications: 10 });

describe('SimulationClient (main-thread wrapper of the worker protocol)', () => {
  it('creates the worker lazily, reports progress and resolves with the engine’s result', async () => {
    const w = fakeWorker();
    const client = new SimulationClient(w.factory);
    expect(w.created()).toBe(0);
    const progress: number[] = [];
    const result = await client.run(plan, (done, total) => progress.push(done / total));
    expect(w.created()).toBe(1);
    expect(progress).toEqual([0]);
    expect(result).toEqual(simulatePlan(plan));
    expect(client.busy).toBe(false);
  });

  it('a newer run supersedes an older one, which rejects as cancelled; stale messages are ignored', async () => {
    const w = fakeWorker({ hold: true });
    const client = new SimulationClient(w.factory);
    const first = client.run(plan);
    const second = client.run(plan);
    await expect(first).rejects.toMatchObject({ reason: 'cancelled', message: 'The simulation was cancelled.' });
    expect(w.sent.map((m) => m.type)).toEqual(['run', 'cancel', 'run']);
    w.release();
    await expect(second).resolves.toMatchObject({ replications: 10 });
  });

  it('passes the engine’s message through when the run fails', async () => {
    const client = new SimulationClient(fakeWorker({ fail: 'The caliper must be a positive number; got -1.' }).factory);
    const err = await client.run(plan).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(SimulationError);
    expect((err as SimulationError).reason).toBe('failed');
    expect((err as Error).message).toBe('The caliper must be a positive number; got -1.');
  });

  it('rejects with a readable message where there is no Worker (Node, jsdom)', async () => {
    await expect(new SimulationClient().run(plan)).rejects.toThrow(/cannot run the simulation in the background/);
  });
});
