import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { validatePlan } from '../../src/core/validatePlan';
import { SCREENED_READING_SUPPORT } from '../../src/io/examplePlans';

// A screener reliability far below a millionth makes the screener's SD infinite in floating point
// (found by the seeded plan fuzz at 5e-324): validation refuses it in plain words; a millionth and up
// is analysed with finite figures (common practice: every documented range must be computable).
describe('screener reliability near 0', () => {
  it('is refused below a millionth, with a plain message on the field', () => {
    const plan = structuredClone(SCREENED_READING_SUPPORT);
    plan.assignment!.screenerReliability = 5e-324;
    const v = validatePlan(plan);
    expect(v.ok).toBe(false);
    expect(!v.ok && v.problems).toEqual([
      {
        field: 'assignment.screenerReliability',
        message: 'Screener reliability must be at least 0.000001: a screener that measures nothing but error cannot be modelled; got 5e-324.',
      },
    ]);
  });

  it('is analysed at a millionth', () => {
    const plan = structuredClone(SCREENED_READING_SUPPORT);
    plan.assignment!.screenerReliability = 0.000001;
    const v = validatePlan(plan);
    if (!v.ok) throw new Error(v.problems.map((p) => p.message).join(' '));
    const r = analysePlan(v.plan);
    for (const [, a] of Object.entries(r.analyses)) expect(Number.isFinite(a!.bias)).toBe(true);
  });
});
