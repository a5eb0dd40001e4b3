import { inverse, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import type { CovariateSpec, MatchingDistance, Plan } from '../../src/core/plan';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { AGE, ATTENDANCE, MOTIVATION, covariatePlan } from './multivariateFixtures';
import { feasible } from './feasible';

/*
 * The several-covariate engine against the core's closed forms (analysePlan with the covariate
 * model; multivariate normal, computed, standard: DESIGN.md and the several-covariates issue):
 * exact matching on all measured covariates, on the linear propensity score, and ANCOVA on all
 * measured covariates share growthGap + tau + beta'(Delta − Sigma_T[:, m] Sigma_X[m, m]^-1 Delta[m]);
 * matching on the pretest alone (with exact covariates exact) uses m = pretest + exact covariates;
 * the gain score and the multivariate reliability-corrected ANCOVA as in src/core/multivariate.
 *
 * The closed forms assume exact matching. With a finite caliper a small observed gap g remains on
 * the variables matched on (sel); since within each group E[T | X_sel] = mu + B (X_sel − mu_sel),
 * B = Sigma_T[:, sel] Sigma_X[sel, sel]^-1 (normal regression; Kelley 1947 in several variables),
 * and matching selects on X_sel only, the matched difference's expectation is the closed form plus
 * beta' B g exactly, and the true gap after matching is the closed form's plus B g. The simulated
 * g (observed SMD after × the model's pooled SD) is used for that small term, which is also
 * checked to be small. Tolerance: 3 Monte Carlo SEs (Morris et al. 2019, Table 6); each check
 * alone fails with probability 0.27% if the engine is right. Large pools, tight calipers.
 */

const R4 = [
  [1, 0.4, 0.3, 0.2],
  [0.4, 1, 0.2, 0.1],
  [0.3, 0.2, 1, 0.1],
  [0.2, 0.1, 0.1, 1],
];

const PRIOR: CovariateSpec = { name: 'Prior attainment', programmeMean: 104, comparisonMean: 100, sd: 15, reliability: 0.85, outcomeCorrelation: 0.45, measured: true, exact: false };
const HOME: CovariateSpec = { name: 'Home support', programmeMean: 20, comparisonMean: 20, sd: 5, reliability: 0.6, outcomeCorrelation: 0.25, measured: false, exact: false };

interface Case {
  name: string;
  plan: (distance: MatchingDistance) => Plan;
}

const cases: Case[] = [
  {
    name: 'pretest ρ .7, fallible attendance, unmeasured motivation, age matched exactly; effect 1',
    plan: (distance) =>
      covariatePlan({
        covariates: [ATTENDANCE, MOTIVATION, AGE],
        correlations: R4,
        base: {
          nP: 150, nC: 3000, reliability: 0.7, r: 0.5, meanP: 45, meanC: 50, effect: 1, replications: 300, seed: 22,
          matching: { distance, caliper: distance === 'mahalanobis' ? 0.15 : 0.05 },
        },
      }),
  },
  {
    name: 'pretest ρ .8 higher in the programme, prior attainment, unmeasured home support with no gap; 1:2 random within caliper with replacement, growth gap 1.5, no effect',
    plan: (distance) =>
      covariatePlan({
        covariates: [PRIOR, HOME],
        correlations: [
          [1, 0.5, 0.2],
          [0.5, 1, 0.3],
          [0.2, 0.3, 1],
        ],
        base: {
          nP: 150, nC: 3000, reliability: 0.8, r: 0.6, meanP: 56, meanC: 50, growthGap: 1.5, effect: 0, replications: 300, seed: 23,
          matching: { distance, caliper: distance === 'mahalanobis' ? 0.1 : 0.05, method: 'random-within-caliper', ratio: 2, replacement: true },
        },
      }),
  },
];

const block = (s: number[][], rows: number[], cols: number[]) => new Matrix(rows.map((i) => cols.map((j) => s[i]![j]!)));

describe('several-covariate simulation agrees with the closed forms within 3 Monte Carlo SEs', () => {
  for (const c of cases) {
    for (const distance of ['pretest', 'propensity', 'mahalanobis'] as const) {
      it(`${c.name}; matching on ${distance}`, () => {
        const plan = c.plan(distance);
        const analytic = analysePlan(plan);
        const cm = analytic.covariateModel!;
        expect(analytic.matchingDistance).toBe(distance);
        const sim = simulatePlan(plan);
        const balance = sim.balance!;
        const sel = distance === 'pretest' ? [0, ...cm.exactIndices] : cm.measuredIndices;
        const all = cm.names.map((_, i) => i);
        const B = block(cm.sigmaT.comparison, all, sel).mmul(inverse(block(cm.sigmaX.comparison, sel, sel)));
        const sdX = (j: number) => Math.sqrt((cm.sigmaX.programme[j]![j]! + cm.sigmaX.comparison[j]![j]!) / 2);
        const sdT = (j: number) => Math.sqrt((cm.sigmaT.programme[j]![j]! + cm.sigmaT.comparison[j]![j]!) / 2);
        // Tight matching: the variables matched on are balanced on their observed values (|SMD| < 0.03).
        for (const j of sel) expect(Math.abs(balance[j]!.observedSMDAfter)).toBeLessThan(0.03);
        const g = sel.map((j) => balance[j]!.observedSMDAfter * sdX(j));
        const Bg = B.mmul(Matrix.columnVector(g)).getColumn(0);
        const residual = cm.beta.reduce((s, b, j) => s + b * Bg[j]!, 0);
        const expected = analytic.analyses.matchedDifference!.expectedEstimate;
        // The residual-imbalance term is small beside the closed form's bias.
        expect(Math.abs(residual)).toBeLessThan(0.1 * Math.max(0.2, Math.abs(expected - cm.effect)));
        const md = feasible(sim.analyses.matchedDifference!);
        expect(Math.abs(md.meanEstimate - (expected + residual))).toBeLessThan(3 * md.meanEstimateMCSE);
        for (const id of ['ancova', 'gainScore', 'correctedAncova'] as const) {
          const s = feasible(sim.analyses[id]!);
          expect(Math.abs(s.meanEstimate - analytic.analyses[id]!.expectedEstimate)).toBeLessThan(3 * s.meanEstimateMCSE);
        }
        // The hidden imbalance per variable: true-score SMD after matching (core's expected balance + B g).
        balance.forEach((b, j) => {
          const want = analytic.covariateBalance![j]!.trueSMDAfter + Bg[j]! / sdT(j);
          expect(Math.abs(b.trueSMDAfter - want)).toBeLessThanOrEqual(3 * b.trueSMDAfterMCSE + 1e-12);
          // Before matching: the observed SMD is the plan's gap over the pooled SD.
          const before = analytic.covariateBalance![j]!.observedSMDBefore;
          expect(Math.abs(b.observedSMDBefore - before)).toBeLessThan(3 * b.observedSMDBeforeMCSE);
        });
      });
    }
  }
});

describe('propensity-score matching with error-free covariates (a setting of our own like Austin 2011\'s)', () => {
  // Austin (2011), Pharmaceutical Statistics 10, 150–161 (published, abstract): with continuous covariates,
  // a caliper of 0.2 SD of the logit of the propensity score removed at least 98% of the crude bias and gave
  // about nominal coverage. Invented setting: four error-free normal covariates (the pretest and three others),
  // all lower in the programme group and all raising the outcome; 250 programme, 1,000 comparison members,
  // greedy nearest 1:1 without replacement, caliper 0.2.
  const cov = (name: string, programmeMean: number, outcomeCorrelation: number): CovariateSpec => ({
    name, programmeMean, comparisonMean: 50, sd: 10, reliability: 1, outcomeCorrelation, measured: true, exact: false,
  });
  const plan = covariatePlan({
    covariates: [cov('Baseline severity', 45, 0.4), cov('Comorbidity count', 46, 0.35), cov('Distance to clinic', 47, 0.3)],
    correlations: [
      [1, 0.3, 0.2, 0.1],
      [0.3, 1, 0.2, 0.1],
      [0.2, 0.2, 1, 0.1],
      [0.1, 0.1, 0.1, 1],
    ],
    base: { nP: 250, nC: 1000, reliability: 1, r: 0.4, meanP: 45, meanC: 50, effect: 2, replications: 500, seed: 41, matching: { distance: 'propensity', caliper: 0.2 } },
  });

  it('removes at least 98% of the crude bias, with near-nominal 95% coverage', () => {
    const cm = analysePlan(plan).covariateModel!;
    // Crude bias of the unadjusted difference in means: growth gap + beta'Delta (the model's definition).
    const crude = cm.growthGap + cm.beta.reduce((s, b, j) => s + b * cm.gap[j]!, 0);
    expect(crude).toBeLessThan(-4);
    const sim = simulatePlan(plan);
    const md = feasible(sim.analyses.matchedDifference!);
    // One-sided: the remaining bias is no more than 2% of the crude bias, within 3 MCSEs.
    expect(Math.abs(md.bias) - 3 * md.biasMCSE).toBeLessThanOrEqual(0.02 * Math.abs(crude));
    // The same from the covariates' balance (no outcome noise, so far more precise): the outcome-weighted
    // observed imbalance after matching, beta' g, is at most 2% of the crude bias beta' Delta, within 3 MCSEs
    // (MCSE bounded by Σ |beta_j| sd_j MCSE(SMD_j)).
    const sd = (j: number) => Math.sqrt((cm.sigmaX.programme[j]![j]! + cm.sigmaX.comparison[j]![j]!) / 2);
    const left = sim.balance!.reduce((s, b, j) => s + cm.beta[j]! * b.observedSMDAfter * sd(j), 0);
    const leftMCSE = sim.balance!.reduce((s, b, j) => s + Math.abs(cm.beta[j]!) * b.observedSMDAfterMCSE * sd(j), 0);
    expect(Math.abs(left) + 3 * leftMCSE).toBeLessThanOrEqual(0.02 * Math.abs(crude));
    // Coverage of the 95% CI within 3 MCSEs of 0.95 (MCSE = sqrt(.95 × .05 / n)).
    expect(Math.abs(md.coverage - 0.95)).toBeLessThanOrEqual(3 * Math.sqrt((0.95 * 0.05) / md.replications));
    // Few programme members discarded at this caliper.
    expect(sim.matching.discardedProgrammeShare).toBeLessThan(0.05);
  });
});
