import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import type { AnalysisId } from '../../src/core/plan';
import { normalSource } from './independentNormals';
import { selectionPlan, type SelectionSettings } from './selectionPlanFixture';

/*
 * An independent Monte Carlo check of every selection-design closed form,
 * written here in plain JS (nothing from src/sim): draw a large population
 * from the model (classical test theory: T ~ N(50, 80), X = T + E with
 * SEM² 20 (reliability .8 in SD 10), screener S = T + E_S, Y0 = 50 + β(T − 50) + e,
 * β = r·σ_Y/(σ_X ρ) = .875, Var(e) = σ_Y²(1 − r²/ρ) = 38.75 (Spearman 1904)),
 * apply the rule (probability rule = sharp cut on B + spread·ε), add the
 * effect tau = 2 and the growth gap 0.5 to the programme's posttest, and
 * compute each analysis the way an analyst would:
 *   gain: difference of mean (Y − X); ANCOVA: OLS of Y on group and X (pooled
 *   within-group slope); corrected ANCOVA: that slope divided by ρ′ = .8 (Porter 1967);
 *   regression discontinuity: OLS of Y on group and the rule's score; matched difference:
 *   each programme member's nearest comparison member on X (with replacement) from
 *   the whole population's comparison group; one group: mean (Y − X) of the selected.
 * The population (600,000 people, seeded) is cut into 40 random batches of
 * 15,000; each figure is the mean of the 40 batch estimates and its Monte
 * Carlo SE is their SD / sqrt(40). The matched difference uses 20 blocks of
 * 30,000, each matched within itself with the Abadie & Imbens (2011)
 * regression bias correction (see matchedPerBlock), SE = SD / sqrt(20).
 * Every closed form must lie within 3 MC SEs (t with 39 df: a 0.5% chance per
 * check of a false alarm; 19 df for the matched difference: 0.7%).
 * The batch SD also checks the closed-form SEs at a population of 15,000:
 * within 3 × its own relative SE 1/sqrt(2·39) = 11%, i.e. a ratio within 1 ± 0.34.
 */

const N = 600_000;
const BATCHES = 40;
const MATCH_BLOCKS = 20;
const TAU = 2;
const GROWTH = 0.5;
const TRUE_VAR = 80;
const SEM = Math.sqrt(20);
const BETA = 0.875;
const RESIDUAL = Math.sqrt(100 * (1 - 0.49 / 0.8));
const RHO_ASSUMED = 0.8;

interface Case {
  name: string;
  settings: SelectionSettings;
  seed: number;
}

const CASES: Case[] = [
  { name: 'cut-off on the pretest (below 42)', settings: { rule: 'cut-off', basis: 'pretest', cutOff: 42 }, seed: 101 },
  { name: 'probability on the pretest (below 45, spread 8)', settings: { rule: 'probability', basis: 'pretest', cutOff: 45, spread: 8 }, seed: 102 },
  { name: 'cut-off on a screener of reliability .7 (below 42)', settings: { rule: 'cut-off', basis: 'screener', screenerReliability: 0.7, cutOff: 42 }, seed: 103 },
  {
    name: 'probability on a screener of reliability .6 (above 55, spread 5)',
    settings: { rule: 'probability', basis: 'screener', screenerReliability: 0.6, cutOff: 55, side: 'above', spread: 5 },
    seed: 104,
  },
  { name: 'cut-off on the true score (above 56)', settings: { rule: 'cut-off', basis: 'true-score', cutOff: 56, side: 'above' }, seed: 105 },
  { name: 'probability on the true score (below 44, spread 4)', settings: { rule: 'probability', basis: 'true-score', cutOff: 44, spread: 4 }, seed: 106 },
  { name: 'one group, cut-off on the pretest (below 40)', settings: { design: 'one-group', rule: 'cut-off', basis: 'pretest', cutOff: 40 }, seed: 107 },
  {
    name: 'one group, probability on a screener of reliability .7 (below 42, spread 3)',
    settings: { design: 'one-group', rule: 'probability', basis: 'screener', screenerReliability: 0.7, cutOff: 42, spread: 3 },
    seed: 108,
  },
];

/** One simulated population and the estimates per batch. */
function simulate(c: Case): Partial<Record<AnalysisId, number[]>> {
  const s = c.settings;
  const z = normalSource(c.seed);
  const X = new Float64Array(N);
  const Y = new Float64Array(N);
  const B = new Float64Array(N);
  const P = new Uint8Array(N);
  const screenerError = s.basis === 'screener' ? Math.sqrt(TRUE_VAR / (s.screenerReliability as number) - TRUE_VAR) : 0;
  const spread = s.rule === 'probability' ? (s.spread as number) : 0;
  const oneGroup = s.design === 'one-group';
  for (let i = 0; i < N; i++) {
    const t = 50 + Math.sqrt(TRUE_VAR) * z();
    const x = t + SEM * z();
    const scr = t + screenerError * z();
    const y0 = 50 + BETA * (t - 50) + RESIDUAL * z();
    const eps = z();
    const b = s.basis === 'pretest' ? x : s.basis === 'screener' ? scr : t;
    const latent = b + spread * eps;
    const selected = (s.side ?? 'below') === 'below' ? latent < s.cutOff : latent > s.cutOff;
    X[i] = x;
    B[i] = b;
    P[i] = selected ? 1 : 0;
    Y[i] = y0 + (selected ? TAU + GROWTH : 0);
  }
  const out: Partial<Record<AnalysisId, number[]>> = {};
  const perBatch = (f: (idx: (k: number) => number, n: number) => number): number[] =>
    Array.from({ length: BATCHES }, (_, b) => f((k) => b + k * BATCHES, N / BATCHES));
  if (oneGroup) {
    out.prePostChange = perBatch((idx, n) => {
      let sum = 0;
      let count = 0;
      for (let k = 0; k < n; k++) {
        const i = idx(k);
        if (P[i]) {
          sum += (Y[i] as number) - (X[i] as number);
          count++;
        }
      }
      return sum / count;
    });
    return out;
  }
  // Sums per group for one batch: means of Y, X, B and the centred cross-products.
  const adjusted = (idx: (k: number) => number, n: number, V: Float64Array, slopeScale: number): number => {
    const m = [
      [0, 0, 0],
      [0, 0, 0],
    ];
    for (let k = 0; k < n; k++) {
      const i = idx(k);
      const g = P[i] as number;
      const row = m[g] as number[];
      row[0]! += 1;
      row[1]! += Y[i] as number;
      row[2]! += V[i] as number;
    }
    const meanY = m.map((r) => (r[1] as number) / (r[0] as number));
    const meanV = m.map((r) => (r[2] as number) / (r[0] as number));
    let sxy = 0;
    let sxx = 0;
    for (let k = 0; k < n; k++) {
      const i = idx(k);
      const g = P[i] as number;
      const dv = (V[i] as number) - (meanV[g] as number);
      sxy += dv * ((Y[i] as number) - (meanY[g] as number));
      sxx += dv * dv;
    }
    const slope = (sxy / sxx) / slopeScale;
    return (meanY[1] as number) - (meanY[0] as number) - slope * ((meanV[1] as number) - (meanV[0] as number));
  };
  out.gainScore = perBatch((idx, n) => {
    const sum = [0, 0];
    const cnt = [0, 0];
    for (let k = 0; k < n; k++) {
      const i = idx(k);
      const g = P[i] as number;
      sum[g]! += (Y[i] as number) - (X[i] as number);
      cnt[g]! += 1;
    }
    return (sum[1] as number) / (cnt[1] as number) - (sum[0] as number) / (cnt[0] as number);
  });
  out.ancova = perBatch((idx, n) => adjusted(idx, n, X, 1));
  out.correctedAncova = perBatch((idx, n) => adjusted(idx, n, X, RHO_ASSUMED));
  if (s.basis !== 'true-score') out.regressionDiscontinuity = perBatch((idx, n) => adjusted(idx, n, B, 1));
  const sharpOnPretest = s.basis === 'pretest' && s.rule === 'cut-off';
  if (!sharpOnPretest) out.matchedDifference = matchedPerBlock(X, Y, P);
  return out;
}

/**
 * The matched difference in each of MATCH_BLOCKS independent blocks of the
 * population (each block matched within itself, so partner reuse shows in
 * the spread of the block estimates): every programme member's nearest
 * comparison member on X (with replacement), with the regression bias
 * correction of Abadie & Imbens (2011): d = Y_i − Y_j − b̂(x_i − x_j), b̂ the
 * OLS slope of Y on X in the block's comparison group, which removes the
 * first-order effect of the distance to a partner where the groups thin out.
 */
function matchedPerBlock(X: Float64Array, Y: Float64Array, P: Uint8Array): number[] {
  const size = N / MATCH_BLOCKS;
  return Array.from({ length: MATCH_BLOCKS }, (_, block) => {
    const start = block * size;
    const comparison: number[] = [];
    for (let i = start; i < start + size; i++) if (!P[i]) comparison.push(i);
    comparison.sort((a, b) => (X[a] as number) - (X[b] as number));
    const cx = Float64Array.from(comparison, (i) => X[i] as number);
    const cy = Float64Array.from(comparison, (i) => Y[i] as number);
    const mx = cx.reduce((s, v) => s + v, 0) / cx.length;
    const my = cy.reduce((s, v) => s + v, 0) / cy.length;
    let sxy = 0;
    let sxx = 0;
    for (let k = 0; k < cx.length; k++) {
      sxy += ((cx[k] as number) - mx) * ((cy[k] as number) - my);
      sxx += ((cx[k] as number) - mx) ** 2;
    }
    const slope = sxy / sxx;
    let sum = 0;
    let count = 0;
    for (let i = start; i < start + size; i++) {
      if (!P[i]) continue;
      const x = X[i] as number;
      let lo = 0;
      let hi = cx.length - 1;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if ((cx[mid] as number) < x) lo = mid;
        else hi = mid;
      }
      const j = Math.abs((cx[lo] as number) - x) <= Math.abs((cx[hi] as number) - x) ? lo : hi;
      sum += (Y[i] as number) - (cy[j] as number) - slope * (x - (cx[j] as number));
      count++;
    }
    return sum / count;
  });
}

const meanOf = (a: number[]): number => a.reduce((s, x) => s + x, 0) / a.length;
const sdOf = (a: number[]): number => {
  const m = meanOf(a);
  return Math.sqrt(a.reduce((s, x) => s + (x - m) ** 2, 0) / (a.length - 1));
};

describe('selection closed forms against an independent plain-JS Monte Carlo (600,000 people per rule, seeded; 3 MC SEs)', () => {
  for (const c of CASES) {
    it(c.name, () => {
      const settings = { ...c.settings, tau: TAU, growth: GROWTH, assumedReliability: RHO_ASSUMED };
      const closed = analysePlan(selectionPlan(settings));
      const atBatchSize = analysePlan(selectionPlan({ ...settings, poolSize: N / BATCHES }));
      const sim = simulate(c);
      const checked = Object.keys(sim).sort();
      const expectedIds = Object.keys(closed.analyses).filter(
        (id) => !(id === 'matchedDifference' && closed.analyses.matchedDifference?.feasible === false),
      );
      expect(checked).toEqual(expectedIds.sort());
      for (const [id, values] of Object.entries(sim) as [AnalysisId, number[]][]) {
        const mcMean = meanOf(values);
        const mcse = sdOf(values) / Math.sqrt(values.length);
        const want = closed.analyses[id]!.expectedEstimate;
        expect(Math.abs(mcMean - want), `${id}: Monte Carlo ${mcMean.toFixed(4)} ± ${mcse.toFixed(4)} vs closed form ${want.toFixed(4)}`).toBeLessThanOrEqual(3 * mcse);
        if (id !== 'matchedDifference') {
          const se = atBatchSize.analyses[id]!.se as number;
          const ratio = sdOf(values) / se;
          expect(Math.abs(ratio - 1), `${id}: SD of batch estimates ${sdOf(values).toFixed(4)} vs closed-form SE ${se.toFixed(4)}`).toBeLessThanOrEqual(0.34);
        }
      }
    });
  }
});
