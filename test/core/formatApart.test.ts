import { describe, expect, it } from 'vitest';
import { formatApart, requireOpenInterval, requirePositive, requireReliability } from '../../src/core/inputChecks';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { covariate, identity, planWithCovariates } from './multivariateFixture';

// Messages that state a limit and the value received must never show the two alike
// (common practice: give enough significant digits to tell them apart). Checks are exact strings.

describe('formatApart', () => {
  it('keeps the usual 3 decimals when the numbers already print differently', () => {
    expect(formatApart(0.3, 0.25)).toEqual(['0.3', '0.25']);
    expect(formatApart(2, 3)).toEqual(['2', '3']);
  });
  it('adds decimals until a limit and a value that differ print differently', () => {
    // sqrt(.75) = 0.8660254 (computed).
    expect(formatApart(Math.sqrt(0.75), 0.8661)).toEqual(['0.866', '0.8661']);
    expect(formatApart(Math.sqrt(0.75), 0.86603)).toEqual(['0.866025', '0.86603']);
    expect(formatApart(1, 0.99999)).toEqual(['1', '0.99999']);
  });
  it('equal numbers stay alike; a tiny negative is not shown as -0', () => {
    expect(formatApart(0.75, 0.75)).toEqual(['0.75', '0.75']);
    expect(formatApart(0, -0.0001)).toEqual(['0', '-0.0001']);
    expect(formatApart(-0.0001)).toEqual(['0']);
  });
  it('past 20 decimals falls back to the exact shortest form', () => {
    expect(formatApart(0, 1e-25)).toEqual(['0', '1e-25']);
  });
});

describe('range messages show the limit and the value apart', () => {
  it('pre–post correlation just above sqrt(reliability): "at most 0.866 … got 0.8661" (attenuation bound, Spearman 1904)', () => {
    const p = demoPlan(); // invented demo: comparison reliability .75 (SEM 5, SD 10)
    p.outcome.prePostCorrelation = 0.8661;
    const r = validatePlan(p);
    expect(r.ok).toBe(false);
    const msg = r.ok ? '' : r.problems.find((x) => x.field === 'outcome.prePostCorrelation')!.message;
    expect(msg).toContain('must be at most 0.866 in size');
    expect(msg).toContain('got 0.8661.');
  });
  it('the core input checks keep small values visible', () => {
    expect(() => requireOpenInterval(1, 0, 0.9999, 'The level')).toThrow('The level must be between 0 and 0.9999 (exclusive); got 1.');
    expect(() => requireOpenInterval(0.999991, 0.5, 0.99999, 'The level')).toThrow('between 0.5 and 0.99999 (exclusive); got 0.999991.');
    expect(() => requirePositive(-0.0001, 'The SD')).toThrow('The SD must be greater than 0; got -0.0001.');
    expect(() => requireReliability(1.00001, 'Reliability')).toThrow('must be between 0 and 1 (exclusive of 0); got 1.00001.');
  });
  it('an exactly matched covariate with reliability 0.9999: "must be 1; got 0.9999"', () => {
    const plan = planWithCovariates([covariate({ exact: true, reliability: 0.9999 })], identity(2));
    const r = validatePlan(plan);
    const msg = r.ok ? '' : r.problems.find((x) => x.field === 'covariates.0.reliability')!.message;
    expect(msg).toMatch(/its reliability must be 1; got 0\.9999\.$/);
  });
});
