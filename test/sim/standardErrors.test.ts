import jStat from 'jstat';
import tCdf from '@stdlib/stats-base-dists-t-cdf';
import { describe, expect, it } from 'vitest';
import { ancovaEstimate } from '../../src/sim/ancovaEstimate';
import { gainScoreEstimate } from '../../src/sim/gainScoreEstimate';
import { matchedDifferenceEstimate } from '../../src/sim/matchedDifferenceEstimate';
import { MatchingWeights } from '../../src/sim/matchingWeights';
import { ancovaOnCovariates, createGroupMoments, groupMoments, residualVariance } from '../../src/sim/multivariate/ancovaOnCovariates';
import { NormalSampler } from '../../src/sim/normalSampler';
import { TCriticalValues } from '../../src/sim/tQuantile';
import { welchSatterthwaite } from '../../src/sim/welchSatterthwaite';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';

const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
const sampleVar = (a: number[]) => jStat.variance(a, true) as number; // divisor n − 1

function normals(seed: number) {
  const z = new NormalSampler(Xoshiro128StarStar.forReplication(seed, 0));
  return (n: number, m: number, sd: number) => Array.from({ length: n }, () => m + sd * z.next());
}

describe("Welch's unequal-variance t (Welch 1947, Biometrika 34, 28–35)", () => {
  it('hand-worked: SDs 20 and 10, n 20 and 400', () => {
    // Welch 1947: SE² = s1²/n1 + s2²/n2 = 20 + 0.25; df = SE⁴ / (20²/19 + 0.25²/399) (computed). Exact up to rounding (1e-12).
    const out = new Float64Array(3);
    expect(welchSatterthwaite(400 / 20, 19, 100 / 400, 399, out)).toBe(true);
    expect(out[1]).toBeCloseTo(4.5, 12);
    expect(out[2]).toBeCloseTo(20.25 ** 2 / (400 / 19 + 0.0625 / 399), 9);
    expect(out[2]).toBeCloseTo(19.478, 3);
  });

  it('gainScoreEstimate equals the Welch formula on raw gains, and its test the Welch p-value by @stdlib t CDF', () => {
    // Reference: Welch (1947)'s statistic and df computed from the raw data with jStat's sample variances, the
    // two-sided p-value from @stdlib's t CDF (an independent implementation). Tolerance 1e-10 relative (rounding).
    const draw = normals(7);
    const gP = draw(20, 5, 20);
    const gC = draw(400, 3, 10);
    const out = new Float64Array(3);
    const ss = (a: number[]) => sampleVar(a) * (a.length - 1);
    expect(gainScoreEstimate(20, mean(gP), ss(gP), 400, mean(gC), ss(gC), out)).toBe(true);
    const v1 = sampleVar(gP) / 20;
    const v2 = sampleVar(gC) / 400;
    const se = Math.sqrt(v1 + v2);
    const df = (v1 + v2) ** 2 / (v1 ** 2 / 19 + v2 ** 2 / 399);
    expect(Math.abs(out[0]! - (mean(gP) - mean(gC)))).toBeLessThan(1e-12);
    expect(Math.abs(out[1]! - se)).toBeLessThan(1e-10 * se);
    expect(Math.abs(out[2]! - df)).toBeLessThan(1e-10 * df);
    // The engine rejects at .05 exactly when the Welch p-value is below .05.
    const t = Math.abs(out[0]! / out[1]!);
    const p = 2 * (1 - tCdf(t, df));
    expect(t > new TCriticalValues(0.05).get(out[2]!)).toBe(p < 0.05);
    // With equal group sizes and variances the Welch SE equals the pooled one (Welch 1947; common practice).
    const eq = new Float64Array(3);
    expect(gainScoreEstimate(10, 1, 90, 10, 0, 90, eq)).toBe(true);
    expect(eq[1]).toBeCloseTo(Math.sqrt((180 / 18) * (2 / 10)), 12);
    expect(eq[2]).toBeCloseTo(18, 12);
  });
});

describe('matched difference with the matching-weights variance (Abadie & Imbens 2006)', () => {
  it('hand-worked: two 1:1 sets sharing one comparison member', () => {
    // D = 1, 3; K = 2, K' = 2, Σ(K² − K') = 2; σ²_C = 4: V = 2 / (2 · 1) + 4 · 2 / 2² = 3 (hand-worked).
    const w = new MatchingWeights(3);
    w.add(1, 1);
    w.add(1, 1);
    expect(w.reuseExcess()).toBe(2);
    const out = new Float64Array(3);
    expect(matchedDifferenceEstimate(2, 4, 10, 4, w.reuseExcess(), out)).toBe(true);
    expect([...out]).toEqual([2, Math.sqrt(3), 1]);
  });

  it('use counts and weights equal their definitions on random 1:k sets; no reuse gives the matched-sets SE bit for bit', () => {
    // K_j = Σ_i 1[j ∈ i] / cnt_i, K'_j = Σ_i 1[j ∈ i] / cnt_i², n_j = Σ_i 1[j ∈ i] (Abadie & Imbens 2006, eq. for K_M; computed
    // by brute force here). Tolerance 1e-12 (rounding of sums of reciprocals).
    const rng = Xoshiro128StarStar.forReplication(9, 0);
    const nC = 30;
    const w = new MatchingWeights(nC);
    for (let round = 0; round < 2; round++) {
      w.reset();
      const sets: number[][] = [];
      for (let i = 0; i < 25; i++) {
        const cnt = 1 + (rng.nextUint32() % 3);
        const set = new Set<number>();
        while (set.size < cnt) set.add(rng.nextUint32() % nC);
        sets.push([...set]);
        for (const j of set) w.add(j, cnt);
      }
      let excess = 0;
      let uses2 = 0;
      for (let j = 0; j < nC; j++) {
        const mine = sets.filter((s) => s.includes(j));
        const K = mine.reduce((s, set) => s + 1 / set.length, 0);
        const K2 = mine.reduce((s, set) => s + 1 / set.length ** 2, 0);
        expect(w.uses[j]).toBe(mine.length);
        expect(Math.abs(w.weight[j]! - K)).toBeLessThan(1e-12);
        expect(Math.abs(w.weight2[j]! - K2)).toBeLessThan(1e-12);
        excess += K * K - K2;
        uses2 += mine.length ** 2;
      }
      expect(Math.abs(w.reuseExcess() - excess)).toBeLessThan(1e-10);
      expect(w.sumUses2()).toBe(uses2);
    }
    // Without reuse the extra term vanishes and the SE is sd(D)/sqrt(m) exactly (the matched-sets SE).
    const d = [0.5, -1.25, 2, 3.5, 0.75];
    const sum = d.reduce((s, v) => s + v, 0);
    const sum2 = d.reduce((s, v) => s + v * v, 0);
    const out = new Float64Array(3);
    expect(matchedDifferenceEstimate(5, sum, sum2, 7.3, 0, out)).toBe(true);
    const v = (sum2 - sum * (sum / 5)) / 4;
    expect(out[1]).toBe(Math.sqrt(v / 5));
  });
});

describe('ANCOVA: group-wise delta-method SE (delta method; Welch 1947 df)', () => {
  // Invented data; reference computed from the raw rows: the slope from jStat's OLS on the (Porter-corrected)
  // data, each group's residual variance from its own jStat OLS fit, the variance of Y − bX by jStat.
  // Tolerance 1e-9 relative (rounding only).
  const draw = normals(21);
  const make = (n: number, mx: number, sdx: number, slope: number, sde: number) => {
    const x = draw(n, mx, sdx);
    const e = draw(n, 0, sde);
    return { x, y: x.map((v, i) => 2 + slope * v + e[i]!) };
  };
  const P = make(25, 45, 14, 0.6, 9);
  const C = make(300, 50, 10, 0.4, 5);
  const moments = (g: { x: number[]; y: number[] }) => {
    const mx = mean(g.x);
    const my = mean(g.y);
    let sxx = 0, sxy = 0, syy = 0;
    for (let i = 0; i < g.x.length; i++) {
      sxx += (g.x[i]! - mx) ** 2;
      sxy += (g.x[i]! - mx) * (g.y[i]! - my);
      syy += (g.y[i]! - my) ** 2;
    }
    return [g.x.length, mx, my, sxx, sxy, syy];
  };
  const ownResidualVariance = (g: { x: number[]; y: number[] }) => {
    const fit = jStat.models.ols(g.y, g.x.map((v) => [1, v]));
    return (fit.SSR as number) / (g.x.length - 2); // jStat names the residual sum of squares SSR
  };

  for (const rho of [1, 0.6]) {
    it(`rho' = ${rho}: SE² = Σ_g Var(Y − bX)_g / n_g + c² ΔX̄² Σ_g Sxx_g σ̂²_g / Sxx², Welch–Satterthwaite df`, () => {
      const out = new Float64Array(5);
      expect(ancovaEstimate(Float64Array.from([...moments(P), ...moments(C)]), rho, out)).toBe(true);
      const corr = (x: number[]) => x.map((v) => mean(x) + rho * (v - mean(x)));
      const fit = jStat.models.ols([...P.y, ...C.y], [...corr(P.x).map((v) => [1, 1, v]), ...corr(C.x).map((v) => [1, 0, v])]);
      const b = fit.coef[2] as number;
      expect(Math.abs(out[0]! - fit.coef[1])).toBeLessThan(1e-9);
      const dx = mean(P.x) - mean(C.x);
      const sxxP = moments(P)[3]!;
      const sxxC = moments(C)[3]!;
      const hb = dx / (rho * (sxxP + sxxC)); // c ΔX̄ / Sxx
      const share = (g: { x: number[]; y: number[] }, sxx: number) =>
        sampleVar(g.y.map((v, i) => v - b * g.x[i]!)) / g.x.length + hb * hb * sxx * ownResidualVariance(g);
      const uP = share(P, sxxP);
      const uC = share(C, sxxC);
      expect(Math.abs(out[1]! - Math.sqrt(uP + uC))).toBeLessThan(1e-9 * out[1]!);
      const df = (uP + uC) ** 2 / (uP ** 2 / 23 + uC ** 2 / 298);
      expect(Math.abs(out[2]! - df)).toBeLessThan(1e-9 * df);
      // The small, noisy programme group dominates: fewer df than the pooled n − 3, and a larger SE than the naive OLS one.
      expect(out[2]).toBeLessThan(323);
      expect(out[1]).toBeGreaterThan(out[3]!);
    });
  }

  it('stacked comparison rows: the comparison share counts each member by its use count n_j', () => {
    // Var(mean of Y − b'X over stacked rows) = s²_D Σn_j² / N² (s²_D with divisor N − Σn_j²/N) and the slope part
    // σ²_C Σ n_j² (h'(x_j − x̄_C))² (docs/simulation.md; computed here from the raw rows). Tolerance 1e-9 relative.
    const draw2 = normals(5);
    const nC = 60;
    const nP = 30;
    const p = 2;
    const cols = [new Float64Array(nC + nP), new Float64Array(nC + nP)];
    const y = new Float64Array(nC + nP);
    for (let i = 0; i < nC + nP; i++) {
      const [a, bb, e] = [draw2(1, 0, 1)[0]!, draw2(1, 0, 1)[0]!, draw2(1, 0, 1)[0]!];
      cols[0]![i] = 50 + 10 * a - (i >= nC ? 3 : 0);
      cols[1]![i] = 20 + 4 * (0.5 * a + 0.8 * bb);
      y[i] = 0.5 * cols[0]![i]! + 0.3 * cols[1]![i]! + 4 * e + (i >= nC ? 1 : 0);
    }
    const w = new MatchingWeights(nC);
    for (let i = 0; i < nP; i++) w.add((i * 7) % 20, 1); // 30 uses of 20 members: reuse
    const P = createGroupMoments(p);
    const C = createGroupMoments(p);
    const full = createGroupMoments(p);
    groupMoments(cols, y, nC, nC + nP, null, P);
    groupMoments(cols, y, 0, nC, w.uses, C);
    groupMoments(cols, y, 0, nC, null, full);
    const sigma2 = residualVariance(full);
    const out = new Float64Array(5);
    expect(ancovaOnCovariates(P, C, null, out, { weights: w, columns: cols, from: 0, sigma2 })).toBe(true);
    const plain = new Float64Array(5);
    expect(ancovaOnCovariates(P, C, null, plain)).toBe(true);
    expect(out[0]).toBe(plain[0]); // same estimate; only the comparison share of the variance differs
    // Raw-row reference: pooled slope b from the stacked design (jStat OLS), h = W⁻¹ ΔX̄.
    const rows: number[][] = [];
    const ys: number[] = [];
    const addRow = (i: number, group: number) => {
      rows.push([1, group, cols[0]![i]!, cols[1]![i]!]);
      ys.push(y[i]!);
    };
    for (let j = 0; j < nC; j++) for (let t = 0; t < w.uses[j]!; t++) addRow(j, 0);
    for (let i = nC; i < nC + nP; i++) addRow(i, 1);
    const fit = jStat.models.ols(ys, rows);
    const b = [fit.coef[2] as number, fit.coef[3] as number];
    expect(Math.abs(out[0]! - fit.coef[1])).toBeLessThan(1e-9);
    const W = [0, 1].map((a) => [0, 1].map((c) => P.sxx[a * 2 + c]! + C.sxx[a * 2 + c]!));
    const det = W[0]![0]! * W[1]![1]! - W[0]![1]! * W[1]![0]!;
    const dx = [P.means[0]! - C.means[0]!, P.means[1]! - C.means[1]!];
    const h = [(W[1]![1]! * dx[0]! - W[0]![1]! * dx[1]!) / det, (W[0]![0]! * dx[1]! - W[1]![0]! * dx[0]!) / det];
    const members = Array.from({ length: nC }, (_, j) => j).filter((j) => w.uses[j]! > 0);
    const N = nP; // stacked comparison rows
    const n2 = members.reduce((s, j) => s + w.uses[j]! ** 2, 0);
    const d = (j: number) => y[j]! - b[0]! * cols[0]![j]! - b[1]! * cols[1]![j]!;
    const dBar = members.reduce((s, j) => s + w.uses[j]! * d(j), 0) / N;
    const sD = members.reduce((s, j) => s + w.uses[j]! * (d(j) - dBar) ** 2, 0) / (N - n2 / N);
    const q = members.reduce((s, j) => s + w.uses[j]! ** 2 * (h[0]! * (cols[0]![j]! - C.means[0]!) + h[1]! * (cols[1]![j]! - C.means[1]!)) ** 2, 0);
    const uC = (sD * n2) / N ** 2 + sigma2 * q;
    // The programme share is the same in both calls, so out² − uC must equal plain² − (plain comparison share).
    const plainC = plainComparisonShare(C, b, h, residualVariance(C));
    expect(Math.abs(out[1]! ** 2 - uC - (plain[1]! ** 2 - plainC))).toBeLessThan(1e-9 * out[1]! ** 2);
    expect(out[1]).toBeGreaterThan(plain[1]!); // reuse adds variance
  });
});

/** The plain (unstacked) comparison share Var(Y − b'X)/n + σ̂² h'W h, from moments (test helper; same formula as docs). */
function plainComparisonShare(C: ReturnType<typeof createGroupMoments>, b: number[], h: number[], sigma2: number): number {
  const quad = (v: number[]) => v[0]! * (C.sxx[0]! * v[0]! + C.sxx[1]! * v[1]!) + v[1]! * (C.sxx[2]! * v[0]! + C.sxx[3]! * v[1]!);
  const varD = (C.syy - 2 * (b[0]! * C.sxy[0]! + b[1]! * C.sxy[1]!) + quad(b)) / (C.n - 1);
  return varD / C.n + sigma2 * quad(h);
}
