import { describe, expect, it } from 'vitest';
import { DEMO_PLAN } from '../../src/io/demoPlan';
import { makeStore } from './helpers';

// Tolerance for closed-form checks: 1e-9 points. The formulas are exact
// algebra on doubles; anything beyond rounding noise would be a real error.
const TOL = 1e-9;

describe('draft slice: typing, validation and analytic results', () => {
  it('starts from the demo plan with analytic results that match the published closed form', () => {
    const store = makeStore();
    const s = store.getState();
    expect(s.problems).toEqual([]);
    expect(s.analyticStale).toBe(false);
    expect(s.validPlan).toEqual(expect.objectContaining({ title: DEMO_PLAN.title }));
    // Demo: equal SDs 10, reliability .75 estimated with SD 10 → SEM = 10·sqrt(.25) = 5
    // (Lord & Novick 1968, SEM = SD·sqrt(1 − rho)), within-group reliability .75.
    expect(s.analytic!.reliability.sem).toBeCloseTo(5, 9);
    expect(s.analytic!.reliability.comparison).toBeCloseTo(0.75, 9);
    // beta = r·SDy/(SDx·rho) = .6·10/(10·.75) = 0.8; matched-difference bias
    // = beta(1 − rho)·Delta = 0.8·0.25·(44 − 54) = −2 points
    // (Thorndike 1942; closed form in REFERENCES.md, computed).
    expect(Math.abs(s.analytic!.analyses.matchedDifference!.bias - -2)).toBeLessThan(TOL);
  });

  it('recomputes the analytic results on every valid change', () => {
    const store = makeStore();
    store.getState().setField('pretest.reliability', '0.9');
    const s = store.getState();
    expect(s.problems).toEqual([]);
    expect(s.validPlan.pretest.reliability).toBe(0.9);
    // rho .9 → beta = .6·10/(10·.9) = 2/3; bias = (2/3)(.1)(−10) = −0.6667 (same closed form, computed).
    expect(Math.abs(s.analytic!.analyses.matchedDifference!.bias - -2 / 3)).toBeLessThan(TOL);
    // Gain score: (beta − 1)·Delta = (−1/3)(−10) = +3.3333 (Campbell & Erlebacher 1970 closed form, computed).
    expect(Math.abs(s.analytic!.analyses.gainScore!.bias - 10 / 3)).toBeLessThan(TOL);
  });

  it('keeps an invalid reliability exactly as typed, explains it, and marks the old results stale', () => {
    const store = makeStore();
    const before = store.getState().analytic;
    const validBefore = store.getState().validPlan;
    store.getState().setField('pretest.reliability', '1.4');
    const s = store.getState();
    expect(s.draft.pretest.reliability).toBe('1.4');
    const p = s.problems.find((x) => x.field === 'pretest.reliability');
    expect(p?.message).toMatch(/between 0 and 1/);
    expect(p?.message).toContain('1.4');
    expect(s.analytic).toBe(before);
    expect(s.analyticStale).toBe(true);
    expect(s.validPlan).toBe(validBefore);
  });

  it('says "must be a number" for text that is not a number, and keeps the text', () => {
    const store = makeStore();
    store.getState().setField('matching.caliper', '0.2x');
    const s = store.getState();
    expect(s.draft.matching.caliper).toBe('0.2x');
    expect(s.problems).toContainEqual({ field: 'matching.caliper', message: 'Caliper must be a number; got "0.2x".' });
  });

  it('reports all problems at once, one message per field', () => {
    const store = makeStore();
    store.getState().setField('pretest.reliability', '1.4');
    store.getState().setField('groups.programme.poolSize', '');
    store.getState().setField('outcome.posttestSD', '-3');
    const fields = store.getState().problems.map((p) => p.field);
    expect(fields).toEqual(expect.arrayContaining(['pretest.reliability', 'groups.programme.poolSize', 'outcome.posttestSD']));
    expect(new Set(fields).size).toBe(fields.length);
  });

  it('flags a pre–post correlation above the square root of the reliability (Spearman 1904)', () => {
    const store = makeStore();
    // sqrt(.75) = .866: r = .9 is impossible (attenuation bound, Spearman 1904).
    store.getState().setField('outcome.prePostCorrelation', '0.9');
    const p = store.getState().problems.find((x) => x.field === 'outcome.prePostCorrelation');
    expect(p?.message).toMatch(/correlation/i);
    expect(store.getState().analyticStale).toBe(true);
  });

  it('clears the stale mark once the field is fixed', () => {
    const store = makeStore();
    store.getState().setField('pretest.reliability', '1.4');
    store.getState().setField('pretest.reliability', '0.8');
    const s = store.getState();
    expect(s.problems).toEqual([]);
    expect(s.analyticStale).toBe(false);
    expect(s.validPlan.pretest.reliability).toBe(0.8);
  });

  it('switches between reliability and SEM without losing either text', () => {
    const store = makeStore();
    store.getState().setPretestMode('sem');
    store.getState().setField('pretest.sem', '5');
    let s = store.getState();
    expect(s.validPlan.pretest).toEqual({ sem: 5 });
    // SEM 5 with SD 10 is the same instrument as reliability .75 at SD 10 (Lord & Novick 1968): same bias, −2.
    expect(Math.abs(s.analytic!.analyses.matchedDifference!.bias - -2)).toBeLessThan(TOL);
    store.getState().setPretestMode('reliability');
    s = store.getState();
    expect(s.draft.pretest.reliability).toBe('0.75');
    expect(s.draft.pretest.sem).toBe('5');
    expect(s.validPlan.pretest.reliability).toBe(0.75);
  });

  it('accepts a decimal comma as typed by many researchers', () => {
    const store = makeStore();
    store.getState().setField('pretest.reliability', '0,9');
    expect(store.getState().draft.pretest.reliability).toBe('0,9');
    expect(store.getState().validPlan.pretest.reliability).toBe(0.9);
  });

  it('rejects an unknown field path with a clear message', () => {
    const store = makeStore();
    expect(() => store.getState().setField('pretest.colour', 'x')).toThrow(/Unknown plan field "pretest.colour"/);
  });
});
