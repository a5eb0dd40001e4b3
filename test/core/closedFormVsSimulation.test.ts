import { describe, expect, it } from 'vitest';
import { ancovaEstimate, correctedAncovaEstimate, gainScoreEstimate, matchedDifferenceEstimate } from '../../src/core/expectedEstimate';
import { analysisStandardError } from '../../src/core/analysisStandardError';
import { modelFixture } from './modelFixture';
import { normalSource, mean, sd } from './independentNormals';

// A small self-contained Monte Carlo of the DESIGN.md model, written here from the model's
// definition (T ~ N, X = T + E, Y = d_g + beta T + tau[P] + e) without any core code, to test
// the closed forms (Lord 1960; Porter 1967; Thorndike 1942) and the approximate SEs.
// Tolerance: 4 Monte Carlo SEs for means (false alarm ≈ 6e-5 per check), and for SDs
// 4 MCSEs (MCSE of an SD ≈ SD/sqrt(2(R − 1))) plus 3% for the SE approximations' own error.


// Invented scenario: pretest SD 10, reliability .75 in both groups (SEM 5), programme 10 points lower,
// beta .8, residual SD sqrt(52), effect 2.5, growth gap 0.5.
const m = modelFixture({ gap: -10, rhoP: 0.75, beta: 0.8, residualSD: Math.sqrt(52), tau: 2.5, growthGap: 0.5, nP: 100, nC: 150 });
const rhoAssumed = 0.85;

function drawGroup(z: () => number, n: number, g: 'P' | 'C') {
  const mu = g === 'P' ? m.mean.programme : m.mean.comparison;
  const tSD = g === 'P' ? m.trueSD.programme : m.trueSD.comparison;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = mu + tSD * z();
    x[i] = t + m.sem * z();
    y[i] = (g === 'P' ? m.growthGap + m.effect : 0) + m.beta * t + m.residualSD * z();
  }
  return { x, y };
}

describe('full-sample analyses: closed form vs simulation of the model', () => {
  const R = 3000;
  const z = normalSource(20261201);
  const est = { ancova: [] as number[], gain: [] as number[], corrected: [] as number[] };
  for (let r = 0; r < R; r++) {
    const P = drawGroup(z, m.n.programme, 'P');
    const C = drawGroup(z, m.n.comparison, 'C');
    const stats = (G: { x: Float64Array; y: Float64Array }) => {
      const mx = mean([...G.x]);
      const my = mean([...G.y]);
      let sxx = 0;
      let sxy = 0;
      for (let i = 0; i < G.x.length; i++) {
        sxx += (G.x[i]! - mx) ** 2;
        sxy += (G.x[i]! - mx) * (G.y[i]! - my);
      }
      return { mx, my, sxx, sxy };
    };
    const p = stats(P);
    const c = stats(C);
    const b = (p.sxy + c.sxy) / (p.sxx + c.sxx); // pooled within-group slope (ANCOVA)
    est.ancova.push(p.my - c.my - b * (p.mx - c.mx));
    est.gain.push(p.my - p.mx - (c.my - c.mx));
    est.corrected.push(p.my - c.my - (b / rhoAssumed) * (p.mx - c.mx));
  }
  const sizes = { programme: m.n.programme, comparison: m.n.comparison };
  const opts = { assumedReliability: rhoAssumed, ratio: 1 };
  const cases = [
    ['ANCOVA (Lord 1960)', est.ancova, ancovaEstimate(m), analysisStandardError('ancova', m, sizes, opts).se],
    ['gain score', est.gain, gainScoreEstimate(m), analysisStandardError('gainScore', m, sizes, opts).se],
    ["corrected ANCOVA, rho' .85 (Porter 1967)", est.corrected, correctedAncovaEstimate(m, rhoAssumed), analysisStandardError('correctedAncova', m, sizes, opts).se],
  ] as const;
  for (const [name, xs, closed, se] of cases) {
    it(`${name}: mean estimate within 4 MCSE of the closed form; empirical SE matches the approximate SE`, () => {
      const s = sd(xs);
      expect(Math.abs(mean(xs) - closed)).toBeLessThan((4 * s) / Math.sqrt(R));
      expect(Math.abs(s - se)).toBeLessThan((4 * s) / Math.sqrt(2 * (R - 1)) + 0.03 * se);
    });
  }
});

describe('matched post-test difference: closed form vs simulated nearest matching from a large pool', () => {
  // Large comparison pool (6,000) matched with replacement, 1:1, nearest on X: close to the closed form's
  // exact matching from an unlimited pool. Extra tolerance 0.03 points for leftover X differences in the
  // sparse tail (beta·rho·mean |x − x_partner| is below that here).
  const R = 600;
  const nP = 100;
  const nC = 6000;
  const z = normalSource(7);
  const ests: number[] = [];
  for (let r = 0; r < R; r++) {
    const P = drawGroup(z, nP, 'P');
    const C = drawGroup(z, nC, 'C');
    const order = Array.from({ length: nC }, (_, i) => i).sort((a, b) => C.x[a]! - C.x[b]!);
    const xs = order.map((i) => C.x[i]!);
    let sum = 0;
    for (let i = 0; i < nP; i++) {
      const x = P.x[i]!;
      let lo = 0;
      let hi = nC - 1;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (xs[mid]! < x) lo = mid;
        else hi = mid;
      }
      const j = Math.abs(xs[lo]! - x) <= Math.abs(xs[hi]! - x) ? lo : hi;
      sum += P.y[i]! - C.y[order[j]!]!;
    }
    ests.push(sum / nP);
  }
  it('mean within 4 MCSE (+0.03) of tau + delta + beta(1 − rho_C)Delta; SE within 4 MCSE + 5%', () => {
    const closed = matchedDifferenceEstimate(m);
    const s = sd(ests);
    expect(Math.abs(mean(ests) - closed)).toBeLessThan((4 * s) / Math.sqrt(R) + 0.03);
    const se = analysisStandardError('matchedDifference', m, { programme: nP, comparison: nP }, { assumedReliability: 0.8, ratio: 1 }).se;
    // 5% slack: partner reuse with replacement adds a little variance the approximation ignores.
    expect(Math.abs(s - se)).toBeLessThan((4 * s) / Math.sqrt(2 * (R - 1)) + 0.05 * se);
  });
});
