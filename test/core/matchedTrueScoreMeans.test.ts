import { describe, expect, it } from 'vitest';
import { matchedTrueScoreMeans } from '../../src/core/matchedTrueScoreMeans';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
import { demoPlan } from '../../src/io/demoPlan';
import type { Plan } from '../../src/core/plan';

/** A plan with equal SDs and a given within-group reliability (reference SD = group SD). */
function plan(meanP: number, meanC: number, sd: number, reliability: number): Plan {
  const p = demoPlan();
  p.groups.programme.pretestMean = meanP;
  p.groups.comparison.pretestMean = meanC;
  p.groups.programme.pretestSD = sd;
  p.groups.comparison.pretestSD = sd;
  p.pretest = { reliability, referenceSD: sd };
  p.outcome.prePostCorrelation = 0.5;
  return p;
}

// Tolerance 1e-9: the formulas are exact; only floating-point rounding differs.
const TOL = 9;

describe('matchedTrueScoreMeans', () => {
  it('reproduces the matched-groups regression effect: gap 15, reliability .9 → hidden gap 1.5', () => {
    // Thorndike 1942; Campbell & Erlebacher 1970 (REFERENCES.md, computed example):
    // at equal observed scores the true-score gap is (1 - rho)(mu_P - mu_C) = 0.1 × 15 = 1.5.
    const m = deriveModelParameters(plan(115, 100, 15, 0.9));
    const r = matchedTrueScoreMeans(m);
    expect(r.hiddenGap).toBeCloseTo(1.5, TOL);
    expect(r.observed.programme).toBe(r.observed.comparison);
  });

  it("matches Kelley's worked example for a given matched observed mean", () => {
    // Kelley 1947 (REFERENCES.md, computed): reliability .48, mean 105: x = 85 → 95.4, x = 145 → 124.2.
    // SD 20 so that SEM is small enough; within-group reliability = .48 by construction.
    const m = deriveModelParameters(plan(105, 105, 20, 0.48));
    const r = matchedTrueScoreMeans(m, { programme: 85, comparison: 145 });
    expect(r.trueScore.programme).toBeCloseTo(95.4, TOL);
    expect(r.trueScore.comparison).toBeCloseTo(124.2, TOL);
  });

  it('pulls each group back toward its own mean (demo plan: comparison 46.5 at x = 44)', () => {
    // Kelley 1947: 54 + .75 (44 - 54) = 46.5, computed by hand.
    const r = matchedTrueScoreMeans(deriveModelParameters(demoPlan()));
    expect(r.trueScore.programme).toBeCloseTo(44, TOL);
    expect(r.trueScore.comparison).toBeCloseTo(46.5, TOL);
  });

  it('rejects a non-finite matched mean with a readable message', () => {
    const m = deriveModelParameters(demoPlan());
    expect(() => matchedTrueScoreMeans(m, { programme: Number.NaN, comparison: 40 })).toThrow(
      /matched programme members' mean pretest must be a finite number/,
    );
  });
});
