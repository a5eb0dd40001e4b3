import LogisticRegression from 'ml-logistic-regression';
import { Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { fitLogisticRegression } from '../../src/sim/multivariate/fitLogisticRegression';
import { NormalSampler } from '../../src/sim/normalSampler';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';

describe('fitLogisticRegression', () => {
  it('reproduces the log odds ratio of a 2 × 2 table (saturated model)', () => {
    // Agresti (2013), Categorical Data Analysis, 3rd ed., sec. 5.1 (from memory): with one binary
    // predictor the ML slope is the sample log odds ratio and the intercept the logit at x = 0.
    // Invented table: x = 0: 10 of 40 have y = 1; x = 1: 30 of 40.
    const x = new Float64Array(80);
    const y = new Uint8Array(80);
    for (let i = 0; i < 40; i++) y[i] = i < 10 ? 1 : 0;
    for (let i = 40; i < 80; i++) {
      x[i] = 1;
      y[i] = i < 70 ? 1 : 0;
    }
    const fit = fitLogisticRegression([x], y, 80);
    // Tolerance 1e-8: the Newton iteration converges quadratically to the exact value.
    expect(fit.coefficients[0]).toBeCloseTo(Math.log(10 / 30), 8);
    expect(fit.coefficients[1]).toBeCloseTo(Math.log((30 / 10) / (10 / 30)), 8); // log 9
    // Deviance of the saturated 2-group model: -2 Σ y log p + (1-y) log(1-p) with p = .25, .75 (computed).
    const ll = 2 * (10 * Math.log(0.25) + 30 * Math.log(0.75));
    expect(fit.deviance).toBeCloseTo(-2 * ll, 8);
  });

  it('solves the score equations X\'(y − p) = 0 at the estimate (definition of the MLE)', () => {
    // McCullagh & Nelder (1989), sec. 4.4: the ML estimate of a logistic regression solves
    // Σ (y_i − p_i) x_ij = 0 for every column j (and the intercept). Invented data: three correlated
    // normal covariates, membership drawn from a known logistic model. Tolerance 1e-7 × n.
    const n = 600;
    const rng = Xoshiro128StarStar.forReplication(99, 0);
    const z = new NormalSampler(rng);
    const cols = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
    const y = new Uint8Array(n);
    for (let i = 0; i < n; i++) {
      const a = z.next();
      const b = 0.5 * a + z.next();
      const c = 100 + 15 * z.next();
      cols[0]![i] = a;
      cols[1]![i] = b;
      cols[2]![i] = c;
      const eta = -0.4 + 0.8 * a - 0.5 * b + 0.02 * (c - 100);
      y[i] = rng.nextFloat() < 1 / (1 + Math.exp(-eta)) ? 1 : 0;
    }
    const logit = new Float64Array(n);
    const fit = fitLogisticRegression(cols, y, n, { linearPredictor: logit });
    const score = new Float64Array(4);
    for (let i = 0; i < n; i++) {
      const eta = fit.coefficients[0]! + fit.coefficients[1]! * cols[0]![i]! + fit.coefficients[2]! * cols[1]![i]! + fit.coefficients[3]! * cols[2]![i]!;
      // The returned logits are the fitted linear predictor (tolerance 1e-9).
      expect(Math.abs(logit[i]! - eta)).toBeLessThan(1e-9);
      const r = y[i]! - 1 / (1 + Math.exp(-eta));
      score[0]! += r;
      score[1]! += r * cols[0]![i]!;
      score[2]! += r * cols[1]![i]!;
      score[3]! += r * (cols[2]![i]! - 100); // centred: the same equation as for column 3, given the intercept's
    }
    for (const s of score) expect(Math.abs(s)).toBeLessThan(1e-7 * n);
    // The generating slopes are recovered within sampling error (about 3 SEs; SE ≈ 0.1 here, computed roughly).
    expect(fit.coefficients[1]).toBeGreaterThan(0.8 - 0.45);
    expect(fit.coefficients[1]).toBeLessThan(0.8 + 0.45);
    expect(fit.iterations).toBeLessThan(10);
  });

  it('agrees with a general-purpose reference implementation (ml-logistic-regression 2.0.0, npm)', () => {
    // The reference maximises the same likelihood by plain gradient ascent (fixed step, fixed number of steps;
    // one-vs-all, whose first classifier models P(y = 1) for two classes). Invented data: 200 people, two
    // standardised covariates. Gradient ascent stops short of the exact maximum; 2,000 steps of 0.01 (stable:
    // below 2 / the largest eigenvalue of X'WX, about 75 here) bring it within 1e-6, the tolerance on each
    // coefficient (log-odds units).
    const n = 200;
    const rng = Xoshiro128StarStar.forReplication(7, 0);
    const z = new NormalSampler(rng);
    const a = new Float64Array(n);
    const b = new Float64Array(n);
    const y = new Uint8Array(n);
    for (let i = 0; i < n; i++) {
      a[i] = z.next();
      b[i] = 0.4 * a[i]! + 0.9 * z.next();
      y[i] = rng.nextFloat() < 1 / (1 + Math.exp(-(0.3 + 0.9 * a[i]! - 0.6 * b[i]!))) ? 1 : 0;
    }
    const fit = fitLogisticRegression([a, b], y, n);
    const reference = new LogisticRegression({ numSteps: 2000, learningRate: 1e-2 });
    reference.train(new Matrix(Array.from({ length: n }, (_, i) => [1, a[i]!, b[i]!])), Matrix.columnVector(Array.from(y)));
    const w = reference.classifiers[0]!.weights.to1DArray();
    for (let j = 0; j < 3; j++) expect(Math.abs(fit.coefficients[j]! - w[j]!)).toBeLessThan(1e-6);
  });

  it('says so, naming the covariates, when the groups are completely separated', () => {
    const n = 40;
    const x = Float64Array.from({ length: n }, (_, i) => i);
    const y = Uint8Array.from({ length: n }, (_, i) => (i >= 20 ? 1 : 0));
    expect(() => fitLogisticRegression([x], y, n, { names: ['Attendance'], where: 'simulated replication 3' })).toThrow(
      /^The propensity score cannot be fitted \(simulated replication 3\): the measured covariates \(Attendance\) separate the programme and comparison groups completely or almost completely/,
    );
  });

  it('says so when a covariate is constant, collinear, or there is one group only', () => {
    const n = 30;
    const x = Float64Array.from({ length: n }, (_, i) => Math.sin(i));
    const y = Uint8Array.from({ length: n }, (_, i) => (i % 3 === 0 ? 1 : 0));
    expect(() => fitLogisticRegression([x, new Float64Array(n).fill(2)], y, n, { names: ['Pretest', 'Sex'] })).toThrow(
      'The covariate "Sex" takes a single value (2) in every one of the 30 people, so it cannot enter the propensity score.',
    );
    const twice = Float64Array.from(x, (v) => 2 * v + 1);
    expect(() => fitLogisticRegression([x, twice], y, n, { names: ['Pretest', 'Rescaled pretest'] })).toThrow(
      'The propensity score cannot be fitted: the measured covariates (Pretest, Rescaled pretest) are collinear',
    );
    expect(() => fitLogisticRegression([x], new Uint8Array(n), n)).toThrow('A logistic regression needs people in both groups; all 30 are in one group.');
  });
});
