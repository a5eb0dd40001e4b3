import { beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { CholeskyDecomposition, inverse, Matrix, solve } from 'ml-matrix';
import { analysePlan } from '../../src/core/analysePlan';
import { covariateAncovaEstimate } from '../../src/core/multivariate/covariateAncovaEstimate';
import { covariateCorrectedAncovaEstimate } from '../../src/core/multivariate/covariateCorrectedAncovaEstimate';
import { covariateGainScoreEstimate } from '../../src/core/multivariate/covariateGainScoreEstimate';
import { covariateMatchedEstimate } from '../../src/core/multivariate/covariateMatchedEstimate';
import { type CovariateModel, deriveCovariateModel } from '../../src/core/multivariate/covariateModel';
import { covariateStandardError } from '../../src/core/multivariate/covariateStandardError';
import { unmeasuredBias } from '../../src/core/multivariate/unmeasuredBias';
import type { MatchingDistance, Plan } from '../../src/core/plan';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { NormalSampler } from '../../src/sim/normalSampler';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';
import { drawnBasePlan, drawnCovariates } from './drawnCovariatePlan';
import { afterSchoolMaths, oneFactor, planWithCovariates } from './multivariateFixture';

/*
 * The several-covariate closed forms checked against an independent route: the joint normal
 * law of (T, E, e) per group, pushed through X = T + E and Y = d_g + tau[P] + beta'T + e with
 * ml-matrix (a general-purpose library), then
 * - ANCOVA: the population least-squares regression of Y on (1, G, X[m]) over the mixture of
 *   the two groups with weights n_g / N (normal equations solved by ml-matrix);
 * - matching: E[Y | A X, g] by the normal conditional-mean formula in the comparison group,
 *   averaged over the programme's A X;
 * - corrected ANCOVA: the analyst's replacement X̄_g + K (X − X̄_g), K = Sigma_T' Sigma_X^-1,
 *   carried through the same mixture regression;
 * - unmeasured part: the regression of Y on (1, G, T[m]) (perfectly measured covariates).
 * Tolerance: relative 1e-9 (double rounding in small solves).
 */

const close = (a: number, b: number, rel = 1e-9): void => {
  expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(a), Math.abs(b)));
};

interface GroupLaw {
  mean: number[]; // (X_0..X_{p-1}, Y)
  cov: Matrix; // (p + 1) × (p + 1)
  trueMean: number[];
  trueCov: Matrix; // cov of (T, Y)
}

/** Joint mean and covariance of (X, Y) and of (T, Y) in group g, from (T, E, e). */
function groupLaw(cm: CovariateModel, g: 'programme' | 'comparison'): GroupLaw {
  const p = cm.names.length;
  const d = 2 * p + 1;
  const sw = Matrix.zeros(d, d);
  const st = cm.sigmaT[g];
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) sw.set(i, j, st[i]![j]!);
    sw.set(p + i, p + i, cm.sem[i]! ** 2);
  }
  sw.set(2 * p, 2 * p, cm.residualSD ** 2);
  const L = Matrix.zeros(p + 1, d); // X = T + E ; Y = beta'T + e
  const LT = Matrix.zeros(p + 1, d); // T ; Y
  for (let i = 0; i < p; i++) {
    L.set(i, i, 1);
    L.set(i, p + i, 1);
    LT.set(i, i, 1);
    L.set(p, i, cm.beta[i]!);
    LT.set(p, i, cm.beta[i]!);
  }
  L.set(p, 2 * p, 1);
  LT.set(p, 2 * p, 1);
  const mu = cm.mean[g];
  const shift = g === 'programme' ? cm.growthGap + cm.effect : 0;
  const yMean = mu.reduce((s, x, i) => s + x * cm.beta[i]!, 0) + shift;
  return {
    mean: [...mu, yMean],
    cov: L.mmul(sw).mmul(L.transpose()),
    trueMean: [...mu, yMean],
    trueCov: LT.mmul(sw).mmul(LT.transpose()),
  };
}

/** Coefficient on the group indicator in the population OLS of Y on (1, G, W), W = rows `idx` of a law (after an optional map). */
function mixtureGroupCoefficient(
  cm: CovariateModel,
  laws: { programme: GroupLaw; comparison: GroupLaw },
  which: 'observed' | 'true',
  idx: number[],
  map?: Matrix,
): number {
  const p = cm.names.length;
  const N = cm.n.programme + cm.n.comparison;
  const q = idx.length + 2;
  const ezz = Matrix.zeros(q, q);
  const ezy = Matrix.zeros(q, 1);
  for (const g of ['programme', 'comparison'] as const) {
    const w = cm.n[g] / N;
    const law = laws[g];
    const cov = which === 'observed' ? law.cov : law.trueCov;
    const mean = which === 'observed' ? law.mean : law.trueMean;
    let cw = new Matrix(idx.map((i) => idx.map((j) => cov.get(i, j))));
    let cwy = Matrix.columnVector(idx.map((i) => cov.get(i, p)));
    const mw = idx.map((i) => mean[i]!);
    if (map) {
      cw = map.mmul(cw).mmul(map.transpose());
      cwy = map.mmul(cwy);
    }
    const mz = [1, g === 'programme' ? 1 : 0, ...mw];
    const my = mean[p]!;
    for (let a = 0; a < q; a++) {
      for (let b = 0; b < q; b++) {
        const c = a >= 2 && b >= 2 ? cw.get(a - 2, b - 2) : 0;
        ezz.set(a, b, ezz.get(a, b) + w * (c + mz[a]! * mz[b]!));
      }
      const c = a >= 2 ? cwy.get(a - 2, 0) : 0;
      ezy.set(a, 0, ezy.get(a, 0) + w * (c + mz[a]! * my));
    }
  }
  return solve(ezz, ezy).get(1, 0);
}

/** Expected matched difference when matching exactly on A X (A: rows over the p variables). */
function matchedByConditioning(cm: CovariateModel, laws: { programme: GroupLaw; comparison: GroupLaw }, A: Matrix): number {
  const p = cm.names.length;
  const c = laws.comparison;
  const sx = c.cov.subMatrix(0, p - 1, 0, p - 1);
  const sxy = c.cov.subMatrix(0, p - 1, p, p);
  const vz = A.mmul(sx).mmul(A.transpose());
  const czy = A.mmul(sxy);
  const slope = inverse(vz).mmul(czy);
  const dz = A.mmul(Matrix.columnVector(laws.programme.mean.slice(0, p).map((x, i) => x - c.mean[i]!)));
  return laws.programme.mean[p]! - c.mean[p]! - slope.transpose().mmul(dz).get(0, 0);
}

function unitRows(p: number, idx: number[]): Matrix {
  return new Matrix(idx.map((j) => Array.from({ length: p }, (_, i) => (i === j ? 1 : 0))));
}

function checkAll(plan: Plan, equalCovariances: boolean): void {
  const cm = deriveCovariateModel(plan);
  const p = cm.names.length;
  const laws = { programme: groupLaw(cm, 'programme'), comparison: groupLaw(cm, 'comparison') };

  // The model reproduces the plan's inputs: observed correlations, outcome correlations, posttest SD.
  const cc = laws.comparison.cov;
  const R = plan.covariateCorrelations ?? [[1]];
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) close(cc.get(i, j) / Math.sqrt(cc.get(i, i) * cc.get(j, j)), R[i]![j]!);
    const rY = i === 0 ? plan.outcome.prePostCorrelation : plan.covariates![i - 1]!.outcomeCorrelation;
    close(cc.get(i, p) / Math.sqrt(cc.get(i, i) * cc.get(p, p)), rY);
  }
  close(Math.sqrt(cc.get(p, p)), plan.outcome.posttestSD);
  close(Math.sqrt(cc.get(0, 0)), plan.groups.comparison.pretestSD);
  close(Math.sqrt(laws.programme.cov.get(0, 0)), plan.groups.programme.pretestSD);

  const m = cm.measuredIndices;
  // ANCOVA on all measured variables (Lord 1960 in one variable).
  close(covariateAncovaEstimate(cm), mixtureGroupCoefficient(cm, laws, 'observed', m));
  // Gain score.
  close(covariateGainScoreEstimate(cm), laws.programme.mean[p]! - laws.comparison.mean[p]! - (laws.programme.mean[0]! - laws.comparison.mean[0]!));
  // Unmeasured part: ANCOVA on the measured variables' true scores, minus tau and the growth gap.
  close(unmeasuredBias(cm), mixtureGroupCoefficient(cm, laws, 'true', m) - cm.effect - cm.growthGap);

  // Corrected ANCOVA with an assumed pretest reliability (Porter 1967 in one variable).
  for (const assumed of [plan.analysis.assumedReliability, 0.95, cm.reliability.pooled[0]!]) {
    const N = cm.n.programme + cm.n.comparison;
    const pooledX = new Matrix(m.map((i) => m.map((j) => (cm.n.programme * laws.programme.cov.get(i, j) + cm.n.comparison * cc.get(i, j)) / N)));
    const rel = m.map((j) => (j === 0 ? assumed : plan.covariates![j - 1]!.reliability));
    const sTa = pooledX.clone();
    m.forEach((_, t) => sTa.set(t, t, pooledX.get(t, t) * rel[t]!));
    const K = sTa.mmul(inverse(pooledX));
    close(covariateCorrectedAncovaEstimate(cm, assumed), mixtureGroupCoefficient(cm, laws, 'observed', m, K));
  }
  // With the true reliabilities, the corrected ANCOVA leaves only the unmeasured part and the growth gap.
  close(covariateCorrectedAncovaEstimate(cm, cm.reliability.pooled[0]!), cm.effect + cm.growthGap + unmeasuredBias(cm));

  // Matching on the pretest (plus exact covariates), and on every measured variable.
  const exact = cm.exactIndices;
  close(covariateMatchedEstimate(cm, 'pretest'), matchedByConditioning(cm, laws, unitRows(p, [...exact, 0])));
  close(covariateMatchedEstimate(cm, 'mahalanobis'), matchedByConditioning(cm, laws, unitRows(p, m)));
  if (equalCovariances) {
    // Normal covariates with equal covariances: the log-odds of programme membership are linear with
    // slopes Sigma_X^-1 Delta (Fisher's linear discriminant; Efron 1975, from memory); matching on
    // that score (and the exact covariates) balances X[m] (Rosenbaum & Rubin 1983), so it equals
    // matching on every measured variable.
    const sx = new Matrix(m.map((i) => m.map((j) => cc.get(i, j))));
    const gamma = inverse(sx).mmul(Matrix.columnVector(m.map((j) => cm.gap[j]!)));
    const row = Array.from({ length: p }, () => 0);
    m.forEach((j, t) => (row[j] = gamma.get(t, 0)));
    const A = new Matrix([...unitRows(p, exact).to2DArray(), row]);
    const byScore = matchedByConditioning(cm, laws, A);
    close(covariateMatchedEstimate(cm, 'propensity'), byScore);
    close(byScore, covariateMatchedEstimate(cm, 'mahalanobis'));
  }
}

describe('closed forms against the joint normal law (ml-matrix)', () => {
  it('the after-school maths example (invented; four covariates, one unmeasured, one exact)', () => {
    checkAll(afterSchoolMaths(), true);
  });

  it('unequal pretest SDs and pool sizes, growth gap and effect (pretest and Mahalanobis matching)', () => {
    const plan = afterSchoolMaths();
    plan.groups.programme.pretestSD = 18;
    plan.groups.programme.poolSize = 400;
    plan.outcome.growthGap = 1.5;
    plan.outcome.hypothesisedEffect = -2;
    plan.analysis.assumedReliability = 0.9;
    expect(validatePlan(plan).ok).toBe(true);
    checkAll(plan, false);
  });

  it('random one-factor plans (fast-check, 40 runs)', () => {
    fc.assert(
      fc.property(
        fc.record({
          k: fc.integer({ min: 1, max: 4 }),
          loadings: fc.array(fc.double({ min: -0.7, max: 0.7, noNaN: true }), { minLength: 5, maxLength: 5 }),
          gaps: fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 4, maxLength: 4 }),
          rels: fc.array(fc.double({ min: 0.55, max: 1, noNaN: true }), { minLength: 4, maxLength: 4 }),
          outs: fc.array(fc.double({ min: -0.35, max: 0.35, noNaN: true }), { minLength: 4, maxLength: 4 }),
          measured: fc.array(fc.boolean(), { minLength: 4, maxLength: 4 }),
          sdP: fc.double({ min: 8, max: 14, noNaN: true }),
          tau: fc.double({ min: -3, max: 3, noNaN: true }),
        }),
        (o) => {
          const base = drawnBasePlan(o.sdP);
          base.outcome.hypothesisedEffect = o.tau;
          const covs = drawnCovariates(o, 5);
          const plan = planWithCovariates(covs, oneFactor(o.loadings.slice(0, o.k + 1)), base);
          fc.pre(validatePlan(plan).ok);
          checkAll(plan, o.sdP === 10);
        },
      ),
      { numRuns: 40, seed: 11 },
    );
  });
});

describe('one variable: the published one-covariate formulas', () => {
  // REFERENCES.md (computed from Kelley 1947; Thorndike 1942; Lord 1960; Porter 1967):
  // gap 15, rho .9, beta 1, tau 0 → matched difference and ANCOVA 1.5; gain (beta − 1)·gap = 0;
  // corrected ANCOVA beta(1 − rho/rho')·gap: rho' = .9 → 0, rho' = .75 → −3. Tolerance 1e-9.
  const plan = demoPlan();
  plan.groups.programme = { ...plan.groups.programme, pretestMean: 65, pretestSD: 10 };
  plan.groups.comparison = { ...plan.groups.comparison, pretestMean: 50, pretestSD: 10 };
  plan.pretest = { reliability: 0.9, referenceSD: 10 };
  // beta = r·SD_Y / (SD_X·rho) = 0.9·10 / (10·0.9) = 1.
  plan.outcome = { ...plan.outcome, posttestSD: 10, prePostCorrelation: 0.9, growthGap: 0, hypothesisedEffect: 0 };

  for (const distance of ['pretest', 'propensity', 'mahalanobis'] as MatchingDistance[]) {
    it(`through the covariate path (distance ${distance})`, () => {
      plan.matching.distance = distance;
      const cm = deriveCovariateModel(plan);
      close(cm.beta[0]!, 1);
      close(covariateMatchedEstimate(cm, distance), 1.5);
      close(covariateAncovaEstimate(cm), 1.5);
      close(covariateGainScoreEstimate(cm), 0);
      close(covariateCorrectedAncovaEstimate(cm, 0.9), 0);
      close(covariateCorrectedAncovaEstimate(cm, 0.75), -3);
      const r = analysePlan(plan);
      close(r.analyses.matchedDifference!.bias, 1.5);
      // Without covariates, distance "pretest" keeps the one-pretest results (no unmeasured part reported).
      if (distance === 'pretest') expect(r.unmeasuredBias).toBeUndefined();
      else expect(r.unmeasuredBias).toEqual({ points: 0, sd: 0, share: null, covariates: [] });
    });
  }
});

describe('Monte Carlo: ANCOVA, corrected ANCOVA and gain score on simulated samples', () => {
  // Each replication draws both pools of the after-school example (invented) from the model,
  // then runs the analyses as a researcher would: OLS of Y on (1, G, X[m]); the corrected ANCOVA
  // with the sample pooled within-group covariance S and K = S_T' S^-1; the gain score's mean
  // difference. 300 replications, seeded (xoshiro128** + ziggurat normals from src/sim).
  // Means within 4 Monte Carlo SEs of the closed form (P(fail) < 1e-4 each); the empirical SD
  // within 15% of the approximate SE (the SD's own sampling error is about 4% here, so 15%
  // is about 3.5 of those; the rest allows for the large-sample approximation).
  const plan = afterSchoolMaths();
  const cm = deriveCovariateModel(plan);
  const p = cm.names.length;
  const m = cm.measuredIndices;
  const nP = cm.n.programme;
  const nC = cm.n.comparison;
  const reps = 300;
  const normals = new NormalSampler(Xoshiro128StarStar.forReplication(424242, 0));
  const cholesky = (s: number[][]): Matrix => new CholeskyDecomposition(new Matrix(s)).lowerTriangularMatrix;
  const LT = { programme: cholesky(cm.sigmaT.programme), comparison: cholesky(cm.sigmaT.comparison) };
  const est = { ancova: [] as number[], correctedAncova: [] as number[], gainScore: [] as number[] };
  const z = new Float64Array(p);

  beforeAll(() => {
    for (let r = 0; r < reps; r++) {
      const rows: { g: number; x: number[]; y: number }[] = [];
      for (const g of ['programme', 'comparison'] as const) {
        const n = cm.n[g];
        for (let i = 0; i < n; i++) {
          normals.fillStandard(z, p);
          const t = cm.mean[g].map((mu, a) => {
            let s = mu;
            for (let b = 0; b <= a; b++) s += LT[g].get(a, b) * z[b]!;
            return s;
          });
          const x = t.map((v, a) => v + cm.sem[a]! * normals.next());
          const y = t.reduce((s, v, a) => s + cm.beta[a]! * v, 0) + cm.residualSD * normals.next() + (g === 'programme' ? cm.growthGap + cm.effect : 0);
          rows.push({ g: g === 'programme' ? 1 : 0, x, y });
        }
      }
      const means = [0, 1].map((g) => {
        const sel = rows.filter((row) => row.g === g);
        return { x: Array.from({ length: p }, (_, a) => sel.reduce((s, row) => s + row.x[a]!, 0) / sel.length), y: sel.reduce((s, row) => s + row.y, 0) / sel.length };
      });
      const ols = (cols: (row: { g: number; x: number[] }) => number[]): number => {
        const q = cols(rows[0]!).length;
        const xtx = Matrix.zeros(q, q);
        const xty = Matrix.zeros(q, 1);
        for (const row of rows) {
          const v = cols(row);
          for (let a = 0; a < q; a++) {
            xty.set(a, 0, xty.get(a, 0) + v[a]! * row.y);
            for (let b = 0; b < q; b++) xtx.set(a, b, xtx.get(a, b) + v[a]! * v[b]!);
          }
        }
        return solve(xtx, xty).get(1, 0);
      };
      est.ancova.push(ols((row) => [1, row.g, ...m.map((j) => row.x[j]!)]));
      // Pooled within-group covariance of X[m] (divisor N − 2), the analyst's S_T' and K.
      const S = Matrix.zeros(m.length, m.length);
      for (const row of rows) {
        const c = m.map((j) => row.x[j]! - means[row.g]!.x[j]!);
        for (let a = 0; a < m.length; a++) for (let b = 0; b < m.length; b++) S.set(a, b, S.get(a, b) + (c[a]! * c[b]!) / (nP + nC - 2));
      }
      const ST = S.clone();
      m.forEach((j, a) => ST.set(a, a, S.get(a, a) * (j === 0 ? plan.analysis.assumedReliability : plan.covariates![j - 1]!.reliability)));
      const K = ST.mmul(inverse(S));
      est.correctedAncova.push(
        ols((row) => {
          const c = Matrix.columnVector(m.map((j) => row.x[j]! - means[row.g]!.x[j]!));
          const k = K.mmul(c);
          return [1, row.g, ...m.map((j, a) => means[row.g]!.x[j]! + k.get(a, 0))];
        }),
      );
      est.gainScore.push(means[1]!.y - means[1]!.x[0]! - (means[0]!.y - means[0]!.x[0]!));
    }
  });

  const options = { assumedReliability: plan.analysis.assumedReliability, ratio: 1 };
  const closed = {
    ancova: covariateAncovaEstimate(cm),
    correctedAncova: covariateCorrectedAncovaEstimate(cm, plan.analysis.assumedReliability),
    gainScore: covariateGainScoreEstimate(cm),
  };
  for (const id of ['ancova', 'correctedAncova', 'gainScore'] as const) {
    it(`${id}: mean within 4 MC SEs, SD within 15% of the approximate SE`, () => {
      const x = est[id];
      const mean = x.reduce((s, v) => s + v, 0) / reps;
      const sd = Math.sqrt(x.reduce((s, v) => s + (v - mean) ** 2, 0) / (reps - 1));
      const mcse = sd / Math.sqrt(reps);
      expect(Math.abs(mean - closed[id])).toBeLessThan(4 * mcse);
      const se = covariateStandardError(id, cm, 'propensity', { programme: nP, comparison: nC }, options).se;
      expect(Math.abs(sd / se - 1)).toBeLessThan(0.15);
    });
  }
});
