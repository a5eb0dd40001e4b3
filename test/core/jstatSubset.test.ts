import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import * as subset from '../../src/core/jstatSubset';

/*
 * src/core/jstatSubset.ts is a verbatim copy of the few jStat 1.9.6 functions the closed forms
 * use (so the page's first screen does not load all of jStat). The reference here is the
 * installed jStat itself (a general-purpose npm library): every value must be the same double,
 * bit for bit (Object.is, which also tells -0 from 0 and compares NaN), over grids that cover
 * the arguments the core passes (probabilities near 0, ½ and 1; small and huge degrees of
 * freedom; noncentrality up to and beyond Lenth's 37.62).
 */

const ps = [1e-12, 1e-9, 1e-6, 1e-4, 0.001, 0.01, 0.025, 0.05, 0.1, 0.2, 0.3, 0.5, 0.6, 0.8, 0.9, 0.95, 0.975, 0.99, 0.999, 1 - 1e-6, 1 - 1e-9];
const zs = [-40, -9, -6, -3.5, -1.959964, -1, -0.1, -1e-9, -0, 0, 1e-9, 0.3, 1, 1.644854, 2.5, 5, 8.3, 12, 40];
const dfs = [0.5, 1, 2, 3, 5, 9.5, 10, 29, 58.7, 98, 200, 1_000, 1e5, 1e8];
const ncps = [-45, -20, -3, -0.5, 1e-15, 0.2, 1, 2.5, 3.9, 10, 37, 38, 60];

function same(actual: number, expected: number, what: string): void {
  if (!Object.is(actual, expected)) expect.fail(`${what}: copy gave ${actual}, jStat ${expected}`);
}

describe('jStat subset: bit-identical to jStat 1.9.6', () => {
  it('normal cdf and quantile (jStat.normal.cdf / .inv)', () => {
    for (const z of zs) same(subset.normalCdf(z, 0, 1), jStat.normal.cdf(z, 0, 1), `normal.cdf(${z})`);
    for (const p of ps) same(subset.normalInv(p, 0, 1), jStat.normal.inv(p, 0, 1), `normal.inv(${p})`);
    expect(subset.normalInv(0.975, 0, 1)).toBeCloseTo(1.959964, 5); // common practice (normal table)
  });

  it('Student t cdf and quantile (jStat.studentt.cdf / .inv)', () => {
    for (const df of dfs) {
      for (const z of zs) same(subset.studenttCdf(z, df), jStat.studentt.cdf(z, df), `studentt.cdf(${z}, ${df})`);
      for (const p of ps) same(subset.studenttInv(p, df), jStat.studentt.inv(p, df), `studentt.inv(${p}, ${df})`);
    }
    expect(subset.studenttInv(0.975, 10)).toBeCloseTo(2.228139, 5); // t table, df = 10 (common practice)
  });

  it('noncentral t cdf (jStat.noncentralt.cdf)', () => {
    for (const df of [1, 4, 20, 98, 500]) {
      for (const ncp of ncps) {
        for (const t of [-4, -1, 0, 0.5, 1.984, 3, 50]) {
          same(subset.noncentraltCdf(t, df, ncp), jStat.noncentralt.cdf(t, df, ncp), `noncentralt.cdf(${t}, ${df}, ${ncp})`);
        }
      }
    }
  });

  it('log-gamma, incomplete beta and erf (jStat.gammaln / .ibeta / .erf)', () => {
    for (const x of [1e-8, 0.5, 1, 1.5, 2, 10, 49, 171.3, 1e6]) same(subset.gammaln(x), jStat.gammaln(x), `gammaln(${x})`);
    for (const a of [0.5, 1, 3.5, 49, 5e4]) {
      for (const b of [0.5, 2, 29, 5e4]) {
        for (const x of [0, 1e-10, 0.01, 0.3, 0.5, 0.77, 0.999, 1]) same(subset.ibeta(x, a, b), jStat.ibeta(x, a, b), `ibeta(${x}, ${a}, ${b})`);
      }
    }
    for (const z of zs) same(subset.erf(z), jStat.erf(z), `erf(${z})`);
  });
});
