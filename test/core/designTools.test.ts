import { describe, expect, it } from 'vitest';
import { expectedMatchedShare } from '../../src/core/expectedMatchedShare';
import { breakEvenReliability } from '../../src/core/breakEvenReliability';
import { classifyArtefact } from '../../src/core/classifyArtefact';
import { rankRemedies } from '../../src/core/rankRemedies';
import { sensitivityCurve } from '../../src/core/sensitivityCurve';
import { analysisStandardError } from '../../src/core/analysisStandardError';
import { spearmanBrown } from '../../src/core/spearmanBrown';
import { matchedDifferenceEstimate } from '../../src/core/expectedEstimate';
import { analysePlan } from '../../src/core/analysePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { modelFixture } from './modelFixture';

describe('expected matched share (approximation; limits are common practice)', () => {
  const base = modelFixture({ gap: -10, nP: 180, nC: 1200 });
  it('very wide caliper without replacement: supply-limited share min(1, n_C/(k·n_P)); tolerance .01', () => {
    const m = modelFixture({ gap: -10, nP: 300, nC: 200 });
    expect(expectedMatchedShare(m, { caliper: 50, ratio: 1, replacement: false })).toBeCloseTo(200 / 300, 2);
    expect(expectedMatchedShare(m, { caliper: 50, ratio: 2, replacement: false })).toBeCloseTo(100 / 300, 2);
  });
  it('with replacement and a wide caliper everyone finds a partner (share → 1); tolerance 1e-6', () => {
    expect(expectedMatchedShare(base, { caliper: 5, ratio: 1, replacement: true })).toBeCloseTo(1, 6);
  });
  it('a caliper → 0 leaves nobody matched (continuous scores never tie); < .01', () => {
    expect(expectedMatchedShare(base, { caliper: 1e-5, ratio: 1, replacement: true })).toBeLessThan(0.01);
  });
  it('with replacement and equal distributions equals 1 − E[e^{−λ}] with λ ≈ n_C·2c·f(x) (Poisson; computed, tolerance .005)', () => {
    const m = modelFixture({ gap: 0, nP: 100, nC: 100 });
    const c = 0.01; // caliper 0.01 SD = 0.1 points; window mass ≈ 2c·f
    // Independent route: E over x ~ N(0,1) of 1 − exp(−n_C·2c·φ(x)), by a plain Riemann sum.
    let s = 0;
    const h = 0.001;
    for (let z = -8; z <= 8; z += h) {
      const phi = Math.exp(-z * z / 2) / Math.sqrt(2 * Math.PI);
      s += phi * (1 - Math.exp(-100 * 2 * c * phi)) * h;
    }
    expect(expectedMatchedShare(m, { caliper: c, ratio: 1, replacement: true })).toBeCloseTo(s, 2);
  });
  it('grows with the caliper and the comparison pool, stays in [0, 1]', () => {
    const a = expectedMatchedShare(base, { caliper: 0.1, ratio: 1, replacement: false });
    const b = expectedMatchedShare(base, { caliper: 0.4, ratio: 1, replacement: false });
    const big = expectedMatchedShare(modelFixture({ gap: -10, nP: 180, nC: 2400 }), { caliper: 0.1, ratio: 1, replacement: false });
    expect(b).toBeGreaterThanOrEqual(a);
    expect(big).toBeGreaterThanOrEqual(a);
    for (const x of [a, b, big]) expect(x >= 0 && x <= 1).toBe(true);
  });
  it('rejects a ratio below 1 and a non-positive caliper', () => {
    expect(() => expectedMatchedShare(base, { caliper: 0.2, ratio: 0.5, replacement: false })).toThrow(/at least 1/);
    expect(() => expectedMatchedShare(base, { caliper: 0, ratio: 1, replacement: false })).toThrow(/caliper must be greater than 0/);
  });
});

describe('break-even reliability (closed form, Thorndike 1942; Spearman 1910 – Brown 1910)', () => {
  it('at rho*, the matched artefact equals the tolerable share of the effect; the forms reach rho*', () => {
    const m = modelFixture({ gap: 12, rhoP: 0.7, beta: 0.9, tau: 3 });
    const be = breakEvenReliability(m, 0.2);
    const rhoStar = be.reliability as number;
    const atStar = modelFixture({ gap: 12, rhoP: 0.7, rhoC: rhoStar, beta: 0.9, tau: 3 });
    // tolerance 1e-9: exact algebra
    expect(Math.abs(matchedDifferenceEstimate(atStar) - 3)).toBeCloseTo(0.2 * 3, 9);
    const k = be.parallelForms as number;
    expect(spearmanBrown(0.7, k)).toBeGreaterThanOrEqual(rhoStar);
    expect(spearmanBrown(0.7, k - 1)).toBeLessThan(rhoStar);
  });
  it('already met when the current reliability is high enough', () => {
    const be = breakEvenReliability(modelFixture({ gap: 2, rhoP: 0.95, beta: 1, tau: 3 }), 0.25);
    expect(be.alreadyMet).toBe(true);
    expect(be.parallelForms).toBe(1);
  });
  it('not applicable (null, with a note) without an effect or a gap', () => {
    expect(breakEvenReliability(modelFixture({ tau: 0 }), 0.25).reliability).toBeNull();
    const noGap = breakEvenReliability(modelFixture({ gap: 0, tau: 2 }), 0.25);
    expect(noGap.reliability).toBeNull();
    expect(noGap.note).toMatch(/same pretest mean/);
  });
});

describe('classifyArtefact (Campbell & Erlebacher 1970: artefacts hide, reverse, inflate or invent effects)', () => {
  it.each([
    [2.5, 0.5, 'negligible'],
    [2.5, -0.625, 'negligible'],
    [2.5, -2, 'hides'],
    [2.5, -2.5, 'hides'],
    [2.5, -4, 'reverses'],
    [2.5, 1, 'inflates'],
    [-2, -1, 'inflates'],
    [-2, 3, 'reverses'],
    [0, 0.3, 'invents'],
    [0, 0, 'negligible'],
  ] as const)('tau %d, bias %d → %s (share .25)', (tau, bias, verdict) => {
    expect(classifyArtefact(tau, bias, 0.25)).toBe(verdict);
  });
});

describe('approximate SEs: special cases with textbook answers', () => {
  it('matched, perfect reliability, 1:1: SE = sqrt(2σ²/n), the paired-difference SE (common practice); tolerance 1e-12', () => {
    const m = modelFixture({ rhoP: 1, residualSD: 5 });
    const r = analysisStandardError('matchedDifference', m, { programme: 50, comparison: 50 }, { assumedReliability: 1, ratio: 1 });
    expect(r.se).toBeCloseTo(Math.sqrt((2 * 25) / 50), 12);
    expect(r.df).toBe(49);
  });
  it('ANCOVA with no pretest gap: SE = sigma_res·sqrt(1/n1 + 1/n2) (Cochran 1957, from memory); tolerance 1e-12', () => {
    const m = modelFixture({ gap: 0, rhoP: 0.8, beta: 1, residualSD: 5 });
    const r = analysisStandardError('ancova', m, { programme: 100, comparison: 100 }, { assumedReliability: 0.8, ratio: 1 });
    // residual variance about slope beta·rho: var(Y) − (beta·trueVar)²/varX = 105 − 64 = 41
    expect(r.se).toBeCloseTo(Math.sqrt(41 * 0.02), 12);
    expect(r.df).toBe(197);
  });
});

describe('remedies and sensitivity curves on the demo plan', () => {
  const plan = demoPlan();
  const remedies = rankRemedies(plan);
  it('ranks by remaining |bias| then discarded share; corrected ANCOVA (0 left) first', () => {
    expect(remedies[0]!.id).toBe('corrected-ancova');
    for (let i = 1; i < remedies.length; i++) {
      expect(Math.abs(remedies[i]!.remainingBias)).toBeGreaterThanOrEqual(Math.abs(remedies[i - 1]!.remainingBias) - 1e-9);
    }
    expect(remedies.map((r) => r.id).sort()).toEqual(
      ['corrected-ancova', 'gain-score', 'larger-pools', 'looser-caliper', 'more-reliable-pretest', 'tighter-caliper'].sort(),
    );
  });
  it('calipers and pool size leave the artefact unchanged (−2) and say so; the tighter caliper discards more', () => {
    const byId = Object.fromEntries(remedies.map((r) => [r.id, r]));
    for (const id of ['tighter-caliper', 'looser-caliper', 'larger-pools']) {
      expect(byId[id]!.remainingBias).toBeCloseTo(-2, 9);
      expect(byId[id]!.summary).toMatch(/stays at −2\.00 points/);
    }
    expect(byId['tighter-caliper']!.discardedShare as number).toBeGreaterThan(byId['looser-caliper']!.discardedShare as number);
  });
  it('the more reliable pretest brings the artefact within the tolerable share (|bias| ≤ .25·2.5)', () => {
    const r = remedies.find((x) => x.id === 'more-reliable-pretest')!;
    expect(Math.abs(r.remainingBias)).toBeLessThanOrEqual(0.625);
    expect(r.title).toMatch(/4 parallel/);
  });
  it('reliability curve: equals analysePlan at the current reliability, 0 matched bias at 1, break-even on the band edge', () => {
    const c = sensitivityCurve(plan, 'reliability', 15);
    expect(c.points).toHaveLength(15);
    expect(c.points[0]!.x).toBeCloseTo(0.3, 12);
    expect(c.points[14]!.x).toBe(1);
    expect(c.points[14]!.bias.matchedDifference).toBeCloseTo(0, 12);
    expect(c.current).toBeCloseTo(0.75, 12);
    expect(c.tolerableBand).toEqual({ lower: -0.625, upper: 0.625 });
    // break-even x: within-group rho* = .921875 ↔ SEM² = 75·(1 − rho*)/rho* ↔ x = 75/(75 + SEM²),
    // the true-score variance (75) staying fixed as the instrument changes (Lord & Novick 1968:
    // reliability = true / observed variance). The demo's reference SD is the groups' SD, so x = rho*.
    const sem2 = (75 * (1 - 0.921875)) / 0.921875;
    expect(c.breakEvenX[0]!).toBeCloseTo(75 / (75 + sem2), 9);
    expect(c.breakEvenX[0]!).toBeCloseTo(0.921875, 9);
  });
  it('gap curve is centred on the current gap, passes through the current bias, and is 0 at no gap', () => {
    const c = sensitivityCurve(plan, 'pretestGap', 21);
    const r = analysePlan(plan);
    expect(c.points[10]!.x).toBeCloseTo(-10, 12);
    expect(c.points[10]!.bias.matchedDifference).toBeCloseTo(r.analyses.matchedDifference!.bias, 9);
    expect(c.points[20]!.bias.ancova).toBeCloseTo(0, 9);
    // |beta(1 − rho)·gap| = .625 ↔ gap = −.625/(0.8·0.25) = −3.125 (the +3.125 lies outside the grid); tolerance 1e-9
    expect(c.breakEvenX).toHaveLength(1);
    expect(c.breakEvenX[0]!).toBeCloseTo(-3.125, 9);
  });
  it('rejects a silly number of points', () => {
    expect(() => sensitivityCurve(plan, 'reliability', 2)).toThrow(/whole number from 3 to 1001; got 2/);
  });
});
