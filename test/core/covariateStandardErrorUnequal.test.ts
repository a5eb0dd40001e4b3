import { describe, expect, it } from 'vitest';
import { deriveCovariateModel } from '../../src/core/multivariate/covariateModel';
import { covariateStandardError } from '../../src/core/multivariate/covariateStandardError';
import { validatePlan } from '../../src/core/validatePlan';
import { afterSchoolMaths } from './multivariateFixture';
import { normalSource } from './independentNormals';

// The covariate path's closed-form SEs (delta method for ANCOVA and the corrected ANCOVA of
// Porter 1967 generalised to several variables; Welch 1947 for the gain score) when the groups
// differ in size and pretest spread, against a seeded Monte Carlo written here with plain
// arithmetic: a Box–Muller normal generator, a Cholesky factor and Gaussian elimination. The
// model (true scores, errors, outcome) is read from the covariate model; every estimate is
// computed here. Tolerance: 3% of the closed form. With R = 10,000 the Monte Carlo SE of an SD
// is about 0.7% (SD/sqrt(2(R − 1)), common practice), so 3% is about 4 MCSEs.

/** Lower Cholesky factor of a positive semi-definite matrix (zero columns where a pivot is 0). */
function cholesky(a: number[][]): number[][] {
  const n = a.length;
  const L = a.map(() => new Array<number>(n).fill(0));
  for (let j = 0; j < n; j++) {
    let d = a[j]![j]!;
    for (let k = 0; k < j; k++) d -= L[j]![k]! ** 2;
    L[j]![j] = d > 1e-12 ? Math.sqrt(d) : 0;
    for (let i = j + 1; i < n; i++) {
      let s = a[i]![j]!;
      for (let k = 0; k < j; k++) s -= L[i]![k]! * L[j]![k]!;
      L[i]![j] = L[j]![j]! > 0 ? s / L[j]![j]! : 0;
    }
  }
  return L;
}
/** Solve A x = b by Gaussian elimination with partial pivoting. */
function solve(A: number[][], b: number[]): number[] {
  const n = b.length;
  const M = A.map((row, i) => [...row, b[i]!]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(M[r]![c]!) > Math.abs(M[p]![c]!)) p = r;
    [M[c], M[p]] = [M[p]!, M[c]!];
    for (let r = c + 1; r < n; r++) {
      const f = M[r]![c]! / M[c]![c]!;
      for (let k = c; k <= n; k++) M[r]![k]! -= f * M[c]![k]!;
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = M[r]![n]!;
    for (let k = r + 1; k < n; k++) s -= M[r]![k]! * x[k]!;
    x[r] = s / M[r]![r]!;
  }
  return x;
}
const sd = (a: number[]) => {
  const m = a.reduce((s, x) => s + x, 0) / a.length;
  return Math.sqrt(a.reduce((s, x) => s + (x - m) ** 2, 0) / (a.length - 1));
};

describe('covariate path: closed-form SEs vs a Monte Carlo, 40 vs 400 with pretest SDs 25 vs 12', () => {
  // Invented: the after-school maths example with a small, more spread programme group.
  const plan = afterSchoolMaths();
  plan.groups.programme.pretestSD = 25;
  plan.groups.comparison.pretestSD = 12;
  plan.groups.programme.poolSize = 40;
  plan.groups.comparison.poolSize = 400;
  const cm = deriveCovariateModel(plan);
  const m = cm.measuredIndices;
  const p = cm.names.length;
  const q = m.length;
  const rhoA = plan.analysis.assumedReliability;
  const assumedRel = m.map((j) => (j === 0 ? rhoA : plan.covariates![j - 1]!.reliability));
  const R = 10_000;
  const z = normalSource(31);
  const L = { programme: cholesky(cm.sigmaT.programme), comparison: cholesky(cm.sigmaT.comparison) };
  const est = { ancova: [] as number[], correctedAncova: [] as number[], gainScore: [] as number[] };
  const t = new Array<number>(p).fill(0);
  const e = new Array<number>(p).fill(0);

  for (let r = 0; r < R; r++) {
    const stats = (['programme', 'comparison'] as const).map((g) => {
      const n = cm.n[g];
      const xs: number[][] = [];
      const ys: number[] = [];
      for (let i = 0; i < n; i++) {
        for (let a = 0; a < p; a++) e[a] = z();
        for (let a = 0; a < p; a++) {
          let s = cm.mean[g][a]!;
          for (let b = 0; b <= a; b++) s += L[g][a]![b]! * e[b]!;
          t[a] = s;
        }
        xs.push(m.map((j) => t[j]! + cm.sem[j]! * z()));
        let y = cm.residualSD * z() + (g === 'programme' ? cm.growthGap + cm.effect : 0);
        for (let a = 0; a < p; a++) y += cm.beta[a]! * t[a]!;
        ys.push(y);
      }
      const mx = m.map((_, a) => xs.reduce((s, x) => s + x[a]!, 0) / n);
      const my = ys.reduce((s, y) => s + y, 0) / n;
      const sxx = m.map(() => new Array<number>(q).fill(0));
      const sxy = new Array<number>(q).fill(0);
      for (let i = 0; i < n; i++) {
        for (let a = 0; a < q; a++) {
          const da = xs[i]![a]! - mx[a]!;
          sxy[a]! += da * (ys[i]! - my);
          for (let b = 0; b < q; b++) sxx[a]![b]! += da * (xs[i]![b]! - mx[b]!);
        }
      }
      return { mx, my, sxx, sxy };
    });
    const [P, C] = stats as [(typeof stats)[0], (typeof stats)[0]];
    const W = P.sxx.map((row, a) => row.map((x, b) => x + C.sxx[a]![b]!));
    const b = solve(W, P.sxy.map((x, a) => x + C.sxy[a]!)); // pooled within-group slopes (OLS with a group dummy)
    const dx = P.mx.map((x, a) => x - C.mx[a]!);
    const dy = P.my - C.my;
    est.ancova.push(dy - b.reduce((s, v, a) => s + v * dx[a]!, 0));
    // Corrected ANCOVA as the analyst runs it: S = W/(N − 2), S_T' = S with its diagonal times the assumed
    // reliabilities; X replaced by X̄_g + S_T' S^-1 (X − X̄_g); OLS slopes on it are S_T'^-1 S b.
    const S = W.map((row) => row.map((x) => x / (cm.n.programme + cm.n.comparison - 2)));
    const ST = S.map((row, a) => row.map((x, c) => (a === c ? x * assumedRel[a]! : x)));
    const gamma = solve(ST, S.map((row) => row.reduce((s, x, c) => s + x * b[c]!, 0)));
    est.correctedAncova.push(dy - gamma.reduce((s, v, a) => s + v * dx[a]!, 0));
    est.gainScore.push(dy - dx[0]!);
  }

  it('the invented plan is valid', () => {
    expect(validatePlan(plan).ok).toBe(true);
  });
  for (const id of ['ancova', 'correctedAncova', 'gainScore'] as const) {
    it(`${id}: empirical SE within 3% of covariateStandardError (delta method; Welch 1947; Porter 1967)`, () => {
      const closed = covariateStandardError(id, cm, 'propensity', { programme: cm.n.programme, comparison: cm.n.comparison }, { assumedReliability: rhoA, ratio: 1 });
      expect(Math.abs(sd(est[id]) / closed.se - 1)).toBeLessThan(0.03);
    });
  }
});
