import { inverse, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { ancovaEstimate } from '../../src/sim/ancovaEstimate';
import { ancovaOnCovariates, createGroupMoments, groupMoments } from '../../src/sim/multivariate/ancovaOnCovariates';
import { createCovariatePools, drawCovariatePools } from '../../src/sim/multivariate/drawCovariatePools';
import type { CovariateSimModel } from '../../src/sim/multivariate/covariateSimModel';
import { whitenedCoordinates } from '../../src/sim/multivariate/whitenedCoordinates';
import { choleskyInPlace, choleskySolveInPlace } from '../../src/sim/multivariate/smallCholesky';
import { CholeskyDecomposition } from 'ml-matrix';
import { NormalSampler } from '../../src/sim/normalSampler';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';

/** Invented data: n rows of p correlated covariates and an outcome, programme rows shifted. */
function invented(seed: number, nC: number, nP: number, p: number) {
  const rng = Xoshiro128StarStar.forReplication(seed, 0);
  const z = new NormalSampler(rng);
  const N = nC + nP;
  const cols = Array.from({ length: p }, () => new Float64Array(N));
  const y = new Float64Array(N);
  for (let i = 0; i < N; i++) {
    const programme = i >= nC;
    const common = z.next();
    let lin = programme ? 1.5 : 0;
    for (let a = 0; a < p; a++) {
      const v = 50 + 10 * a + (programme ? -3 : 0) + 5 * (0.6 * common + 0.8 * z.next());
      cols[a]![i] = v;
      lin += (0.3 - 0.1 * a) * v;
    }
    y[i] = lin + 4 * z.next();
  }
  return { cols, y, N };
}

/** OLS of y on [1, group, covariates] by the full design matrix (ml-matrix; common practice): group coefficient and its SE. */
function olsGroupEffect(rows: number[][], y: number[]): { estimate: number; se: number } {
  const X = new Matrix(rows);
  const Y = Matrix.columnVector(y);
  const xtxInv = inverse(X.transpose().mmul(X));
  const beta = xtxInv.mmul(X.transpose()).mmul(Y);
  const resid = Y.clone().sub(X.mmul(beta));
  const df = rows.length - (rows[0]?.length ?? 0);
  const s2 = resid.transpose().mmul(resid).get(0, 0) / df;
  return { estimate: beta.get(1, 0), se: Math.sqrt(s2 * xtxInv.get(1, 1)) };
}

describe('ANCOVA on several covariates (normal equations)', () => {
  it('with one covariate equals the one-covariate engine\'s ANCOVA and Porter correction', () => {
    // ancovaEstimate implements Lord (1960) / Porter (1967) for one covariate; agreement to 1e-12 (relative).
    const { cols, y, N } = invented(1, 300, 120, 1);
    const P = createGroupMoments(1);
    const C = createGroupMoments(1);
    groupMoments(cols, y, 0, 300, null, C);
    groupMoments(cols, y, 300, N, null, P);
    const m = Float64Array.of(P.n, P.means[0]!, P.meanY, P.sxx[0]!, P.sxy[0]!, P.syy, C.n, C.means[0]!, C.meanY, C.sxx[0]!, C.sxy[0]!, C.syy);
    for (const rho of [1, 0.8]) {
      const a = new Float64Array(3);
      const b = new Float64Array(3);
      expect(ancovaEstimate(m, rho, a)).toBe(true);
      // Porter's replacement X̄_g + ρ'(X − X̄_g) is the correction matrix Λ = [ρ'] (no correction: null).
      expect(ancovaOnCovariates(P, C, rho === 1 ? null : Float64Array.of(rho), b)).toBe(true);
      expect(Math.abs(b[0]! - a[0]!)).toBeLessThan(1e-12 * Math.max(1, Math.abs(a[0]!)));
      expect(Math.abs(b[1]! - a[1]!)).toBeLessThan(1e-12 * a[1]!);
      expect(b[2]).toBe(a[2]);
    }
  });

  it('equals OLS on the full design matrix, unweighted and with stacked (weighted) rows', () => {
    // Common practice: the group coefficient of y ~ 1 + group + X by (X'X)^-1 X'y (ml-matrix), SE from s²(X'X)^-1.
    // Tolerance 1e-9 relative (rounding only).
    const nC = 250;
    const nP = 90;
    const p = 3;
    const { cols, y, N } = invented(2, nC, nP, p);
    const weight = Int32Array.from({ length: nC }, (_, i) => i % 4); // 0..3 uses per comparison row
    const flag = Uint8Array.from({ length: nP }, (_, j) => (j % 5 === 0 ? 0 : 1));
    for (const stacked of [false, true]) {
      const P = createGroupMoments(p);
      const C = createGroupMoments(p);
      groupMoments(cols, y, 0, nC, stacked ? weight : null, C);
      groupMoments(cols, y, nC, N, stacked ? flag : null, P);
      const out = new Float64Array(5);
      expect(ancovaOnCovariates(P, C, null, out)).toBe(true);
      const rows: number[][] = [];
      const ys: number[] = [];
      for (let i = 0; i < N; i++) {
        const times = !stacked ? 1 : i < nC ? weight[i]! : flag[i - nC]!;
        for (let t = 0; t < times; t++) {
          rows.push([1, i >= nC ? 1 : 0, ...cols.map((c) => c[i]!)]);
          ys.push(y[i]!);
        }
      }
      const ref = olsGroupEffect(rows, ys);
      expect(Math.abs(out[0]! - ref.estimate)).toBeLessThan(1e-9 * Math.max(1, Math.abs(ref.estimate)));
      // The OLS SE is what a naive analysis would report (out[3]); the engine's SE (out[1]) is the
      // group-wise delta-method one, checked by the coverage tests.
      expect(Math.abs(out[3]! - ref.se)).toBeLessThan(1e-9 * ref.se);
      expect(out[4]).toBe(rows.length - 2 - p);
    }
  });

  it('with a correction matrix equals OLS after replacing each member\'s covariates by X̄_g + Λ(X − X̄_g)', () => {
    // The multivariate reliability correction (Porter 1967 in one variable; several-variable form computed),
    // checked by doing the replacement explicitly and fitting the full design matrix. Tolerance 1e-9 relative.
    const nC = 200;
    const nP = 100;
    const p = 2;
    const { cols, y, N } = invented(3, nC, nP, p);
    const lambda = Float64Array.of(0.8, 0.05, -0.1, 0.7);
    const P = createGroupMoments(p);
    const C = createGroupMoments(p);
    groupMoments(cols, y, 0, nC, null, C);
    groupMoments(cols, y, nC, N, null, P);
    const out = new Float64Array(5);
    expect(ancovaOnCovariates(P, C, lambda, out)).toBe(true);
    const rows: number[][] = [];
    for (let i = 0; i < N; i++) {
      const g = i >= nC ? P : C;
      const dev = cols.map((c, a) => c[i]! - g.means[a]!);
      const corrected = [0, 1].map((a) => g.means[a]! + lambda[a * 2]! * dev[0]! + lambda[a * 2 + 1]! * dev[1]!);
      rows.push([1, i >= nC ? 1 : 0, ...corrected]);
    }
    const ref = olsGroupEffect(rows, [...y]);
    expect(Math.abs(out[0]! - ref.estimate)).toBeLessThan(1e-9 * Math.max(1, Math.abs(ref.estimate)));
    expect(Math.abs(out[3]! - ref.se)).toBeLessThan(1e-9 * ref.se); // naive OLS SE (rho' treated as known)
  });

  it('reports "cannot compute" for collinear covariates or too few rows (never NaN)', () => {
    const { cols, y, N } = invented(4, 50, 20, 1);
    const twice = [cols[0]!, Float64Array.from(cols[0]!, (v) => 2 * v)];
    const P = createGroupMoments(2);
    const C = createGroupMoments(2);
    groupMoments(twice, y, 0, 50, null, C);
    groupMoments(twice, y, 50, N, null, P);
    const out = Float64Array.of(-1, -1, -1);
    expect(ancovaOnCovariates(P, C, null, out)).toBe(false);
    expect([...out]).toEqual([-1, -1, -1]);
    const P1 = createGroupMoments(1);
    const C1 = createGroupMoments(1);
    // The group-wise SE needs each group's own residual variance: at least p + 2 = 3 rows per group.
    groupMoments([cols[0]!], y, 0, 3, null, C1);
    groupMoments([cols[0]!], y, 50, 52, null, P1);
    expect(ancovaOnCovariates(P1, C1, null, out)).toBe(false); // 2 programme rows: no residual variance of its own
    groupMoments([cols[0]!], y, 50, 53, null, P1);
    expect(ancovaOnCovariates(P1, C1, null, out)).toBe(true); // 3 and 3 rows: 1 df each
  });
});

describe('small Cholesky solves', () => {
  it('agree with ml-matrix\'s CholeskyDecomposition (a general-purpose library) and refuse a singular matrix', () => {
    // Random SPD matrices M M' + I of orders 1..9; factor and solution within 1e-10 (relative) of ml-matrix's.
    const rng = Xoshiro128StarStar.forReplication(21, 0);
    for (let n = 1; n <= 9; n++) {
      const m = Matrix.zeros(n, n);
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) m.set(i, j, rng.nextFloat() * 2 - 1);
      const spd = m.mmul(m.transpose()).add(Matrix.eye(n));
      const a = Float64Array.from(spd.to1DArray());
      expect(choleskyInPlace(a, n)).toBe(true);
      const ref = new CholeskyDecomposition(spd);
      for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) expect(Math.abs(a[i * n + j]! - ref.lowerTriangularMatrix.get(i, j))).toBeLessThan(1e-10);
      const b = Float64Array.from({ length: n }, (_, i) => i + 1);
      const want = ref.solve(Matrix.columnVector([...b])).getColumn(0);
      choleskySolveInPlace(a, n, b);
      for (let i = 0; i < n; i++) expect(Math.abs(b[i]! - want[i]!)).toBeLessThan(1e-10 * Math.max(1, Math.abs(want[i]!)));
    }
    expect(choleskyInPlace(Float64Array.of(1, 2, 2, 4), 2)).toBe(false);
    expect(choleskyInPlace(Float64Array.of(4, 2, 2, 3), 2)).toBe(true);
  });
});

describe('whitened coordinates', () => {
  it('turn the Mahalanobis distance into the Euclidean distance (definition; Mahalanobis 1936)', () => {
    // Distances checked against (x − x')' S_r^-1 (x − x') with S_r the pooled within-group covariance of the
    // covariates in the distance, inverted by ml-matrix. Tolerance 1e-9 relative.
    const nC = 120;
    const nP = 60;
    const p = 3;
    const { cols, y, N } = invented(5, nC, nP, p);
    const P = createGroupMoments(p);
    const C = createGroupMoments(p);
    groupMoments(cols, y, 0, nC, null, C);
    groupMoments(cols, y, nC, N, null, P);
    const pooled = Float64Array.from(P.sxx, (v, i) => v + C.sxx[i]!);
    for (const notExact of [[0, 1, 2], [0, 2]]) {
      const out = notExact.map(() => new Float64Array(N));
      expect(whitenedCoordinates(cols, notExact, pooled, N - 2, N, out)).toBe(true);
      const S = new Matrix(notExact.map((a) => notExact.map((b) => pooled[a * p + b]! / (N - 2))));
      const inv = inverse(S);
      for (const [i, j] of [[0, N - 1], [3, 150], [77, 78]] as const) {
        let direct = 0;
        notExact.forEach((a, s) =>
          notExact.forEach((b, t) => (direct += (cols[a]![i]! - cols[a]![j]!) * inv.get(s, t) * (cols[b]![i]! - cols[b]![j]!))),
        );
        let euclid = 0;
        for (const w of out) euclid += (w[i]! - w[j]!) ** 2;
        expect(Math.abs(euclid - direct)).toBeLessThan(1e-9 * direct);
      }
    }
  });
});

describe('drawCovariatePools', () => {
  // An invented three-variable model: pretest, a fallible covariate, an error-free whole-number one.
  const model: CovariateSimModel = {
    names: ['Pretest', 'Attendance', 'Age'],
    measured: [true, true, false],
    exact: [false, false, false],
    mean: { programme: [45, 80, 40], comparison: [50, 85, 42] },
    sigmaT: {
      programme: [[64, 20, 10], [20, 49, 5], [10, 5, 36]],
      comparison: [[64, 20, 10], [20, 49, 5], [10, 5, 36]],
    },
    sem: [6, Math.sqrt(21), 0],
    beta: [0.5, 0.2, -0.1],
    residualSD: 5,
    growthGap: 1,
    effect: 2,
    n: { programme: 20000, comparison: 20000 },
  };

  it('draws true scores, observed scores and the outcome with the model\'s moments', () => {
    // Moments against the model (Lord & Novick 1968: Σ_X = Σ_T + diag(SEM²), cov(X, Y) = Σ_T β,
    // var(Y) = β'Σ_T β + σ²; means μ_g, outcome mean [P](gap + τ) + β'μ_g). Tolerance 4 sampling SEs:
    // SE(mean) = sd/√n, SE(cov_ij) = √((σ_ii σ_jj + σ_ij²)/n) for normal data (Anderson 2003, sec. 3.2; from memory).
    const pools = createCovariatePools(model);
    const normal = new NormalSampler(Xoshiro128StarStar.forReplication(11, 0));
    drawCovariatePools(pools, normal);
    const n = 20000;
    const S = model.sigmaT.comparison;
    const beta = model.beta;
    const cov = (a: Float64Array, b: Float64Array, from: number): number => {
      let ma = 0;
      let mb = 0;
      for (let i = from; i < from + n; i++) {
        ma += a[i]!;
        mb += b[i]!;
      }
      ma /= n;
      mb /= n;
      let s = 0;
      for (let i = from; i < from + n; i++) s += (a[i]! - ma) * (b[i]! - mb);
      return s / (n - 1);
    };
    const mean = (a: Float64Array, from: number) => a.subarray(from, from + n).reduce((s, v) => s + v, 0) / n;
    const sigmaX = (i: number, j: number) => S[i]![j]! + (i === j ? model.sem[i]! ** 2 : 0);
    const covTY = (i: number) => S[i]!.reduce((s, v, j) => s + v * beta[j]!, 0);
    const varY = beta.reduce((s, bi, i) => s + bi * covTY(i), 0) + model.residualSD ** 2;
    for (const [from, g] of [[0, 'comparison'], [n, 'programme']] as const) {
      for (let i = 0; i < 3; i++) {
        const mu = model.mean[g][i]!;
        expect(Math.abs(mean(pools.observed[i]!, from) - mu)).toBeLessThan(4 * Math.sqrt(sigmaX(i, i) / n));
        for (let j = 0; j <= i; j++) {
          const se = (v: (a: number, b: number) => number) => 4 * Math.sqrt((v(i, i) * v(j, j) + v(i, j) ** 2) / n);
          expect(Math.abs(cov(pools.trueScore[i]!, pools.trueScore[j]!, from) - S[i]![j]!)).toBeLessThan(se((a, b) => S[a]![b]!));
          expect(Math.abs(cov(pools.observed[i]!, pools.observed[j]!, from) - sigmaX(i, j))).toBeLessThan(se(sigmaX));
        }
        const seXY = 4 * Math.sqrt((sigmaX(i, i) * varY + covTY(i) ** 2) / n);
        expect(Math.abs(cov(pools.observed[i]!, pools.outcome, from) - covTY(i))).toBeLessThan(seXY);
      }
      const muY = (g === 'programme' ? model.growthGap + model.effect : 0) + beta.reduce((s, b, j) => s + b * model.mean[g][j]!, 0);
      expect(Math.abs(mean(pools.outcome, from) - muY)).toBeLessThan(4 * Math.sqrt(varY / n));
      expect(Math.abs(cov(pools.outcome, pools.outcome, from) - varY)).toBeLessThan(4 * Math.sqrt((2 * varY * varY) / n));
    }
  });

  it('records a 0/1 covariate matched exactly as an indicator with each group\'s proportion', () => {
    // Liability-threshold model (common practice): 1 when the normal draw exceeds mean_g + sd Φ^-1(1 − mean_g),
    // so P(1 | g) = mean_g. Tolerance 4 binomial SEs, sqrt(p(1 − p)/n).
    const indicatorModel: CovariateSimModel = {
      names: ['Pretest', 'Recorded sex (girl)'],
      measured: [true, true],
      exact: [false, true],
      mean: { programme: [45, 0.35], comparison: [50, 0.5] },
      sigmaT: { programme: [[64, 1], [1, 0.25]], comparison: [[64, 1], [1, 0.25]] },
      sem: [6, 0],
      beta: [0.5, 1],
      residualSD: 5,
      growthGap: 0,
      effect: 0,
      n: { programme: 20000, comparison: 20000 },
    };
    const pools = createCovariatePools(indicatorModel);
    drawCovariatePools(pools, new NormalSampler(Xoshiro128StarStar.forReplication(13, 0)));
    const n = 20000;
    for (const [from, p] of [[0, 0.5], [n, 0.35]] as const) {
      let ones = 0;
      for (let i = from; i < from + n; i++) {
        const v = pools.observed[1]![i]!;
        expect(v === 0 || v === 1).toBe(true);
        expect(pools.trueScore[1]![i]).toBe(v);
        ones += v;
      }
      expect(Math.abs(ones / n - p)).toBeLessThan(4 * Math.sqrt((p * (1 - p)) / n));
    }
  });

  it('records an exactly matched covariate in whole-number categories, without error', () => {
    const exactModel: CovariateSimModel = { ...model, measured: [true, true, true], exact: [false, false, true], n: { programme: 50, comparison: 80 } };
    const pools = createCovariatePools(exactModel);
    drawCovariatePools(pools, new NormalSampler(Xoshiro128StarStar.forReplication(12, 0)));
    for (let i = 0; i < 130; i++) {
      expect(Number.isInteger(pools.observed[2]![i])).toBe(true);
      expect(pools.observed[2]![i]).toBe(pools.trueScore[2]![i]);
      expect(Number.isInteger(pools.observed[0]![i])).toBe(false);
    }
  });
});
