import { requiredNCounts } from '../../src/core/requiredNCounts';
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { analysisSettings } from '../../src/core/analysisSettings';
import { plannedAnalysisRecord } from '../../src/core/plannedAnalysisRecord';
import { analyseSelectionPlan, NO_OVERLAP_REASON } from '../../src/core/design/analyseSelectionPlan';
import { selectionArtefact } from '../../src/core/design/selectionEstimates';
import { selectionMatchedFigures } from '../../src/core/design/selectionMatching';
import {
  selectionModel,
  selectionProbabilityGiven,
  SEL_PRETEST,
  SEL_SCREENER,
  truncatedMoments,
} from '../../src/core/design/selectionModel';
import { selectionModelParameters } from '../../src/core/design/selectionModelParameters';
import { modelWith, populationWithSem } from '../../src/core/design/selectionVariants';
import { selectionPlan, type SelectionSettings } from './selectionPlanFixture';

const phi = (z: number): number => jStat.normal.pdf(z, 0, 1) as number;
const Phi = (z: number): number => jStat.normal.cdf(z, 0, 1) as number;
const PhiInv = (p: number): number => jStat.normal.inv(p, 0, 1) as number;

/** Simpson's rule on [lo, hi] with n (even) intervals: plain numerical integration written here. */
function simpson(f: (x: number) => number, lo: number, hi: number, n = 20000): number {
  const h = (hi - lo) / n;
  let s = f(lo) + f(hi);
  for (let i = 1; i < n; i++) s += (i % 2 === 1 ? 4 : 2) * f(lo + i * h);
  return (s * h) / 3;
}

/** The task's check population: mean 50, SD 10, reliability .8, r .7, posttest SD 10 (invented). */
const lowestFifth = 50 + 10 * PhiInv(0.2);

describe('truncated-normal moments (Johnson, Kotz & Balakrishnan 1994, ch. 13: E[z | z < a] = −φ(a)/Φ(a), Var = 1 − aλ − λ²)', () => {
  it.each([-3, -0.8416, 0, 0.5, 2.5])('a = %d: share, mean and variance against the formula (jStat) and numerical integration; tolerance 1e-9', (a) => {
    for (const side of ['below', 'above'] as const) {
      const t = truncatedMoments(a, side);
      // Formula with jStat's φ, Φ (an independent library).
      const lam = side === 'below' ? phi(a) / Phi(a) : phi(a) / (1 - Phi(a));
      const share = side === 'below' ? Phi(a) : 1 - Phi(a);
      const mean = side === 'below' ? -lam : lam;
      const variance = side === 'below' ? 1 - a * lam - lam * lam : 1 + a * lam - lam * lam;
      expect(t.share).toBeCloseTo(share, 9);
      expect(t.mean).toBeCloseTo(mean, 9);
      expect(t.variance).toBeCloseTo(variance, 9);
      // Numerical integration of z φ(z) and z² φ(z) over the selected side (Simpson, 20,000 intervals over ±12).
      const [lo, hi] = side === 'below' ? [-12, a] : [a, 12];
      const m0 = simpson(phi, lo, hi);
      const m1 = simpson((z) => z * phi(z), lo, hi) / m0;
      const m2 = simpson((z) => z * z * phi(z), lo, hi) / m0;
      expect(t.mean).toBeCloseTo(m1, 8);
      expect(t.variance).toBeCloseTo(m2 - m1 * m1, 8);
    }
  });
  it('a = 0, above: mean sqrt(2/π) = 0.79788 and variance 1 − 2/π = 0.36338 (half-normal; common practice); tolerance 1e-12', () => {
    const t = truncatedMoments(0, 'above');
    expect(t.mean).toBeCloseTo(Math.sqrt(2 / Math.PI), 12);
    expect(t.variance).toBeCloseTo(1 - 2 / Math.PI, 12);
  });
  it('far tails stay finite and ordered (mean just beyond the cut-off: a + 1/a asymptote, Abramowitz & Stegun 26.2.12, from memory); tolerance 1e-3', () => {
    const t = truncatedMoments(-40, 'below');
    expect(t.mean).toBeCloseTo(-40 - 1 / 40, 3);
    expect(t.variance).toBeGreaterThanOrEqual(0);
  });
});

describe('the probability rule is a sharp cut on B + spread·ε (common practice: P(B + sε < c) = Φ((c − B)/s))', () => {
  const plan = selectionPlan({ rule: 'probability', basis: 'pretest', cutOff: 45, spread: 6 });
  const m = selectionModel(plan);
  it('P(programme | pretest = x) = Φ((c − x)/s); tolerance 1e-12', () => {
    for (const x of [20, 40, 45, 51, 80]) expect(selectionProbabilityGiven(m, SEL_PRETEST, x)).toBeCloseTo(Phi((45 - x) / 6), 12);
  });
  it('share and programme pretest mean equal numerical integrals of φ_X(x)·Φ((c − x)/s) (Simpson over ±10 SD); tolerance 1e-8', () => {
    const f = (x: number): number => (phi((x - 50) / 10) / 10) * Phi((45 - x) / 6);
    const share = simpson(f, -50, 150);
    const meanX = simpson((x) => x * f(x), -50, 150) / share;
    expect(m.programme.share).toBeCloseTo(share, 8);
    expect(m.programme.mean[SEL_PRETEST] as number).toBeCloseTo(meanX, 8);
  });
  it('on a screener: P(programme | screener = s) = Φ((c − s)/spread) too; tolerance 1e-12', () => {
    const ms = selectionModel(selectionPlan({ rule: 'probability', basis: 'screener', screenerReliability: 0.7, cutOff: 45, spread: 6 }));
    for (const s of [30, 45, 60]) expect(selectionProbabilityGiven(ms, SEL_SCREENER, s)).toBeCloseTo(Phi((45 - s) / 6), 12);
  });
});

describe('check values: one population, mean 50, SD 10, reliability .8, r .7, posttest SD 10, lowest fifth (computed; REFERENCES.md measured illustration: ANCOVA ≈ 0, gain +5.2, screener ANCOVA −3.2)', () => {
  it('cut on the pretest: ANCOVA 0.00, regression discontinuity 0.00, gain +5.25 (computed: gain = (βρ − 1)ΔX = −0.3·(−17.50)); tolerance 0.005', () => {
    const r = analysePlan(selectionPlan({ cutOff: lowestFifth }));
    expect(r.analyses.ancova!.expectedEstimate).toBeCloseTo(0, 9);
    expect(r.analyses.regressionDiscontinuity!.expectedEstimate).toBeCloseTo(0, 9);
    expect(r.analyses.gainScore!.expectedEstimate).toBeCloseTo(5.25, 2);
    // Independent route (JKB 1994 truncated means): ΔX = −10·λ_below − 10·λ_above at a = Φ⁻¹(.2).
    const a = PhiInv(0.2);
    const dX = -10 * (phi(a) / Phi(a)) - 10 * (phi(a) / (1 - Phi(a)));
    expect(r.analyses.gainScore!.expectedEstimate).toBeCloseTo((0.7 - 1) * dX, 9);
    expect(r.design.selectedShare).toBeCloseTo(0.2, 12);
    expect(r.design.meaning).toBe(
      'The rule used the pretest itself: ANCOVA on the pretest and regression discontinuity are free of the regression artefact here; ' +
        'the gain score and the reliability-corrected ANCOVA are not. A sharp cut-off on the pretest leaves no overlap: nobody in the ' +
        'comparison group has a programme member\u2019s score, so exact matching is impossible.',
    );
  });
  it('the same share on a screener of reliability .7 (cut at its 20th percentile): ANCOVA −3.16 (computed by hand from the selection formulas); tolerance 0.005', () => {
    const screenerSD = Math.sqrt(80 / 0.7);
    const r = analysePlan(selectionPlan({ basis: 'screener', screenerReliability: 0.7, cutOff: 50 + screenerSD * PhiInv(0.2) }));
    expect(r.analyses.ancova!.expectedEstimate).toBeCloseTo(-3.16, 2);
    expect(r.analyses.regressionDiscontinuity!.expectedEstimate).toBeCloseTo(0, 9);
    expect(r.design.meaning).toMatch(/^The rule used the screener, which this plan does not adjust for: ANCOVA on the pretest is biased \(−3\.16 points\)/);
  });
  it('a sharp cut on the pretest leaves no overlap: the matched difference is not feasible, with a plain reason and no SE, power or n', () => {
    const r = analysePlan(selectionPlan({ cutOff: lowestFifth }));
    const md = r.analyses.matchedDifference!;
    expect(md.feasible).toBe(false);
    expect(md.infeasibleReason).toBe(NO_OVERLAP_REASON);
    expect([md.se, md.df, md.power, md.falsePositiveRate, md.requiredNPerGroup]).toEqual([null, null, null, null, null]);
  });
  it('a probability rule on the pretest: exact matching on it is unbiased, to the integration accuracy (1e-10)', () => {
    const r = analysePlan(selectionPlan({ rule: 'probability', cutOff: lowestFifth, spread: 3, tau: 2 }));
    expect(r.analyses.matchedDifference!.feasible).toBe(true);
    expect(r.analyses.matchedDifference!.expectedEstimate).toBeCloseTo(2, 10);
  });
});

describe('one-group pre–post change (Barnett, van der Pols & Dobson 2005, Int J Epidemiol 34:215–220, eq. 1)', () => {
  // Their example: population mean 60, SD 15, people at or below 40 selected.
  const barnett = (rho: number, m: number): number => {
    const sb2 = rho * 225;
    const sw2 = (1 - rho) * 225;
    const sd = Math.sqrt(sb2 + sw2 / m);
    const z = (40 - 60) / sd;
    return ((sw2 / m) / sd) * (phi(z) / Phi(z));
  };
  it('r = .5 → +13.49 points with no programme (REFERENCES.md, computed from eq. 1); tolerance 0.005 and 1e-9 against eq. 1', () => {
    const plan = selectionPlan({ design: 'one-group', mean: 60, sd: 15, posttestSD: 15, r: 0.5, reliability: 0.8, cutOff: 40 });
    const r = analysePlan(plan);
    expect(Object.keys(r.analyses)).toEqual(['prePostChange']);
    expect(r.analyses.prePostChange!.expectedEstimate).toBeCloseTo(13.49, 2);
    expect(r.analyses.prePostChange!.expectedEstimate).toBeCloseTo(barnett(0.5, 1), 9);
    expect(r.design.noProgrammeChange).toBeCloseTo(13.486, 3);
    expect(r.analyses.prePostChange!.verdict).toBe('invents');
  });
  it.each([
    [0.3, 18.88],
    [0.7, 8.09],
  ])('r = %d → %d (REFERENCES.md, computed from eq. 1); tolerance 0.005', (rho, want) => {
    const plan = selectionPlan({ design: 'one-group', mean: 60, sd: 15, posttestSD: 15, r: rho, reliability: 0.9, cutOff: 40 });
    expect(analysePlan(plan).analyses.prePostChange!.expectedEstimate).toBeCloseTo(want, 2);
  });
  it('m = 2 averaged baselines, r = .5 → +8.54 (REFERENCES.md, computed from eq. 1; parallel measurements: reliability .5 = r, slope 1); tolerance 0.005', () => {
    const plan = selectionPlan({ design: 'one-group', mean: 60, sd: 15, posttestSD: 15, r: 0.5, reliability: 0.5, cutOff: 40 });
    const m = selectionModel(plan);
    const m2 = modelWith(m, { population: populationWithSem(m.population, m.population.sem / Math.sqrt(2)) });
    expect(selectionArtefact('prePostChange', m2, 0.8)).toBeCloseTo(8.54, 2);
    expect(selectionArtefact('prePostChange', m2, 0.8)).toBeCloseTo(barnett(0.5, 2), 9);
  });
  it('the hoped-for effect and the population growth add to the expected change (model definition); SE = sd(Y − X | selected)/sqrt(n), df n − 1', () => {
    const plan = selectionPlan({ design: 'one-group', mean: 60, sd: 15, posttestSD: 15, r: 0.5, reliability: 0.8, cutOff: 40, tau: 3, growth: 1 });
    const r = analysePlan(plan);
    const a = r.analyses.prePostChange!;
    expect(a.expectedEstimate).toBeCloseTo(barnett(0.5, 1) + 4, 9);
    expect(a.bias).toBeCloseTo(barnett(0.5, 1) + 1, 9);
    const m = selectionModel(plan);
    const c = m.programme.cov;
    const v = c[2]![2]! + c[0]![0]! - 2 * c[0]![2]!;
    expect(a.se).toBeCloseTo(Math.sqrt(v / m.programme.n), 12);
    expect(a.df).toBeCloseTo(m.programme.n - 1, 9);
    expect(r.design.noProgrammeChange).toBeCloseTo(barnett(0.5, 1) + 1, 9);
  });
});

describe('regression discontinuity variance inflation (Goldberger 1972, from memory; Cappelleri, Darlington & Trochim 1994)', () => {
  it('a cut-off at the mean of a normal assignment score: 1/(1 − 2/π) = 2.7519 (REFERENCES.md, computed); tolerance 1e-9', () => {
    for (const s of [{ basis: 'pretest' as const }, { basis: 'screener' as const, screenerReliability: 0.6 }]) {
      const r = analysePlan(selectionPlan({ ...s, cutOff: 50 }));
      expect(r.analyses.regressionDiscontinuity!.varianceInflation).toBeCloseTo(1 / (1 - 2 / Math.PI), 9);
      expect(r.analyses.regressionDiscontinuity!.varianceInflation).toBeCloseTo(2.75, 2);
    }
  });
  it('SE² = Var(Y0 | B)/(N p(1 − p)) × inflation, df N − 3 (OLS; common practice)', () => {
    const plan = selectionPlan({ cutOff: 50 });
    const r = analysePlan(plan);
    // Var(Y0 | X) = σ_Y²(1 − r²) = 100·(1 − .49) = 51.
    const want = Math.sqrt((51 / (20000 * 0.25)) * (1 / (1 - 2 / Math.PI)));
    expect(r.analyses.regressionDiscontinuity!.se).toBeCloseTo(want, 9);
    expect(r.analyses.regressionDiscontinuity!.df).toBe(19997);
  });
  it('no regression discontinuity for a rule on the true score (nothing measured to adjust for)', () => {
    const r = analysePlan(selectionPlan({ basis: 'true-score', cutOff: lowestFifth }));
    expect(r.analyses.regressionDiscontinuity).toBeUndefined();
    expect(r.design.meaning).toMatch(/^Selection used something you did not measure \(judged need\): every analysis on the pretest is biased/);
  });
});

describe('matched difference by numerical integration: an independent route through the true score (conditioning on T instead of the truncated bivariate normal)', () => {
  // E[Y0 | X = x, g] = μ + β(E[T | x, g] − μ); E[T | x, g] = ∫ t φ(t | x) P(g | t) dt / ∫ φ(t | x) P(g | t) dt,
  // with P(below | t) = Φ((c − t)/sqrt(σ²_own + s²)) (the basis' own error and the spread given T). Plain Simpson grids
  // (inner ± 10 SD of T | x, 400 intervals; outer ± 10 SD of X, 2,400 intervals; doubling either moves the result by < 1e-12).
  it.each([
    ['screener, cut-off', { basis: 'screener' as const, screenerReliability: 0.7, cutOff: 42 }],
    ['screener, probability', { basis: 'screener' as const, screenerReliability: 0.6, cutOff: 55, rule: 'probability' as const, spread: 5, side: 'above' as const }],
    ['true score, probability', { basis: 'true-score' as const, cutOff: 44, rule: 'probability' as const, spread: 4 }],
  ] as [string, SelectionSettings][])('%s: artefact agrees within 1e-8 points', (_, s) => {
    const plan = selectionPlan(s);
    const m = selectionModel(plan);
    const tv = 80;
    const sem2 = 20;
    const beta = (0.7 * 10) / (10 * 0.8);
    const own = s.basis === 'screener' ? tv / s.screenerReliability! - tv : 0;
    const tail = Math.sqrt(own + (s.spread ?? 0) ** 2);
    const pBelow = (t: number): number => Phi((s.cutOff - t) / tail);
    const pProg = (t: number): number => ((s.side ?? 'below') === 'below' ? pBelow(t) : 1 - pBelow(t));
    const kT = tv / (tv + sem2);
    const sdTgivenX = Math.sqrt(tv * (1 - kT));
    const eT = (x: number, g: (t: number) => number): [number, number] => {
      const mt = 50 + kT * (x - 50);
      const dens = (t: number): number => phi((t - mt) / sdTgivenX) * g(t);
      const lo = mt - 10 * sdTgivenX;
      const hi = mt + 10 * sdTgivenX;
      const mass = simpson(dens, lo, hi, 400);
      return [simpson((t) => t * dens(t), lo, hi, 400) / mass, mass];
    };
    let num = 0;
    let den = 0;
    const xs = 2400;
    const lo = -50;
    const hi = 150; // ± 10 SD
    const h = (hi - lo) / xs;
    for (let i = 0; i <= xs; i++) {
      const x = lo + i * h;
      const w = (i === 0 || i === xs ? 1 : i % 2 === 1 ? 4 : 2) * (phi((x - 50) / 10) / 10);
      const [tP, massP] = eT(x, pProg);
      const [tC, massC] = eT(x, (t) => 1 - pProg(t));
      // Where a group's mass underflows (beyond about 9 SD) the programme's weight is below 1e-18: left out.
      if (!(massP > 0 && massC > 0)) continue;
      const fP = w * massP;
      num += fP * beta * (tP - tC);
      den += fP;
    }
    expect(selectionMatchedFigures(m).artefact).toBeCloseTo(num / den, 8);
  });
});

describe('results for the rest of the planner', () => {
  const plan = selectionPlan({ basis: 'screener', screenerReliability: 0.7, cutOff: 42, tau: 2.5, growth: 0.5 });
  const r = analysePlan(plan);
  it('analysePlan dispatches selection plans to analyseSelectionPlan (the design seam); analyses in design order', () => {
    expect(r).toStrictEqual({ ...analyseSelectionPlan(plan), requiredNCounts: requiredNCounts(plan) });
    expect(Object.keys(r.analyses)).toEqual(['matchedDifference', 'ancova', 'gainScore', 'correctedAncova', 'regressionDiscontinuity']);
    expect(r.design.kind).toBe('selection');
    expect(r.design.rule).toBe('People whose screener score was below 42 were selected (a sharp cut-off).');
  });
  it('the growth gap is added to every two-group estimate (model definition): RD = tau + growth exactly', () => {
    expect(r.analyses.regressionDiscontinuity!.expectedEstimate).toBeCloseTo(3, 9);
    expect(r.analyses.regressionDiscontinuity!.bias).toBeCloseTo(0.5, 9);
    expect(r.design.meaning).toMatch(/growth gap \(0\.50 points\) biases every analysis alike/);
  });
  it('model parameters come from the groups: within-group reliability var_g(T)/var_g(X) when errors are independent of true scores in the group (screener rule), sizes = population × share', () => {
    const m = selectionModel(plan);
    const mp = selectionModelParameters(m, plan);
    expect(r.model).toStrictEqual(mp);
    expect(mp.reliability.programme).toBeCloseTo(m.programme.cov[1]![1]! / m.programme.cov[0]![0]!, 12);
    expect(mp.reliability.programme).toBeLessThan(0.8); // selection narrows the true-score spread (common practice: range restriction)
    expect(mp.n.programme + mp.n.comparison).toBeCloseTo(20000, 9);
    expect(r.breakEven.reliability).toBeNull();
    expect(r.breakEven.note).toMatch(/belongs to existing groups/);
  });
  it('a rule on the pretest leaves the slope of T on X at the population reliability .8 in both groups (selection on X keeps E[T | X]; Kelley 1947, common practice), although var_g(T)/var_g(X) exceeds 1', () => {
    const p = selectionPlan({ cutOff: lowestFifth });
    const m = selectionModel(p);
    const mp = selectionModelParameters(m, p);
    expect(mp.reliability.programme).toBeCloseTo(0.8, 12);
    expect(mp.reliability.comparison).toBeCloseTo(0.8, 12);
    expect(m.programme.cov[1]![1]! / m.programme.cov[0]![0]!).toBeGreaterThan(1);
  });
  it('ANCOVA SE equals the delta-method SE with equal group moments reduced to Cochran\u2019s pooled form when the rule is nearly random (common practice)', () => {
    // A rule on a screener of tiny reliability barely sorts people: both groups have nearly the population's moments,
    // so SE ≈ σ_e·sqrt(1/n_P + 1/n_C) with σ_e² = σ_Y²(1 − r²) = 51. Tolerance 1% (the groups still differ slightly).
    const flat = analysePlan(selectionPlan({ basis: 'screener', screenerReliability: 0.001, cutOff: 50 }));
    const want = Math.sqrt(51 * (1 / 10000 + 1 / 10000));
    expect(Math.abs(flat.analyses.ancova!.se! / want - 1)).toBeLessThan(0.01);
  });
  it('planned-procedure figures replace the matched difference exactly as for existing groups (plannedAnalysisRecord)', () => {
    const planned = {
      replications: 40,
      seed: 7,
      analyses: { matchedDifference: { meanEstimate: -1.2, meanEstimateMCSE: 0.05, se: 0.3, nProgramme: 900, nComparison: 900 } },
    };
    const withPlanned = analysePlan(plan, planned);
    const formula = r.analyses.matchedDifference!;
    const settings = analysisSettings(plan, formula.nProgramme);
    expect(withPlanned.analyses.matchedDifference).toStrictEqual(
      plannedAnalysisRecord(formula, planned.analyses.matchedDifference, r.tau, plan.outcome.posttestSD, settings),
    );
    expect(withPlanned.analyses.matchedDifference!.standardErrorNote).toBeUndefined();
    expect(formula.standardErrorNote).toMatch(/^Approximate SE/);
    expect(withPlanned.procedure).toEqual({ basis: 'planned-procedure', replications: 40, seed: 7 });
    expect(withPlanned.analyses.ancova).toStrictEqual(r.analyses.ancova);
  });
  it('the required n is the programme group size at which power reaches the target (rule split kept)', () => {
    const a = r.analyses.regressionDiscontinuity!;
    expect(a.requiredNPerGroup).not.toBeNull();
    // At the required programme size the power is at least .8; one fewer falls short (Cohen 1988 definition).
    const n = a.requiredNPerGroup!;
    const p = selectionModel(plan).programme.share;
    const seAt = (k: number): number => a.se! * Math.sqrt((20000 * p) / k);
    const power = (k: number): number => {
      const df = k / p - 3;
      const crit = jStat.studentt.inv(0.975, df) as number;
      const ncp = a.expectedEstimate / seAt(k);
      return 1 - (jStat.noncentralt.cdf(crit, df, ncp) as number) + (jStat.noncentralt.cdf(-crit, df, ncp) as number);
    };
    expect(power(n)).toBeGreaterThanOrEqual(0.8 - 1e-6);
    expect(power(n - 1)).toBeLessThan(0.8 + 1e-6);
  });
});
