import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import {
  addCovariate,
  canonicalField,
  cellOfField,
  covariateFieldLabel,
  covariatesToDraft,
  moveCovariate,
  removeCovariate,
  setCorrelationText,
  type CovariatesPart,
} from '../../src/state/covariateDraft';
import { AUTOSAVE_KEY } from '../../src/state/persistenceSlice';
import { draftToCandidate, planToDraft } from '../../src/state/planDraft';
import { makeStore, memoryStorage } from './helpers';

/** A demo plan with two covariates (an invented scenario, numbers made up for the test). */
function planWithCovariates(): Plan {
  return {
    ...demoPlan(),
    covariates: [
      { name: 'Attendance', programmeMean: 80, comparisonMean: 85, sd: 10, reliability: 0.7, outcomeCorrelation: 0.3, measured: true, exact: false },
      { name: 'Deprivation', programmeMean: 0.4, comparisonMean: 0, sd: 1, reliability: 1, outcomeCorrelation: -0.2, measured: false, exact: false },
    ],
    covariateCorrelations: [
      [1, 0.4, -0.3],
      [0.4, 1, -0.1],
      [-0.3, -0.1, 1],
    ],
  };
}

/** Every structural rule the matrix must keep: square (1 + k), ones on the diagonal, symmetric text. */
function expectConsistent(part: CovariatesPart) {
  const n = part.covariates.length + 1;
  expect(part.covariateCorrelations).toHaveLength(n);
  part.covariateCorrelations.forEach((row, i) => {
    expect(row).toHaveLength(n);
    expect(row[i]).toBe('1');
    row.forEach((cell, j) => expect(cell).toBe(part.covariateCorrelations[j]![i]));
  });
}

describe('covariate draft: the list and the matrix stay consistent', () => {
  it('a plan without covariates gives an empty list, a 1 × 1 matrix, and the same candidate as before', () => {
    const draft = planToDraft(demoPlan());
    expect(draft.covariates).toEqual([]);
    expect(draft.covariateCorrelations).toEqual([['1']]);
    expect(draft.matching.distance).toBe('pretest');
    const { candidate, problems } = draftToCandidate(draft);
    expect(problems).toEqual([]);
    // No covariate keys and no distance: the plan is exactly the one-covariate plan.
    expect(candidate).not.toHaveProperty('covariates');
    expect(candidate).not.toHaveProperty('covariateCorrelations');
    expect((candidate as { matching: object }).matching).not.toHaveProperty('distance');
  });

  it('round-trips covariates, flags and the matrix through the draft', () => {
    const plan = { ...planWithCovariates(), matching: { ...demoPlan().matching, distance: 'propensity' as const } };
    const draft = planToDraft(plan);
    expect(draft.covariates[0]).toEqual({
      name: 'Attendance', programmeMean: '80', comparisonMean: '85', sd: '10', reliability: '0.7', outcomeCorrelation: '0.3', measured: true, exact: false,
    });
    expect(draft.covariateCorrelations[0]).toEqual(['1', '0.4', '-0.3']);
    const { candidate, problems } = draftToCandidate(draft);
    expect(problems).toEqual([]);
    const c = candidate as Plan;
    expect(c.covariates).toEqual(plan.covariates);
    expect(c.covariateCorrelations).toEqual(plan.covariateCorrelations);
    expect(c.matching.distance).toBe('propensity');
  });

  it('adding a covariate grows the matrix by a row and column of zeros and keeps typed text', () => {
    let part: CovariatesPart = covariatesToDraft(planWithCovariates());
    part = setCorrelationText(part, 0, 1, '0.4x');
    part = addCovariate(part);
    expectConsistent(part);
    expect(part.covariates).toHaveLength(3);
    expect(part.covariates[2]!.name).toBe('Covariate 3');
    expect(part.covariateCorrelations[3]).toEqual(['0', '0', '0', '1']);
    expect(part.covariateCorrelations[0]![1]).toBe('0.4x');
  });

  it('removing a covariate drops exactly its row and column', () => {
    const part = removeCovariate(covariatesToDraft(planWithCovariates()), 0);
    expectConsistent(part);
    expect(part.covariates.map((c) => c.name)).toEqual(['Deprivation']);
    // Pretest–Deprivation (−0.3) stays with its pair.
    expect(part.covariateCorrelations).toEqual([
      ['1', '-0.3'],
      ['-0.3', '1'],
    ]);
  });

  it('moving a covariate permutes its row and column with it (pretest stays first)', () => {
    const part = moveCovariate(covariatesToDraft(planWithCovariates()), 1, -1);
    expectConsistent(part);
    expect(part.covariates.map((c) => c.name)).toEqual(['Deprivation', 'Attendance']);
    expect(part.covariateCorrelations).toEqual([
      ['1', '-0.3', '0.4'],
      ['-0.3', '1', '-0.1'],
      ['0.4', '-0.1', '1'],
    ]);
    // Past either end: unchanged (same object).
    expect(moveCovariate(part, 0, -1)).toBe(part);
    expect(moveCovariate(part, 1, 1)).toBe(part);
  });

  it('keeps every pair of variables with its correlation under any sequence of edits (property)', () => {
    // Each variable gets an id; a cell's text names its pair, so any mix-up shows.
    type Op = { kind: 'add' } | { kind: 'remove'; at: number } | { kind: 'move'; at: number; step: -1 | 1 };
    const op = fc.oneof(
      fc.constant<Op>({ kind: 'add' }),
      fc.nat(7).map<Op>((at) => ({ kind: 'remove', at })),
      fc.tuple(fc.nat(7), fc.constantFrom<-1 | 1>(-1, 1)).map<Op>(([at, step]) => ({ kind: 'move', at, step })),
    );
    fc.assert(
      fc.property(fc.array(op, { maxLength: 25 }), (ops) => {
        let part: CovariatesPart = { covariates: [], covariateCorrelations: [['1']] };
        let next = 0;
        for (const o of ops) {
          const k = part.covariates.length;
          if (o.kind === 'add') {
            if (k >= 8) continue;
            part = addCovariate(part);
            const id = `v${next++}`;
            part.covariates[k]!.name = id;
            for (let i = 0; i < k + 1; i++) part = setCorrelationText(part, i, k + 1, `${matrixId(part, i)}~${id}`);
          } else if (k > 0 && o.kind === 'remove') {
            part = removeCovariate(part, o.at % k);
          } else if (k > 0 && o.kind === 'move') {
            part = moveCovariate(part, o.at % k, o.step);
          }
          expectConsistent(part);
          const n = part.covariates.length + 1;
          for (let i = 0; i < n; i++) {
            for (let j = i + 1; j < n; j++) {
              const text = part.covariateCorrelations[i]![j]!;
              const pair = new Set(text.split('~'));
              expect(pair).toEqual(new Set([matrixId(part, i), matrixId(part, j)]));
            }
          }
        }
      }),
      { numRuns: 200 },
    );
  });

  it('names fields and cells for messages, and treats (i, j) and (j, i) as one cell', () => {
    const part = covariatesToDraft(planWithCovariates());
    expect(covariateFieldLabel('covariates.1.sd', part.covariates)).toBe('Covariate 2 (Deprivation) SD');
    expect(covariateFieldLabel('covariateCorrelations.2.0', part.covariates)).toBe('Correlation of Pretest and Deprivation');
    expect(canonicalField('covariateCorrelations.2.1')).toBe('covariateCorrelations.1.2');
    expect(canonicalField('pretest.reliability')).toBe('pretest.reliability');
    expect(cellOfField('covariateCorrelations.2.1')).toEqual([1, 2]);
    expect(cellOfField('covariates.1.sd')).toBeNull();
    expect(() => setCorrelationText(part, 1, 1, '0.5')).toThrow(/diagonal/);
    expect(() => removeCovariate(part, 5)).toThrow(/no covariate number 6; the plan has 2/);
  });
});

function matrixId(part: CovariatesPart, i: number): string {
  return i === 0 ? 'pre' : part.covariates[i - 1]!.name;
}

describe('covariate editing on a plain store', () => {
  it('adding a neutral covariate keeps the plan valid and the closed-form results unchanged', () => {
    const store = makeStore();
    const before = store.getState().analytic!.analyses;
    store.getState().addCovariate();
    const s = store.getState();
    expect(s.problems).toEqual([]);
    expect(s.validPlan.covariates).toHaveLength(1);
    expect(s.validPlan.covariateCorrelations).toEqual([
      [1, 0],
      [0, 1],
    ]);
    // A covariate with no group gap, uncorrelated with everything, changes no
    // expected estimate (the bias formula's Delta term is zero for it; computed).
    // Tolerance 1e-9 points: exact algebra on doubles.
    for (const id of ['matchedDifference', 'ancova', 'gainScore', 'correctedAncova'] as const) {
      expect(Math.abs(s.analytic!.analyses[id]!.expectedEstimate - before[id]!.expectedEstimate)).toBeLessThan(1e-9);
    }
  });

  it('typing in a cell fills its mirror and keeps the text as typed, even when it is not a number', () => {
    const store = makeStore();
    store.getState().addCovariate();
    store.getState().setCorrelation(1, 0, '0,35');
    let s = store.getState();
    expect(s.draft.covariateCorrelations[0]![1]).toBe('0,35');
    expect(s.draft.covariateCorrelations[1]![0]).toBe('0,35');
    expect(s.validPlan.covariateCorrelations![0]![1]).toBe(0.35);
    expect(s.validPlan.covariateCorrelations![1]![0]).toBe(0.35);
    store.getState().setCorrelation(0, 1, 'abc');
    s = store.getState();
    expect(s.draft.covariateCorrelations[1]![0]).toBe('abc');
    expect(s.problems).toEqual([
      { field: 'covariateCorrelations.0.1', message: 'Correlation of Pretest and Covariate 1 must be a number; got "abc".' },
    ]);
    expect(s.analyticStale).toBe(true);
  });

  it('reports an out-of-range cell once (not once per mirror), under the upper-triangle path', () => {
    const store = makeStore();
    store.getState().addCovariate();
    store.getState().setCorrelation(1, 0, '1.5');
    const cellProblems = store.getState().problems.filter((p) => p.field.startsWith('covariateCorrelations'));
    expect(cellProblems).toHaveLength(1);
    expect(cellOfField(cellProblems[0]!.field)).toEqual([0, 1]);
    expect(cellProblems[0]!.message).toContain('1.5');
  });

  it('maps covariate field problems to their row, with item numbers', () => {
    const store = makeStore();
    store.getState().addCovariate();
    store.getState().addCovariate();
    store.getState().setField('covariates.1.sd', '-2');
    store.getState().setField('covariates.0.reliability', '');
    const byField = Object.fromEntries(store.getState().problems.map((p) => [p.field, p.message]));
    expect(byField['covariates.1.sd']).toMatch(/^Covariate 2 SD must be a number from 0\.000001 to 1000000; got -2\./);
    expect(byField['covariates.0.reliability']).toBe('Covariate 1 reliability is required.');
    // The typed text is still there after an unrelated structural edit.
    store.getState().moveCovariate(1, -1);
    const s = store.getState();
    expect(s.draft.covariates[0]!.sd).toBe('-2');
    expect(s.draft.covariates[1]!.reliability).toBe('');
    // Problems follow the rows they belong to.
    const fields = s.problems.map((p) => p.field);
    expect(fields).toEqual(expect.arrayContaining(['covariates.0.sd', 'covariates.1.reliability']));
  });

  it('removing the last covariate returns exactly the plan without covariates', () => {
    const store = makeStore();
    const plain = store.getState().validPlan;
    store.getState().addCovariate();
    store.getState().removeCovariate(0);
    const s = store.getState();
    expect(s.draft.covariateCorrelations).toEqual([['1']]);
    expect(s.validPlan).toEqual(plain);
  });

  it('loads a plan with covariates and sets the matching distance', () => {
    const store = makeStore();
    store.getState().replacePlan(planWithCovariates());
    store.getState().setField('matching.distance', 'mahalanobis');
    const s = store.getState();
    expect(s.draft.covariates.map((c) => c.name)).toEqual(['Attendance', 'Deprivation']);
    expect(s.validPlan.matching.distance).toBe('mahalanobis');
    store.getState().setField('covariates.1.measured', true);
    expect(store.getState().draft.covariates[1]!.measured).toBe(true);
  });

  it('restores an autosave written before covariates existed, with no covariates and distance "pretest"', () => {
    const storage = memoryStorage();
    const old = planToDraft(demoPlan()) as unknown as Record<string, unknown>;
    delete old.covariates;
    delete old.covariateCorrelations;
    delete (old.matching as Record<string, unknown>).distance;
    old.title = 'Saved before covariates';
    storage.setItem(AUTOSAVE_KEY, JSON.stringify({ version: 1, draft: old }));
    const store = makeStore({ storage });
    const s = store.getState();
    expect(s.draft.title).toBe('Saved before covariates');
    expect(s.draft.covariates).toEqual([]);
    expect(s.draft.covariateCorrelations).toEqual([['1']]);
    expect(s.draft.matching.distance).toBe('pretest');
    expect(s.problems).toEqual([]);
  });

  it('autosaves covariate text as typed and restores it', () => {
    const storage = memoryStorage();
    const a = makeStore({ storage });
    a.getState().addCovariate();
    a.getState().setField('covariates.0.name', 'Attendance');
    a.getState().setCorrelation(0, 1, '0.');
    const b = makeStore({ storage });
    expect(b.getState().draft.covariates[0]!.name).toBe('Attendance');
    expect(b.getState().draft.covariateCorrelations[1]![0]).toBe('0.');
  });
});
