import { describe, expect, it } from 'vitest';
import { reliabilityToSem } from '../../src/core/reliabilityToSem';
import { semToReliability } from '../../src/core/semToReliability';
import { trueScoreSD } from '../../src/core/trueScoreSD';
import { withinGroupReliability } from '../../src/core/withinGroupReliability';
import { kelleyTrueScore } from '../../src/core/kelleyTrueScore';
import { spearmanBrown } from '../../src/core/spearmanBrown';
import { parallelFormsNeeded } from '../../src/core/parallelFormsNeeded';

// Tolerance: published check values are given to 3–4 decimals, so we compare
// at half a unit in the last published decimal (toBeCloseTo(v, d) checks |diff| < 0.5·10^-d).

describe('SEM and reliability (Lord & Novick 1968, eq. 3.8.4, from memory)', () => {
  it('SEM = SD·sqrt(1 − rho): rho .75, SD 10 → 5; rho .91, SD 15 → 4.5 (computed)', () => {
    expect(reliabilityToSem(0.75, 10)).toBeCloseTo(5, 12);
    expect(reliabilityToSem(0.91, 15)).toBeCloseTo(4.5, 12);
  });
  it('semToReliability inverts reliabilityToSem (common practice), tolerance 1e-12 (rounding only)', () => {
    for (const rho of [0.3, 0.5, 0.75, 0.9, 0.99, 1]) {
      expect(semToReliability(reliabilityToSem(rho, 12), 12)).toBeCloseTo(rho, 12);
    }
  });
  it('true-score SD: sqrt(10² − 6²) = 8 (Pythagorean check, computed)', () => {
    expect(trueScoreSD(10, 6)).toBeCloseTo(8, 12);
  });
  it('within-group reliability falls in a narrower group for the same SEM (common practice): SEM 5, SD 8 → 0.609375', () => {
    expect(withinGroupReliability(5, 8)).toBeCloseTo(1 - 25 / 64, 12);
    expect(withinGroupReliability(5, 8)).toBeLessThan(withinGroupReliability(5, 10));
  });
  it('rejects out-of-range input with specific messages', () => {
    expect(() => reliabilityToSem(1.4, 10)).toThrow('Reliability must be between 0 and 1 (exclusive of 0); got 1.4');
    expect(() => reliabilityToSem(0, 10)).toThrow(/exclusive of 0/);
    expect(() => reliabilityToSem(0.8, -3)).toThrow('The pretest SD must be greater than 0; got -3');
    expect(() => semToReliability(12, 10)).toThrow(/must be smaller than the pretest SD/);
    expect(() => trueScoreSD(10, 10)).toThrow(/nothing but error/);
    expect(() => reliabilityToSem(Number.NaN, 10)).toThrow(/finite number/);
  });
});

describe('Kelley (1947) estimated true score', () => {
  // REFERENCES.md (computed from Kelley's formula): rho .48, mean 105: 85 → 95.4, 145 → 124.2.
  // Tolerance 1e-9: exact arithmetic apart from floating-point rounding.
  it('85 → 95.4 and 145 → 124.2 with rho .48, mean 105', () => {
    expect(kelleyTrueScore(85, 0.48, 105)).toBeCloseTo(95.4, 9);
    expect(kelleyTrueScore(145, 0.48, 105)).toBeCloseTo(124.2, 9);
  });
  it('perfect reliability returns the observed score (Kelley 1947, limiting case)', () => {
    expect(kelleyTrueScore(130, 1, 100)).toBe(130);
  });
  it('rejects a reliability above 1', () => {
    expect(() => kelleyTrueScore(85, 1.2, 105)).toThrow(/between 0 and 1/);
  });
});

describe('Spearman (1910) – Brown (1910) prophecy', () => {
  // REFERENCES.md computed examples, published to 2–3 decimals; tolerance half a unit in the last decimal.
  it('.60, k = 2 → .75', () => expect(spearmanBrown(0.6, 2)).toBeCloseTo(0.75, 10));
  it('.80, k = 3 → .923', () => expect(spearmanBrown(0.8, 3)).toBeCloseTo(0.923, 3));
  it('.70, k = 1.5 → .778', () => expect(spearmanBrown(0.7, 1.5)).toBeCloseTo(0.778, 3));
  it('raising .5 to .8 needs k = 4 parallel forms', () => {
    const need = parallelFormsNeeded(0.5, 0.8);
    expect(need.exact).toBeCloseTo(4, 10);
    expect(need.forms).toBe(4);
  });
  it('non-integer k is rounded up: .6 → .9 needs exact 6, .7 → .9 needs 3.857 → 4 forms (computed)', () => {
    expect(parallelFormsNeeded(0.6, 0.9).forms).toBe(6);
    const n = parallelFormsNeeded(0.7, 0.9);
    expect(n.exact).toBeCloseTo((0.9 * 0.3) / (0.7 * 0.1), 10);
    expect(n.forms).toBe(4);
  });
  it('a target already met needs a single form', () => {
    expect(parallelFormsNeeded(0.9, 0.8).forms).toBe(1);
  });
  it('Cronbach (1951): alpha of k = 10 items with inter-item r = .4 equals Spearman–Brown of r: .8696', () => {
    // Cronbach, L. J. (1951), Psychometrika 16: standardised alpha = k r / (1 + (k − 1) r).
    // Independent route: alpha = k/(k−1)·(1 − Σ var_i / var_total) with unit item variances.
    const k = 10;
    const r = 0.4;
    const totalVar = k + k * (k - 1) * r;
    const alpha = (k / (k - 1)) * (1 - k / totalVar);
    expect(alpha).toBeCloseTo(0.8696, 4);
    expect(spearmanBrown(r, k)).toBeCloseTo(alpha, 12);
  });
  it('rejects an unreachable or invalid target', () => {
    expect(() => parallelFormsNeeded(0.5, 1)).toThrow(/cannot be reached/);
    expect(() => spearmanBrown(0.5, 0)).toThrow(/greater than 0/);
  });
});
