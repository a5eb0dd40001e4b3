/*
 * The few functions of jStat 1.9.6 that the closed forms use, copied verbatim (statement for
 * statement, the same constants and the same order of operations) from jstat/dist/jstat.js, so
 * that the page's first screen need not load the whole library (about 18 kB of gzip) to analyse a
 * plan. Every result is bit-identical to jStat's: test/core/jstatSubset.test.ts compares each
 * function with the installed jStat over a grid of arguments with Object.is. Nothing here is a
 * new implementation; the simulation and the pilot reader (in their own chunks and workers)
 * still import jStat itself.
 *
 * jStat: Copyright (c) 2013 jStat. Permission is hereby granted, free of charge, to any person
 * obtaining a copy of this software and associated documentation files (the "Software"), to deal
 * in the Software without restriction, including without limitation the rights to use, copy,
 * modify, merge, publish, distribute, sublicense, and/or sell copies of the Software, and to
 * permit persons to whom the Software is furnished to do so, subject to the following
 * conditions: The above copyright notice and this permission notice shall be included in all
 * copies or substantial portions of the Software. THE SOFTWARE IS PROVIDED "AS IS", WITHOUT
 * WARRANTY OF ANY KIND, EXPRESS OR IMPLIED, INCLUDING BUT NOT LIMITED TO THE WARRANTIES OF
 * MERCHANTABILITY, FITNESS FOR A PARTICULAR PURPOSE AND NONINFRINGEMENT. IN NO EVENT SHALL THE
 * AUTHORS OR COPYRIGHT HOLDERS BE LIABLE FOR ANY CLAIM, DAMAGES OR OTHER LIABILITY, WHETHER IN AN
 * ACTION OF CONTRACT, TORT OR OTHERWISE, ARISING FROM, OUT OF OR IN CONNECTION WITH THE SOFTWARE
 * OR THE USE OR OTHER DEALINGS IN THE SOFTWARE.
 */

/** jStat.gammaln: log-gamma (Lanczos series, as in Numerical Recipes). */
export function gammaln(x: number): number {
  let j = 0;
  const cof = [76.18009172947146, -86.50532032941677, 24.01409824083091, -1.231739572450155, 0.1208650973866179e-2, -0.5395239384953e-5];
  let ser = 1.000000000190015;
  let xx: number, y: number, tmp: number;
  tmp = (y = xx = x) + 5.5;
  tmp -= (xx + 0.5) * Math.log(tmp);
  for (; j < 6; j++) ser += (cof[j] as number) / ++y;
  return Math.log((2.5066282746310005 * ser) / xx) - tmp;
}

/** jStat.betacf: the continued fraction of the incomplete beta function (modified Lentz). */
function betacf(x: number, a: number, b: number): number {
  const fpmin = 1e-30;
  let m = 1;
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  let m2: number, aa: number, del: number;

  if (Math.abs(d) < fpmin) d = fpmin;
  d = 1 / d;
  let h = d;

  for (; m <= 100; m++) {
    m2 = 2 * m;
    aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < fpmin) d = fpmin;
    c = 1 + aa / c;
    if (Math.abs(c) < fpmin) c = fpmin;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < fpmin) d = fpmin;
    c = 1 + aa / c;
    if (Math.abs(c) < fpmin) c = fpmin;
    d = 1 / d;
    del = d * c;
    h *= del;
    if (Math.abs(del - 1.0) < 3e-7) break;
  }
  return h;
}

/** jStat.erf: the error function (Chebyshev series). */
export function erf(x: number): number {
  const cof = [
    -1.3026537197817094, 6.4196979235649026e-1, 1.9476473204185836e-2, -9.561514786808631e-3, -9.46595344482036e-4, 3.66839497852761e-4,
    4.2523324806907e-5, -2.0278578112534e-5, -1.624290004647e-6, 1.30365583558e-6, 1.5626441722e-8, -8.5238095915e-8, 6.529054439e-9,
    5.059343495e-9, -9.91364156e-10, -2.27365122e-10, 9.6467911e-11, 2.394038e-12, -6.886027e-12, 8.94487e-13, 3.13092e-13, -1.12708e-13,
    3.81e-16, 7.106e-15, -1.523e-15, -9.4e-17, 1.21e-16, -2.8e-17,
  ];
  let j = cof.length - 1;
  let isneg = false;
  let d = 0;
  let dd = 0;
  let tmp: number;

  if (x < 0) {
    x = -x;
    isneg = true;
  }

  const t = 2 / (2 + x);
  const ty = 4 * t - 2;

  for (; j > 0; j--) {
    tmp = d;
    d = ty * d - dd + (cof[j] as number);
    dd = tmp;
  }

  const res = t * Math.exp(-x * x + 0.5 * ((cof[0] as number) + ty * d) - dd);
  return isneg ? res - 1 : 1 - res;
}

/** jStat.erfc: 1 − erf. */
function erfc(x: number): number {
  return 1 - erf(x);
}

/** jStat.erfcinv: the inverse complementary error function (two Newton steps). */
function erfcinv(p: number): number {
  let j = 0;
  let x: number, err: number;
  if (p >= 2) return -100;
  if (p <= 0) return 100;
  const pp = p < 1 ? p : 2 - p;
  const t = Math.sqrt(-2 * Math.log(pp / 2));
  x = -0.70711 * ((2.30753 + t * 0.27061) / (1 + t * (0.99229 + t * 0.04481)) - t);
  for (; j < 2; j++) {
    err = erfc(x) - pp;
    x += err / (1.12837916709551257 * Math.exp(-x * x) - x * err);
  }
  return p < 1 ? x : -x;
}

/** jStat.ibetainv: the inverse of the regularised incomplete beta function. */
function ibetainv(p: number, a: number, b: number): number {
  const EPS = 1e-8;
  const a1 = a - 1;
  const b1 = b - 1;
  let j = 0;
  let lna: number, lnb: number, pp: number, t: number, u: number, err: number, x: number, al: number, h: number, w: number;
  if (p <= 0) return 0;
  if (p >= 1) return 1;
  if (a >= 1 && b >= 1) {
    pp = p < 0.5 ? p : 1 - p;
    t = Math.sqrt(-2 * Math.log(pp));
    x = (2.30753 + t * 0.27061) / (1 + t * (0.99229 + t * 0.04481)) - t;
    if (p < 0.5) x = -x;
    al = (x * x - 3) / 6;
    h = 2 / (1 / (2 * a - 1) + 1 / (2 * b - 1));
    w = (x * Math.sqrt(al + h)) / h - (1 / (2 * b - 1) - 1 / (2 * a - 1)) * (al + 5 / 6 - 2 / (3 * h));
    x = a / (a + b * Math.exp(2 * w));
  } else {
    lna = Math.log(a / (a + b));
    lnb = Math.log(b / (a + b));
    t = Math.exp(a * lna) / a;
    u = Math.exp(b * lnb) / b;
    w = t + u;
    if (p < t / w) x = Math.pow(a * w * p, 1 / a);
    else x = 1 - Math.pow(b * w * (1 - p), 1 / b);
  }
  const afac = -gammaln(a) - gammaln(b) + gammaln(a + b);
  for (; j < 10; j++) {
    if (x === 0 || x === 1) return x;
    err = ibeta(x, a, b) - p;
    t = Math.exp(a1 * Math.log(x) + b1 * Math.log(1 - x) + afac);
    u = err / t;
    x -= t = u / (1 - 0.5 * Math.min(1, u * (a1 / x - b1 / (1 - x))));
    if (x <= 0) x = 0.5 * (x + t);
    if (x >= 1) x = 0.5 * (x + t + 1);
    if (Math.abs(t) < EPS * x && j > 0) break;
  }
  return x;
}

/**
 * jStat.ibeta: the regularised incomplete beta function I_x(a, b). jStat returns `false` for x
 * outside [0, 1]; so does this copy (the core never asks for it).
 */
export function ibeta(x: number, a: number, b: number): number {
  const bt = x === 0 || x === 1 ? 0 : Math.exp(gammaln(a + b) - gammaln(a) - gammaln(b) + a * Math.log(x) + b * Math.log(1 - x));
  if (x < 0 || x > 1) return false as unknown as number;
  if (x < (a + 1) / (a + b + 2)) return (bt * betacf(x, a, b)) / a;
  return 1 - (bt * betacf(1 - x, b, a)) / b;
}

/** jStat.beta.cdf. */
function betaCdf(x: number, alpha: number, beta: number): number {
  return x > 1 || x < 0 ? (x > 1 ? 1 : 0) * 1 : ibeta(x, alpha, beta);
}

/** jStat.normal.cdf. */
export function normalCdf(x: number, mean: number, std: number): number {
  return 0.5 * (1 + erf((x - mean) / Math.sqrt(2 * std * std)));
}

/** jStat.normal.inv. */
export function normalInv(p: number, mean: number, std: number): number {
  return -1.41421356237309505 * std * erfcinv(2 * p) + mean;
}

/** jStat.studentt.cdf. */
export function studenttCdf(x: number, dof: number): number {
  const dof2 = dof / 2;
  return ibeta((x + Math.sqrt(x * x + dof)) / (2 * Math.sqrt(x * x + dof)), dof2, dof2);
}

/** jStat.studentt.inv. */
export function studenttInv(p: number, dof: number): number {
  let x = ibetainv(2 * Math.min(p, 1 - p), 0.5 * dof, 0.5);
  x = Math.sqrt((dof * (1 - x)) / x);
  return p > 0.5 ? x : -x;
}

/** jStat.noncentralt.cdf: the Poisson-weighted series of incomplete beta functions. */
export function noncentraltCdf(x: number, dof: number, ncp: number): number {
  const tol = 1e-14;
  const min_iterations = 200;

  if (Math.abs(ncp) < tol) return studenttCdf(x, dof);

  let flip = false;
  if (x < 0) {
    flip = true;
    ncp = -ncp;
  }

  let prob = normalCdf(-ncp, 0, 1);
  let value = tol + 1;
  let lastvalue = value;
  const y = (x * x) / (x * x + dof);
  let j = 0;
  let p = Math.exp((-ncp * ncp) / 2);
  let q = Math.exp((-ncp * ncp) / 2 - 0.5 * Math.log(2) - gammaln(3 / 2)) * ncp;
  while (j < min_iterations || lastvalue > tol || value > tol) {
    lastvalue = value;
    if (j > 0) {
      p *= (ncp * ncp) / (2 * j);
      q *= (ncp * ncp) / (2 * (j + 1 / 2));
    }
    value = p * betaCdf(y, j + 0.5, dof / 2) + q * betaCdf(y, j + 1, dof / 2);
    prob += 0.5 * value;
    j++;
  }

  return flip ? 1 - prob : prob;
}
