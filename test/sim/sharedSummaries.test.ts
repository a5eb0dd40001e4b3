import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { AnalysisRecords, SLOT_GAIN } from '../../src/sim/analysisRecords';
import { countSelected, meanAndMCSE } from '../../src/sim/meanAndMCSE';
import { steppedSimulationRun } from '../../src/sim/steppedSimulationRun';
import { FLAG_COMPUTED, FLAG_COVERED, FLAG_REJECTED, FLAG_WRONG_SIGN } from '../../src/sim/summariseAnalysis';
import type { SimulationResult } from '../../src/sim/types';

describe('meanAndMCSE and countSelected (the Monte Carlo summaries both engines share)', () => {
  // Reference: jStat.mean and jStat.stdev(·, true) (sample SD, divisor c − 1); MCSE of a mean = sd / sqrt(c)
  // (Morris, White & Crowther 2019, Table 6). Tolerance 5e-13 absolute (toBeCloseTo 12 digits; values of order 1): rounding only.
  const values = Float64Array.from([2.5, -1, 4, 0.25, 7, 3, -2, 1.5]);
  it('over all replications', () => {
    const [mean, mcse] = meanAndMCSE(values, values.length);
    const all = Array.from(values);
    expect(mean).toBeCloseTo(jStat.mean(all), 12);
    expect(mcse).toBeCloseTo(jStat.stdev(all, true) / Math.sqrt(all.length), 12);
  });
  it('over the replications whose flag bit is set, two variables per replication (stride 2, offset 1)', () => {
    // ok holds [variable 0, variable 1] per replication; variable 1 has bit 2 set in replications 0, 2, 3, 6.
    const ok = Uint8Array.from([0, 2, 1, 0, 3, 2, 0, 3, 1, 1, 0, 0, 2, 2, 0, 1]);
    const picked = [0, 2, 3, 6].map((i) => values[i] as number);
    const select = { ok, bit: 2, stride: 2, offset: 1 };
    const [mean, mcse] = meanAndMCSE(values, values.length, select);
    expect(mean).toBeCloseTo(jStat.mean(picked), 12);
    expect(mcse).toBeCloseTo(jStat.stdev(picked, true) / Math.sqrt(picked.length), 12);
    expect(countSelected(values.length, select)).toBe(4);
    expect(countSelected(values.length, { ok, bit: 0 })).toBe(values.length);
  });
  it('none selected gives [0, 0]; one selected gives [value, 0] (definition)', () => {
    const ok = new Uint8Array(values.length);
    expect(meanAndMCSE(values, values.length, { ok, bit: 1 })).toEqual([0, 0]);
    ok[4] = 1;
    expect(meanAndMCSE(values, values.length, { ok, bit: 1 })).toEqual([7, 0]);
  });
});

describe('AnalysisRecords.record (coverage, rejection and wrong-sign flags)', () => {
  // Reference: t_{.975, 10} = 2.228139 (Student t table, df 10; common practice). Values chosen 0.02 or more
  // from the boundary, so rounding cannot flip a flag (tolerance: none, flags are exact).
  it('classifies estimates around the critical value, tau = 0 (a positive effect hoped for)', () => {
    const r = new AnalysisRecords(3, 0, 0.05);
    r.record(SLOT_GAIN, 0, 2.2, 1, 10);
    r.record(SLOT_GAIN, 1, 2.26, 1, 10);
    r.record(SLOT_GAIN, 2, -2.26, 1, 10);
    const f = r.flags[SLOT_GAIN] as Uint8Array;
    expect(f[0]).toBe(FLAG_COMPUTED | FLAG_COVERED);
    expect(f[1]).toBe(FLAG_COMPUTED | FLAG_REJECTED);
    expect(f[2]).toBe(FLAG_COMPUTED | FLAG_REJECTED | FLAG_WRONG_SIGN);
    expect(Array.from(r.est[SLOT_GAIN] as Float64Array)).toEqual([2.2, 2.26, -2.26]);
  });
  it('a negative tau makes a significant positive estimate the wrong sign, and coverage is about tau', () => {
    const r = new AnalysisRecords(1, -3, 0.05);
    r.record(SLOT_GAIN, 0, 2.3, 1, 10); // |2.3 − (−3)| = 5.3 > 2.228: not covered
    expect((r.flags[SLOT_GAIN] as Uint8Array)[0]).toBe(FLAG_COMPUTED | FLAG_REJECTED | FLAG_WRONG_SIGN);
  });
});

describe('steppedSimulationRun (chunked stepping both engines share)', () => {
  const result = {} as SimulationResult;
  it('runs each replication of each chunk, counts each once, and summarises only when all have run', () => {
    const seen: number[] = [];
    const run = steppedSimulationRun(4, 9, { run: (i) => seen.push(i) }, () => result);
    run.runChunk(2, 4);
    run.runChunk(0, 3);
    expect(seen).toEqual([2, 3, 0, 1, 2]);
    expect(run.completed).toBe(4);
    expect(run.seed).toBe(9);
    expect(run.finish()).toBe(result);
  });
  it('says how many have run when asked too early, and names a bad range', () => {
    const run = steppedSimulationRun(4, 1, { run: () => undefined }, () => result);
    run.runChunk(0, 1);
    expect(() => run.finish()).toThrow('Only 1 of 4 replications have run; cannot summarise yet.');
    expect(() => run.runChunk(3, 5)).toThrow('Replication range 3..5 is outside 0..4.');
  });
});
