import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import stdNormalCdf from '@stdlib/stats-base-dists-normal-cdf';
import { noncentralTByIntegration } from './noncentralTByIntegration';
import stdNormalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import stdTCdf from '@stdlib/stats-base-dists-t-cdf';
import stdTQuantile from '@stdlib/stats-base-dists-t-quantile';
import {
  noncentralTCdf,
  normalCdf,
  normalPdf,
  normalQuantile,
  studentTCdf,
  studentTQuantile,
} from '../../src/core/distributions';

// Every jStat distribution function the core uses, cross-checked against the
// independent @stdlib implementations over a grid.

describe('normal distribution vs @stdlib', () => {
  // Tolerance 1e-12 absolute on probabilities: both libraries claim near double precision
  // for Φ; jStat uses an erfc series, so we allow a few ulps more than machine epsilon.
  it('Φ(z) on z = −8..8', () => {
    for (let z = -8; z <= 8; z += 0.25) expect(normalCdf(z)).toBeCloseTo(stdNormalCdf(z, 0, 1), 12);
  });
  // Tolerance 1e-8 relative-ish on quantiles: jStat inverts erfc by Newton steps (documented accuracy ~1e-9).
  it('Φ⁻¹(p) on p = 1e-6..1 − 1e-6', () => {
    for (const p of [1e-6, 1e-4, 0.001, 0.025, 0.1, 0.3, 0.5, 0.7, 0.9, 0.975, 0.999, 1 - 1e-6]) {
      expect(Math.abs(normalQuantile(p) - stdNormalQuantile(p, 0, 1))).toBeLessThan(1e-8);
    }
  });
  it('φ(0) = 1/sqrt(2π) = 0.3989423 (common practice); tolerance 1e-7 (7 published decimals)', () => {
    expect(normalPdf(0)).toBeCloseTo(0.3989423, 7);
  });
  it('rejects p outside (0, 1)', () => {
    expect(() => normalQuantile(1)).toThrow(/between 0 and 1/);
  });
});

describe('Student t vs @stdlib', () => {
  const dfs = [1, 2, 3, 5, 10, 30, 100, 1000];
  // Tolerance 1e-7 absolute: both use regularised incomplete beta functions; jStat's continued
  // fraction loses accuracy at large df (4.4e-8 seen at t = 0, df = 1000), far below what power needs.
  it('cdf on t = −6..6, df = 1..1000', () => {
    for (const df of dfs) for (let t = -6; t <= 6; t += 0.5) expect(Math.abs(studentTCdf(t, df) - stdTCdf(t, df))).toBeLessThan(1e-7);
  });
  // Tolerance 1e-6 on quantiles: jStat inverts the incomplete beta iteratively (about 1e-8 accuracy).
  it('quantile on p = .001...999', () => {
    for (const df of dfs) {
      for (const p of [0.001, 0.025, 0.05, 0.3, 0.5, 0.8, 0.95, 0.975, 0.995]) {
        expect(Math.abs(studentTQuantile(p, df) - stdTQuantile(p, df))).toBeLessThan(1e-6);
      }
    }
  });
  it('t(.975, 10) = 2.228 (published t tables, e.g. Fisher & Yates; from memory); tolerance 5e-4 (3 decimals)', () => {
    expect(studentTQuantile(0.975, 10)).toBeCloseTo(2.228, 3);
  });
});

describe('noncentral t cdf vs numerical integration of its definition', () => {
  // Reference values by numerical integration of the definition (helper noncentralTByIntegration,
  // built on @stdlib's normal cdf and chi-square pdf only).
  const integrated = noncentralTByIntegration;
  // Tolerance 1e-6 absolute: Simpson's rule on this smooth integrand with 20,000 steps is accurate
  // to well below that; jStat's series stops at 1e-14 per term.
  it('agrees over t × df × ncp grid', () => {
    for (const nu of [2, 5, 10, 30, 100, 500]) {
      for (const t of [-3, -1, 0, 1.5, 2, 4]) {
        for (const delta of [-3, -0.5, 0.7, 2.5, 5]) {
          expect(Math.abs(noncentralTCdf(t, nu, delta) - integrated(t, nu, delta))).toBeLessThan(1e-6);
        }
      }
    }
  });
  it('AS 243 (Lenth 1989) agrees with jStat 1.9.6 (a general-purpose library) within 1e-8 where power is computed', () => {
    // Typical power settings: two-sided 5% and 1% critical values, df 10 to 5,000, ncp 0 to 8.
    // Tolerance 1e-8: both series stop near 1e-12 per term; jStat's incomplete beta limits it.
    for (const nu of [10, 58, 300, 5000]) {
      for (const t of [-2.58, -1.96, 1.96, 2.58]) {
        for (const delta of [0, 0.5, 1.3, 2.8, 4, 8]) {
          expect(Math.abs(noncentralTCdf(t, nu, delta) - (jStat.noncentralt.cdf(t, nu, delta) as number))).toBeLessThan(1e-8);
        }
      }
    }
  });
  it('with ncp 0 equals the central t of @stdlib (definition); tolerance 1e-9 (jStat incomplete beta)', () => {
    expect(Math.abs(noncentralTCdf(1.3, 12, 0) - stdTCdf(1.3, 12))).toBeLessThan(1e-9);
  });
  it('stays within [0, 1] and finite for a very large ncp (where its series underflows)', () => {
    const p = noncentralTCdf(1.96, 2000, 60);
    expect(p).toBeGreaterThanOrEqual(0);
    expect(p).toBeLessThan(1e-12);
    expect(noncentralTCdf(1.96, 2000, -60)).toBeCloseTo(1, 12);
  });
});
