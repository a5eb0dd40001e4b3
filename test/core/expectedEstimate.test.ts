import { describe, expect, it } from 'vitest';
import {
  ancovaEstimate,
  correctedAncovaEstimate,
  gainScoreEstimate,
  matchedDifferenceEstimate,
} from '../../src/core/expectedEstimate';
import { kelleyTrueScore } from '../../src/core/kelleyTrueScore';
import { modelFixture } from './modelFixture';

// Tolerance 1e-9 throughout: the closed forms are exact, so only floating-point rounding separates them.

describe('matched post-test difference (Thorndike 1942; Campbell & Erlebacher 1970)', () => {
  it('gap 15, rho .9, beta 1, no effect → 1.5 points (REFERENCES.md, computed)', () => {
    const m = modelFixture({ gap: 15, rhoP: 0.9, beta: 1, tau: 0 });
    expect(matchedDifferenceEstimate(m)).toBeCloseTo(1.5, 9);
  });
  it('agrees with Kelley (1947) applied at each matched x, averaged over the programme distribution', () => {
    // Independent route: E over x ~ N(mu_P, sd²) of beta·(Kelley_P(x) − Kelley_C(x)), by Gauss–Hermite-free
    // symmetric quadrature on a fine grid (the integrand is linear in x, so the grid mean is exact).
    const m = modelFixture({ gap: -12, rhoP: 0.7, rhoC: 0.85, beta: 0.9, tau: 3, growthGap: 1 });
    const xs = [-3, -1.5, 0, 1.5, 3].map((z) => m.mean.programme + z * m.observedSD.programme);
    const diffs = xs.map(
      (x) =>
        m.effect +
        m.growthGap +
        m.beta *
          (kelleyTrueScore(x, m.reliability.programme, m.mean.programme) -
            kelleyTrueScore(x, m.reliability.comparison, m.mean.comparison)),
    );
    const mean = diffs.reduce((a, b) => a + b, 0) / diffs.length;
    expect(matchedDifferenceEstimate(m)).toBeCloseTo(mean, 9);
  });
});

describe('ANCOVA on a fallible covariate (Lord 1960) and the Porter (1967) correction', () => {
  const m = modelFixture({ gap: -10, rhoP: 0.75, beta: 0.8, tau: 2.5 });
  it('ANCOVA bias = beta(1 − rho)Delta: 0.8·0.25·(−10) = −2 (Lord 1960, computed)', () => {
    expect(ancovaEstimate(m) - m.effect).toBeCloseTo(-2, 9);
  });
  it('corrected ANCOVA with the true reliability → zero bias (Porter 1967)', () => {
    expect(correctedAncovaEstimate(m, m.reliability.pooled) - m.effect).toBeCloseTo(0, 9);
  });
  it("corrected ANCOVA with a wrong rho' → beta(1 − rho/rho')Delta: rho' .9 → 0.8·(1 − .75/.9)·(−10) = −1.3333", () => {
    expect(correctedAncovaEstimate(m, 0.9) - m.effect).toBeCloseTo(-4 / 3, 9);
  });
  it("an assumed rho' below the truth over-corrects (sign flips): rho' .6 → +2", () => {
    expect(correctedAncovaEstimate(m, 0.6) - m.effect).toBeCloseTo(2, 9);
  });
  it('rejects an assumed reliability out of range', () => {
    expect(() => correctedAncovaEstimate(m, 1.4)).toThrow(/between 0 and 1 \(exclusive of 0\); got 1.4/);
  });
});

describe('gain score (computed from the model; REFERENCES.md)', () => {
  it('bias = (beta − 1)Delta: beta .8, gap −10 → +2; beta 1 → 0', () => {
    expect(gainScoreEstimate(modelFixture({ gap: -10, beta: 0.8, tau: 2.5 })) - 2.5).toBeCloseTo(2, 9);
    expect(gainScoreEstimate(modelFixture({ gap: -10, beta: 1, tau: 2.5 })) - 2.5).toBeCloseTo(0, 9);
  });
  it('growth gap adds one for one to every analysis (model definition)', () => {
    const a = modelFixture({ gap: 5, growthGap: 0 });
    const b = modelFixture({ gap: 5, growthGap: 1.7 });
    expect(gainScoreEstimate(b) - gainScoreEstimate(a)).toBeCloseTo(1.7, 9);
    expect(ancovaEstimate(b) - ancovaEstimate(a)).toBeCloseTo(1.7, 9);
    expect(matchedDifferenceEstimate(b) - matchedDifferenceEstimate(a)).toBeCloseTo(1.7, 9);
  });
});
