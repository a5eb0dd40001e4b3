import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { analysisStandardError } from '../../src/core/analysisStandardError';
import { twoSidedPower } from '../../src/core/power';
import { demoPlan } from '../../src/io/demoPlan';
import { adjustedDifferenceStandardError } from '../../src/core/adjustedDifferenceStandardError';
import { studentTQuantile } from '../../src/core/distributions';
import type { ModelParameters } from '../../src/core/modelParameters';
import { welchSatterthwaiteDf } from '../../src/core/welchSatterthwaiteDf';
import { modelFixture } from './modelFixture';
import { normalSource, mean, sd } from './independentNormals';

// The closed-form SEs of the gain score (Welch 1947), ANCOVA and the corrected ANCOVA
// (delta method; Porter 1967 for the estimator) when the groups differ in size and spread,
// checked against a seeded Monte Carlo written here from the model's definition
// (T ~ N(mu_g, trueSD_g²), X = T + E, Y = beta T + e) with plain arithmetic and a
// Box–Muller normal generator; no core code draws or estimates anything.


/** Invented: pretest SDs 20 (programme) and 10 (comparison), SEM 5 in both, beta .5, residual SD 5. */
function unequalSpread(nP: number, nC: number, gap: number): ModelParameters {
  const base = modelFixture({ nP, nC, gap, beta: 0.5, residualSD: 5 });
  const tvP = 400 - 25;
  const tvC = 100 - 25;
  return {
    ...base,
    sem: 5,
    observedSD: { programme: 20, comparison: 10 },
    trueSD: { programme: Math.sqrt(tvP), comparison: Math.sqrt(tvC) },
    reliability: { programme: tvP / 400, comparison: tvC / 100, pooled: (nP * tvP + nC * tvC) / (nP * 400 + nC * 100) },
    posttestSD: { programme: Math.sqrt(0.25 * tvP + 25), comparison: Math.sqrt(0.25 * tvC + 25) },
  };
}

interface Replications {
  ancova: number[];
  gainScore: number[];
  correctedAncova: number[];
  /** Share of replications in which the gain-score t test rejects at .05: Welch's and the pooled one. */
  welchRejects: number;
  pooledRejects: number;
}

function simulate(m: ModelParameters, rhoAssumed: number, R: number, seed: number): Replications {
  const z = normalSource(seed);
  const out: Replications = { ancova: [], gainScore: [], correctedAncova: [], welchRejects: 0, pooledRejects: 0 };
  const nP = m.n.programme;
  const nC = m.n.comparison;
  const xs = new Float64Array(Math.max(nP, nC));
  const ys = new Float64Array(xs.length);
  const group = (n: number, mu: number, tSD: number, eSD: number) => {
    let sx = 0;
    let sy = 0;
    for (let i = 0; i < n; i++) {
      const t = mu + tSD * z();
      xs[i] = t + eSD * z();
      ys[i] = m.beta * t + m.residualSD * z();
      sx += xs[i]!;
      sy += ys[i]!;
    }
    const mx = sx / n;
    const my = sy / n;
    let sxx = 0;
    let sxy = 0;
    let sgg = 0; // sum of squares of the gain Y − X about its mean
    for (let i = 0; i < n; i++) {
      sxx += (xs[i]! - mx) ** 2;
      sxy += (xs[i]! - mx) * (ys[i]! - my);
      sgg += (ys[i]! - xs[i]! - (my - mx)) ** 2;
    }
    return { mx, my, sxx, sxy, sgg };
  };
  const eSD = (g: 'programme' | 'comparison') => Math.sqrt(m.observedSD[g] ** 2 - m.trueSD[g] ** 2);
  const tPooled = studentTQuantile(0.975, nP + nC - 2);
  for (let r = 0; r < R; r++) {
    const p = group(nP, m.mean.programme, m.trueSD.programme, eSD('programme'));
    const c = group(nC, m.mean.comparison, m.trueSD.comparison, eSD('comparison'));
    const b = (p.sxy + c.sxy) / (p.sxx + c.sxx);
    const gain = p.my - p.mx - (c.my - c.mx);
    out.ancova.push(p.my - c.my - b * (p.mx - c.mx));
    out.gainScore.push(gain);
    out.correctedAncova.push(p.my - c.my - (b / rhoAssumed) * (p.mx - c.mx));
    // Gain-score t tests with the sample variances: Welch (1947) and the pooled two-sample t.
    const vP = p.sgg / (nP - 1) / nP;
    const vC = c.sgg / (nC - 1) / nC;
    const dfW = (vP + vC) ** 2 / (vP * vP / (nP - 1) + vC * vC / (nC - 1));
    if (Math.abs(gain) / Math.sqrt(vP + vC) > studentTQuantile(0.975, dfW)) out.welchRejects += 1 / R;
    const pooledVar = (p.sgg + c.sgg) / (nP + nC - 2);
    if (Math.abs(gain) / Math.sqrt(pooledVar * (1 / nP + 1 / nC)) > tPooled) out.pooledRejects += 1 / R;
  }
  return out;
}

const IDS = ['ancova', 'gainScore', 'correctedAncova'] as const;

describe('closed-form SEs vs a Monte Carlo of the model, unequal groups', () => {
  // Tolerance on each SE: 3% of the closed form. With R = 10,000 the Monte Carlo SE of an SD is
  // about 0.7% (SD/sqrt(2(R − 1)), common practice), so 3% is about 4 MCSEs and leaves under 1% for
  // the large-sample approximation's own error (delta method, first order).
  const R = 10_000;
  const scenarios = [
    { name: '20 vs 400, pretest SDs 20 vs 10, no gap', m: unequalSpread(20, 400, 0), rhoAssumed: 0.8, seed: 11 },
    { name: '20 vs 400, pretest SDs 20 vs 10, gap 10', m: unequalSpread(20, 400, 10), rhoAssumed: 0.8, seed: 12 },
    { name: '400 vs 20, pretest SDs 20 vs 10, gap 10', m: unequalSpread(400, 20, 10), rhoAssumed: 0.8, seed: 13 },
    // Invented: 100 vs 100, reliability .5 in both groups and rho' = .5, gap 1 pretest SD (10 points).
    { name: "100 vs 100, rho = rho' = .5, gap 1 SD", m: modelFixture({ rhoP: 0.5, gap: 10, beta: 1, residualSD: 5 }), rhoAssumed: 0.5, seed: 14 },
  ];
  for (const sc of scenarios) {
    const reps = simulate(sc.m, sc.rhoAssumed, R, sc.seed);
    for (const id of IDS) {
      it(`${sc.name}: ${id} empirical SE within 3% of the closed form (delta method; Welch 1947; Porter 1967)`, () => {
        const closed = analysisStandardError(id, sc.m, { programme: sc.m.n.programme, comparison: sc.m.n.comparison }, { assumedReliability: sc.rhoAssumed, ratio: 1 });
        expect(Math.abs(sd(reps[id]) / closed.se - 1)).toBeLessThan(0.03);
      });
    }
  }

  it('20 vs 400: the Welch gain-score test keeps its .05 level, the pooled t does not (Welch 1947)', () => {
    // Tolerance: 4 binomial MCSEs of a rate near .05 with R = 10,000 (sqrt(.05·.95/R) ≈ .0022).
    const reps = simulate(unequalSpread(20, 400, 0), 0.8, R, 21);
    expect(Math.abs(reps.welchRejects - 0.05)).toBeLessThan(4 * Math.sqrt((0.05 * 0.95) / R));
    // The pooled variance is dominated by the 400 comparison members' smaller gain variance
    // (computed: var(Y − X) 143.75 vs 68.75), so its SE is too small and it rejects far more often.
    expect(reps.pooledRejects).toBeGreaterThan(0.1);
  });

  it('20 vs 400: the closed-form gain-score df is the Welch–Satterthwaite df of the population variances (Welch 1947); tolerance 1e-9', () => {
    const m = unequalSpread(20, 400, 0);
    const r = analysisStandardError('gainScore', m, { programme: 20, comparison: 400 }, { assumedReliability: 0.8, ratio: 1 });
    // var(Y − X) = beta²trueVar + resVar + obsVar − 2 beta trueVar, computed by hand:
    // programme .25·375 + 25 + 400 − 375 = 143.75; comparison .25·75 + 25 + 100 − 75 = 68.75.
    const a = 143.75 / 20;
    const c = 68.75 / 400;
    expect(r.se).toBeCloseTo(Math.sqrt(a + c), 9);
    expect(r.df).toBeCloseTo((a + c) ** 2 / (a * a / 19 + c * c / 399), 9);
    expect(r.df).toBeLessThan(20);
  });
});

describe('with the same variances and equal n the new SEs are the pooled textbook ones', () => {
  // Tolerance 1e-12 (the same arithmetic in another order).
  const m = modelFixture({ gap: 8, rhoP: 0.7, beta: 0.9, residualSD: 6, nP: 120, nC: 120 });
  const sizes = { programme: 120, comparison: 120 };
  const tv = 0.7 * 100;
  const varY = 0.81 * tv + 36;
  const cov = 0.9 * tv;
  it('gain score: pooled two-sample t, SE² = v(2/n), df 2n − 2 (common practice)', () => {
    const r = analysisStandardError('gainScore', m, sizes, { assumedReliability: 0.8, ratio: 1 });
    const v = varY + 100 - 2 * cov;
    expect(r.se).toBeCloseTo(Math.sqrt((v * 2) / 120), 12);
    expect(r.df).toBeCloseTo(238, 9);
  });
  it('ANCOVA: σ²(2/n + Δ²/SS_X), df 2n − 3 (Cochran 1957, from memory)', () => {
    const r = analysisStandardError('ancova', m, sizes, { assumedReliability: 0.8, ratio: 1 });
    const b = cov / 100;
    const sigma2 = varY - b * cov;
    expect(r.se).toBeCloseTo(Math.sqrt(sigma2 * (2 / 120 + 64 / (238 * 100))), 12);
    expect(r.df).toBeCloseTo(237, 9);
  });
  it("corrected ANCOVA: σ_c²(2/n) + Δ²σ²/(rho'²SS_X), σ_c² about the slope b/rho' (computed from the delta method)", () => {
    const r = analysisStandardError('correctedAncova', m, sizes, { assumedReliability: 0.8, ratio: 1 });
    const b = cov / 100;
    const sigma2 = varY - b * cov;
    const bc = b / 0.8;
    const sigma2c = varY - 2 * bc * cov + bc * bc * 100;
    expect(r.se).toBeCloseTo(Math.sqrt(sigma2c * (2 / 120) + (64 * sigma2) / (0.64 * 238 * 100)), 12);
  });
});

describe('welchSatterthwaiteDf and adjustedDifferenceStandardError: edge cases', () => {
  it('equal terms give the summed df; one dominant term gives about its own df (Welch 1947, computed); tolerance 1e-12 / 0.1', () => {
    expect(welchSatterthwaiteDf([{ variance: 2, df: 99 }, { variance: 2, df: 99 }])).toBeCloseTo(198, 12);
    expect(welchSatterthwaiteDf([{ variance: 20, df: 19 }, { variance: 0.25, df: 399 }])).toBeCloseTo(19.48, 1);
  });
  it('throws on a negative variance or a zero df, naming the term', () => {
    expect(() => welchSatterthwaiteDf([{ variance: -1, df: 3 }])).toThrow(/variance term/);
    expect(() => welchSatterthwaiteDf([{ variance: 1, df: 0 }])).toThrow(/degrees of freedom/);
    expect(() => welchSatterthwaiteDf([{ variance: 0, df: 3 }])).toThrow(/every variance term is zero/);
  });
  it('group slopes that differ from the pooled slope add (u·d_g)² to the slope variance (Isserlis 1918, computed); tolerance 1e-12', () => {
    // One variable, n 11 each, var X 1, cov(X, Y) 1 and 0 → b* = .5, d = ±.5; var Y 2 and 1; gap 1.
    const P = { n: 11, varY: 2, covXY: [1], covX: [[1]] };
    const C = { n: 11, varY: 1, covXY: [0], covX: [[1]] };
    const r = adjustedDifferenceStandardError(P, C, [1], [[1]]);
    // a_P = (2 − 1 + .25)/11, a_C = (1 + .25)/11; r_P = 1.25, r_C = 1.25; u = 1/20;
    // slope term = Σ 10·(1.25/400 + .25/400) = 20·1.5/400 = .075.
    expect(r.se).toBeCloseTo(Math.sqrt(2.5 / 11 + 0.075), 12);
    expect(r.df).toBeCloseTo(19, 12);
  });
});

describe('required n per group uses the same Welch form', () => {
  it('gain score, invented plan with pretest SDs 20 vs 10: power at the required n reaches the target, one fewer does not (Cohen 1988 ch. 2; Welch 1947)', () => {
    const plan = demoPlan();
    plan.groups.programme.pretestSD = 20;
    plan.groups.comparison.pretestSD = 10;
    // The required n is given only for a tolerable artefact: tolerate the whole effect here, so the search itself is checked.
    plan.analysis.tolerableBiasShare = 1;
    const r = analysePlan(plan);
    const m = r.model;
    const a = r.analyses.gainScore!;
    expect(a.requiredNPerGroup).not.toBeNull();
    // var(Y − X) from the model's definition Y = beta·T + e, X = T + E: (beta − 1)²·trueVar + residualVar + SEM².
    const gainVar = (g: 'programme' | 'comparison') => (m.beta - 1) ** 2 * m.trueSD[g] ** 2 + m.residualSD ** 2 + m.sem ** 2;
    const powerAt = (n: number) => {
      const vP = gainVar('programme') / n;
      const vC = gainVar('comparison') / n;
      const df = (vP + vC) ** 2 / ((vP * vP) / (n - 1) + (vC * vC) / (n - 1));
      return twoSidedPower(a.expectedEstimate, Math.sqrt(vP + vC), df, plan.analysis.alpha);
    };
    const target = plan.analysis.targetPower ?? 0.8;
    const n = a.requiredNPerGroup!;
    expect(powerAt(n)).toBeGreaterThanOrEqual(target);
    expect(powerAt(n - 1)).toBeLessThan(target);
  });
});
