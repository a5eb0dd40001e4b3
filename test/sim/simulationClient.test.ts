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

/** A worker that stays silent until the test speaks for it, and timers the test fires by hand. */
function silentWorker() {
  const workers: ReturnType<WorkerFactory>[] = [];
  const terminated: number[] = [];
  const sent: ToWorker[] = [];
  const factory: WorkerFactory = () => {
    const index = workers.length;
    const w: ReturnType<WorkerFactory> = {
      onmessage: null,
      onerror: null,
      onmessageerror: null,
      terminate: () => void terminated.push(index),
      postMessage: (msg: ToWorker) => void sent.push(msg),
    };
    workers.push(w);
    return w;
  };
  const timers: { fn: () => void; ms: number; cleared: boolean }[] = [];
  const limits = {
    setTimer: (fn: () => void, ms: number) => {
      timers.push({ fn, ms, cleared: false });
      return timers.length - 1;
    },
    clearTimer: (h: unknown) => {
      timers[h as number]!.cleared = true;
    },
  };
  const live = () => timers.filter((t) => !t.cleared);
  const emit = (m: FromWorker, i = workers.length - 1) => workers[i]!.onmessage?.({ data: m } as MessageEvent<FromWorker>);
  return { factory, workers, terminated, sent, limits, live, emit };
}

const estimateOf = (secondsPerReplication: number) => ({
  seconds: secondsPerReplication * 10,
  secondsPerReplication,
  pilotReplications: 3,
  pilotSeconds: 3 * secondsPerReplication,
  replications: 10,
  method: 'timed the first 3 of 10 replications on this device and scaled their pace to the rest',
});

describe('SimulationClient: a worker that ends silently or sends something unreadable', () => {
  it('calls a run stalled when nothing arrives within the silence limit, terminates the worker and uses a fresh one next time', async () => {
    const w = silentWorker();
    const client = new SimulationClient(w.factory, { ...w.limits, startMs: 120_000, runningMs: 30_000 });
    const run = client.run(plan);
    expect(w.live().map((t) => t.ms)).toEqual([120_000]); // before the estimate: the start allowance
    w.live()[0]!.fn(); // the allowance passes with no word from the worker
    const err = (await run.catch((e: unknown) => e)) as SimulationError;
    expect(err).toBeInstanceOf(SimulationError);
    expect(err.reason).toBe('stalled');
    expect(err.message).toMatch(/^The simulation stopped responding: nothing was heard from it for 120 s, so the browser has most likely ended it/);
    expect(err.message).toContain('Run it again');
    expect(w.terminated).toEqual([0]);
    expect(client.busy).toBe(false);
    void client.run(plan).catch(() => undefined);
    expect(w.workers).toHaveLength(2);
    client.cancel();
  });

  it('restarts the timer on every message; after the estimate it allows max(30 s, 10 replications)', async () => {
    const w = silentWorker();
    const client = new SimulationClient(w.factory, { ...w.limits, startMs: 120_000, runningMs: 30_000 });
    const run = client.run(plan);
    const runId = (w.sent[0] as { runId: number }).runId;
    const seen: number[] = [];
    const run2 = client.run(plan, undefined, { onEstimate: (e) => seen.push(e.secondsPerReplication) });
    await expect(run).rejects.toMatchObject({ reason: 'cancelled' });
    const id2 = (w.sent[2] as { runId: number }).runId;
    expect(id2).toBe(runId + 1);
    w.emit({ type: 'estimate', runId: id2, estimate: estimateOf(5) });
    expect(seen).toEqual([5]);
    expect(w.live().map((t) => t.ms)).toEqual([50_000]); // 10 × 5 s > 30 s (definition above)
    w.emit({ type: 'progress', runId: id2, done: 4, total: 10 });
    expect(w.live().map((t) => t.ms)).toEqual([50_000]); // restarted, one timer live
    w.emit({ type: 'result', runId: id2, result: simulatePlan(plan) });
    await expect(run2).resolves.toMatchObject({ replications: 10 });
    expect(w.live()).toHaveLength(0); // no timer left behind
  });

  it('rejects in plain words on messageerror and on the worker error event', async () => {
    const w = silentWorker();
    const client = new SimulationClient(w.factory, w.limits);
    const first = client.run(plan);
    w.workers[0]!.onmessageerror?.({} as MessageEvent);
    await expect(first).rejects.toMatchObject({
      reason: 'failed',
      message: 'The simulation sent back a message this page could not read, so its results are lost. Run it again; if this keeps happening, reload the page.',
    });
    const second = client.run(plan);
    w.workers[1]!.onerror?.({ message: 'out of memory' } as ErrorEvent);
    await expect(second).rejects.toMatchObject({ reason: 'failed', message: 'The simulation stopped unexpectedly: out of memory.' });
    expect(w.terminated).toEqual([0, 1]);
    expect(w.live()).toHaveLength(0);
  });

  it('passes maxSeconds to the worker and rejects as too long with the estimate', async () => {
    const w = silentWorker();
    const client = new SimulationClient(w.factory, w.limits);
    const run = client.run(plan, undefined, { maxSeconds: 600 });
    const msg = w.sent[0] as Extract<ToWorker, { type: 'run' }>;
    expect(msg.maxSeconds).toBe(600);
    expect('onEstimate' in msg).toBe(false); // functions never cross to the worker
    w.emit({ type: 'too-long', runId: msg.runId, estimate: estimateOf(90) });
    const err = (await run.catch((e: unknown) => e)) as SimulationError;
    expect(err.reason).toBe('too-long');
    expect(err.estimate?.seconds).toBe(900);
  });
});
