import { describe, expect, it } from 'vitest';
import { outcomeSlope } from '../../src/core/outcomeSlope';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
import { demoPlan } from '../../src/io/demoPlan';

describe('outcome slope on the true pretest (Spearman 1904 attenuation; Lord & Novick 1968)', () => {
  it('SD 10, rho .75, SD_Y 10, r .6 → beta 0.8, residual SD sqrt(52) (computed); tolerance 1e-12', () => {
    const o = outcomeSlope(10, 0.75, 10, 0.6);
    expect(o.beta).toBeCloseTo(0.8, 12);
    expect(o.residualSD).toBeCloseTo(Math.sqrt(52), 12);
  });
  it('reproduces the observed correlation: cov(X,Y)/(SD_X SD_Y) = beta·rho·SD_X/SD_Y = r (definition)', () => {
    for (const [sx, rho, sy, r] of [
      [10, 0.8, 15, 0.7],
      [4, 0.6, 2, -0.5],
      [20, 0.95, 9, 0.9],
    ] as const) {
      const o = outcomeSlope(sx, rho, sy, r);
      const trueVar = rho * sx * sx;
      expect((o.beta * trueVar) / (sx * sy)).toBeCloseTo(r, 12);
      // total posttest variance is recovered: beta² var(T) + residual var = SD_Y²
      expect(o.beta ** 2 * trueVar + o.residualSD ** 2).toBeCloseTo(sy * sy, 9);
    }
  });
  it('r² > rho throws the explanatory message', () => {
    expect(() => outcomeSlope(10, 0.49, 10, 0.8)).toThrow(
      /cannot exceed the square root of its reliability \(0\.7\)/,
    );
  });
  it('deriveModelParameters uses it and keeps its message for an impossible plan', () => {
    const plan = demoPlan();
    plan.outcome.prePostCorrelation = 0.95;
    expect(() => deriveModelParameters(plan)).toThrow(/A pre–post correlation of 0.95 is impossible/);
  });
  it('demo plan: SEM 5, within-group reliability .75, beta 0.8 (computed from the invented plan)', () => {
    const m = deriveModelParameters(demoPlan());
    expect(m.sem).toBeCloseTo(5, 12);
    expect(m.reliability.comparison).toBeCloseTo(0.75, 12);
    expect(m.beta).toBeCloseTo(0.8, 12);
  });
});
