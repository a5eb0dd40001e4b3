import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import tQuantile from '@stdlib/stats-base-dists-t-quantile';
import { ancovaEstimate } from '../../src/sim/ancovaEstimate';
import { TCriticalValues } from '../../src/sim/tQuantile';
import { summariseAnalysis, FLAG_COMPUTED, FLAG_COVERED, FLAG_REJECTED } from '../../src/sim/summariseAnalysis';
import { NormalSampler } from '../../src/sim/normalSampler';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { testPlan } from './planFixtures';
import { feasible } from './feasible';

function groupMoments(x: number[], y: number[]): number[] {
  const n = x.length;
  const mx = x.reduce((a, b) => a + b, 0) / n;
  const my = y.reduce((a, b) => a + b, 0) / n;
  let sxx = 0, sxy = 0, syy = 0;
  for (let i = 0; i < n; i++) {
    sxx += ((x[i] as number) - mx) ** 2;
    sxy += ((x[i] as number) - mx) * ((y[i] as number) - my);
    syy += ((y[i] as number) - my) ** 2;
  }
  return [n, mx, my, sxx, sxy, syy];
}

describe('ANCOVA from group moments against jStat.models.ols (an independent OLS)', () => {
  // Random data; jStat solves the full design matrix [1, group, X]. Tolerance 1e-9 relative: rounding only.
  const z = new NormalSampler(Xoshiro128StarStar.forReplication(3, 3));
  const make = (n: number, mean: number, shift: number) => {
    const x = Array.from({ length: n }, () => mean + 10 * z.next());
    const y = x.map((v) => shift + 0.7 * v + 6 * z.next());
    return { x, y };
  };
  const P = make(37, 45, 3);
  const C = make(52, 50, 0);

  it('ordinary ANCOVA: group coefficient and its OLS SE, df n - 3', () => {
    const out = new Float64Array(5);
    expect(ancovaEstimate(Float64Array.from([...groupMoments(P.x, P.y), ...groupMoments(C.x, C.y)]), 1, out)).toBe(true);
    const exog = [...P.x.map((v) => [1, 1, v]), ...C.x.map((v) => [1, 0, v])];
    const fit = jStat.models.ols([...P.y, ...C.y], exog);
    expect(out[0]).toBeCloseTo(fit.coef[1], 9);
    // The OLS SE is what a naive analysis would report (out[3], df out[4]); the engine's SE is out[1].
    expect(out[3]).toBeCloseTo(fit.t.se[1], 9);
    expect(out[4]).toBe(37 + 52 - 3);
  });

  it("Porter's correction equals OLS on X replaced by mean_g + rho'(X - mean_g) within each group (Porter 1967)", () => {
    const rho = 0.7;
    const out = new Float64Array(5);
    expect(ancovaEstimate(Float64Array.from([...groupMoments(P.x, P.y), ...groupMoments(C.x, C.y)]), rho, out)).toBe(true);
    const corr = (x: number[]) => {
      const m = x.reduce((a, b) => a + b, 0) / x.length;
      return x.map((v) => m + rho * (v - m));
    };
    const exog = [...corr(P.x).map((v) => [1, 1, v]), ...corr(C.x).map((v) => [1, 0, v])];
    const fit = jStat.models.ols([...P.y, ...C.y], exog);
    expect(out[0]).toBeCloseTo(fit.coef[1], 9);
    expect(out[3]).toBeCloseTo(fit.t.se[1], 9); // naive OLS SE (rho' treated as known)
  });

  it('reports "cannot compute" rather than NaN when the covariate has no spread', () => {
    const out = new Float64Array(3);
    expect(ancovaEstimate(Float64Array.from([2, 1, 1, 0, 0, 1, 2, 1, 1, 0, 0, 1]), 1, out)).toBe(false);
  });
});

describe('t critical values', () => {
  it('agree with @stdlib t quantile and the t table', () => {
    // Student t table (common practice): t_.975,10 = 2.228, t_.975,30 = 2.042. Tolerance 5e-7 vs @stdlib:
    // jStat's iterative inversion stops near 1e-8, far below what a rejection or coverage decision can notice.
    const t = new TCriticalValues(0.05);
    for (const df of [1, 2, 5, 10, 30, 97, 500, 5000, 12.5]) expect(t.get(df)).toBeCloseTo(tQuantile(0.975, df), 6);
    expect(t.get(10)).toBeCloseTo(2.228, 3);
    expect(new TCriticalValues(0.01).get(30)).toBeCloseTo(2.75, 2); // t table: 2.750
    expect(() => new TCriticalValues(1.2)).toThrow(/between 0 and 1/);
  });

  it('fractional df (Welch–Satterthwaite) are interpolated in 1/df within 1e-7 relative of @stdlib', () => {
    // Reference: @stdlib's t quantile (an independent implementation). Tolerance 1e-7 relative: the grid's
    // interpolation error (step 1/8192 in 1/df) plus jStat's inversion error, far below any decision's resolution.
    for (const alpha of [0.05, 0.01, 0.2]) {
      const t = new TCriticalValues(alpha);
      for (const df of [0.5, 1.0001, 1.37, 2.5, 3.3, 7.77, 19.478, 42.5, 123.4, 999.9, 123456.7]) {
        const ref = tQuantile(1 - alpha / 2, df);
        expect(Math.abs(t.get(df) - ref), `alpha ${alpha}, df ${df}`).toBeLessThan(1e-7 * ref);
      }
    }
  });
});

describe('Monte Carlo summaries (Morris, White & Crowther 2019, Table 6)', () => {
  it('hand-worked: estimates 1, 2, 3 with tau 2', () => {
    // bias 0, MCSE 1/sqrt(3); EmpSE 1, MCSE 1/sqrt(2·2) = 0.5; MSE 2/3, MCSE(MSE) = 1/3,
    // RMSE sqrt(2/3), MCSE 1/3 / (2 sqrt(2/3)); coverage 2/3 with MCSE sqrt(2/9/3). Exact up to rounding (1e-12).
    const est = Float64Array.from([1, 2, 3, 99]);
    const se = Float64Array.from([1, 1, 1, 1]);
    const flags = Uint8Array.from([FLAG_COMPUTED | FLAG_COVERED, FLAG_COMPUTED | FLAG_COVERED | FLAG_REJECTED, FLAG_COMPUTED, 0]);
    const s = feasible(summariseAnalysis('ancova', est, se, flags, 4, 2));
    expect(s.replications).toBe(3);
    expect(s.bias).toBeCloseTo(0, 12);
    expect(s.biasMCSE).toBeCloseTo(1 / Math.sqrt(3), 12);
    expect(s.empiricalSE).toBeCloseTo(1, 12);
    expect(s.empiricalSEMCSE).toBeCloseTo(0.5, 12);
    expect(s.rmse).toBeCloseTo(Math.sqrt(2 / 3), 12);
    expect(s.rmseMCSE).toBeCloseTo(1 / 3 / (2 * Math.sqrt(2 / 3)), 12);
    expect(s.coverage).toBeCloseTo(2 / 3, 12);
    expect(s.coverageMCSE).toBeCloseTo(Math.sqrt(2 / 9 / 3), 12);
    expect(s.rejectionRate).toBeCloseTo(1 / 3, 12);
    expect(s.meanModelSE).toBe(1);
    expect(s.meanModelSEMCSE).toBe(0);
  });
});

describe('the engine’s matched difference for the example replication', () => {
  it('equals the mean over matched sets of Y_P minus the mean of its partners’ Y (recomputed from the example)', () => {
    // Definition of the matched-sets estimator (common practice); tolerance 1e-9 (summation order only).
    const r = simulatePlan(testPlan({ nP: 50, nC: 400, replications: 3, matching: { ratio: 3, caliper: 0.3 } }));
    const d = r.example.pairs.map((p) => p.programme.outcome - p.comparison.reduce((a, c) => a + c.outcome, 0) / p.comparison.length);
    expect(d.length).toBeGreaterThan(10);
    expect(r.estimates.matchedDifference![0]).toBeCloseTo(d.reduce((a, b) => a + b, 0) / d.length, 9);
  });
});
