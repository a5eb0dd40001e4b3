import type { ModelParameters } from '../modelParameters';
import type { MatchingDistance } from '../plan';
import { normalCdf, normalPdf } from '../distributions';
import { expectedMatchedShare, type MatchingDemand } from '../expectedMatchedShare';
import { formatNumber, requirePositive } from '../inputChecks';
import type { CovariateModel } from './covariateModel';
import { matchingScoreWeights } from './covariateMatchedEstimate';
import { block, dot, multiplyVector, pick, solvePositiveDefinite } from './linearAlgebra';

/**
 * Approximate share of the programme pool expected to find at least one
 * partner within the caliper, for each matching distance. An APPROXIMATION
 * for planning at a glance (the simulation gives the exact figure):
 * - "pretest": expectedMatchedShare on the observed pretest (caliper in pooled pretest SDs);
 * - "propensity": the same one-dimensional calculation on the population
 *   linear propensity score L = gamma'X (matchingScoreWeights), normal in each
 *   group with mean gamma'mu_g and SD sqrt(gamma'Sigma_X,g gamma); the caliper is
 *   in SDs of L, sqrt((s_P² + s_C²)/2) (Rosenbaum & Rubin 1985; Austin 2011).
 *   When the measured variables show no gap, L is constant and every
 *   programme member finds a partner (rationed without replacement);
 * - "mahalanobis": the q measured variables that are not exact, whitened by
 *   the average of the two groups' covariance matrices (Σ_P + Σ_C)/2 (the
 *   Mahalanobis metric, in the caliper units of Cochran & Rubin 1973; with one
 *   variable this is the pretest calculation on that variable); the expected
 *   number of comparison members within distance c of x is
 *   λ(x) = n_C·P(‖Z − x‖ ≤ c), Z ~ N(0, I_q), a function of x's distance d
 *   from the comparison mean only: P = ∫ φ(z)·F_{χ²(q−1)}(c² − (z − d)²) dz over
 *   |z − d| ≤ c; the Poisson chance of none is e^{−λ}, rationed without
 *   replacement by supply over demand as in expectedMatchedShare, and averaged
 *   over the programme's distribution (mean at Mahalanobis distance δ from the
 *   comparison mean) by Simpson's rule in two dimensions. Assumes equal
 *   within-group covariances (the average one).
 * Exact matching on exact covariates is not counted (it lowers the share,
 * little for a covariate with few categories): see the simulation.
 *
 * Reference: Cochran & Rubin (1973), caliper units; Rubin (1980) and Rosenbaum &
 * Rubin (1985) for Mahalanobis metric matching within calipers; the Poisson
 * supply–demand approximation is our own (as expectedMatchedShare; computed).
 *
 * @param cm the covariate model. @param m the one-pretest model (pool sizes, pretest).
 * @param matching caliper (> 0, in the distance's units), ratio (≥ 1), replacement.
 * @param distance the matching distance.
 * @returns share in [0, 1].
 * @throws Error when caliper ≤ 0 or ratio < 1.
 * @example "mahalanobis" with only the pretest measured → the pretest's share
 */
export function covariateMatchedShare(
  cm: CovariateModel,
  m: ModelParameters,
  matching: MatchingDemand,
  distance: MatchingDistance,
): number {
  const c = requirePositive(matching.caliper, 'The caliper');
  const k = requirePositive(matching.ratio, 'The matching ratio');
  if (k < 1) throw new Error(`The matching ratio must be at least 1; got ${formatNumber(k)}.`);
  if (distance === 'pretest') return expectedMatchedShare(m, matching);
  const nP = cm.n.programme;
  const nC = cm.n.comparison;
  const unrestricted = matching.replacement ? 1 : Math.min(1, nC / (k * nP));

  if (distance === 'propensity') {
    const rows = matchingScoreWeights(cm, 'propensity').filter((row) => row.some((x, j) => x !== 0 && !cm.exact[j]));
    const gamma = rows[rows.length - 1];
    if (!gamma) return unrestricted;
    const sd = (s: number[][]): number => Math.sqrt(dot(gamma, multiplyVector(s, gamma)));
    const score: ModelParameters = {
      ...m,
      mean: { programme: dot(gamma, cm.mean.programme), comparison: dot(gamma, cm.mean.comparison) },
      observedSD: { programme: sd(cm.sigmaX.programme), comparison: sd(cm.sigmaX.comparison) },
    };
    return expectedMatchedShare(score, matching);
  }

  const dims = cm.measuredIndices.filter((j) => !cm.exact[j]);
  const q = dims.length;
  if (q === 0) return unrestricted;
  if (q === 1) {
    // One variable: Mahalanobis distance is |difference| / its SD, so this is matching on it.
    const j = dims[0] as number;
    const one: ModelParameters = {
      ...m,
      mean: { programme: cm.mean.programme[j] as number, comparison: cm.mean.comparison[j] as number },
      observedSD: { programme: cm.observedSD.programme[j] as number, comparison: cm.observedSD.comparison[j] as number },
    };
    return expectedMatchedShare(one, matching);
  }
  const gap = pick(cm.gap, dims);
  const metric = block(cm.sigmaX.programme, dims, dims).map((row, i) =>
    row.map((x, l) => (x + (cm.sigmaX.comparison[dims[i] as number]![dims[l] as number] as number)) / 2),
  );
  const delta = Math.sqrt(Math.max(0, dot(gap, solvePositiveDefinite(metric, gap))));
  return mahalanobisShare(q, delta, c, nP, nC, k, matching.replacement);
}

/**
 * Share matched within Mahalanobis distance c, q dimensions, programme mean at
 * distance delta from the comparison mean (both N(·, I) after whitening).
 */
function mahalanobisShare(q: number, delta: number, c: number, nP: number, nC: number, k: number, replacement: boolean): number {
  const ball = ballProbabilityTable(q, c, delta + 10 + c);
  // Programme point: u along the gap direction (mean delta), v = length of the other q − 1 coordinates.
  const uSteps = 96;
  const uLo = delta - 8;
  const uH = 16 / uSteps;
  const vSteps = q === 1 ? 0 : 48;
  const vHi = q === 1 ? 0 : Math.sqrt(q - 1) + 8;
  const vH = q === 1 ? 0 : vHi / vSteps;
  const chiDensity = (v: number): number => (q === 1 ? 1 : chiPdf(v, q - 1));
  const simpson = (i: number, n: number): number => (i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2);
  let total = 0;
  for (let i = 0; i <= uSteps; i++) {
    const u = uLo + i * uH;
    const wu = simpson(i, uSteps) * normalPdf(u - delta);
    for (let jv = 0; jv <= vSteps; jv++) {
      const v = jv * vH;
      const wv = q === 1 ? 1 : simpson(jv, vSteps) * chiDensity(v);
      if (wu * wv === 0) continue;
      const lambda = nC * ball(Math.sqrt(u * u + v * v));
      let share = 1 - Math.exp(-lambda);
      if (!replacement) {
        const demand = k * nP * ball(Math.sqrt((u - delta) ** 2 + v * v));
        if (demand > 0) share *= Math.min(1, lambda / demand);
      }
      total += wu * wv * share;
    }
  }
  const share = (total * uH) / 3 * (q === 1 ? 1 : vH / 3);
  return Math.min(1, Math.max(0, share));
}

/**
 * P(‖Z − a‖ ≤ c) for Z ~ N(0, I_q) as a function of d = ‖a‖, tabulated on
 * [0, dMax] (241 points, linear interpolation; 0 beyond).
 */
function ballProbabilityTable(q: number, c: number, dMax: number): (d: number) => number {
  const points = 240;
  const step = dMax / points;
  const values = new Float64Array(points + 1);
  for (let i = 0; i <= points; i++) values[i] = ballProbability(q, c, i * step);
  return (d) => {
    const x = d / step;
    const i = Math.floor(x);
    if (i >= points) return 0;
    const f = x - i;
    return (values[i] as number) * (1 - f) + (values[i + 1] as number) * f;
  };
}

/**
 * P(‖Z − a‖ ≤ c) for Z ~ N(0, I_q) and ‖a‖ = d: the chance that a comparison
 * member (whitened) falls within Mahalanobis distance c of a point at distance
 * d from the comparison mean. For q = 1, Φ(d + c) − Φ(d − c); otherwise
 * ∫ φ(z) F_{χ²(q−1)}(c² − (z − d)²) dz over |z − d| ≤ c (Simpson, 32 intervals
 * in θ with z = d + c·sin θ).
 * Reference: the noncentral chi-square CDF P(χ²_q(d²) ≤ c²) (Johnson, Kotz &
 * Balakrishnan 1995, ch. 29, from memory), computed by conditioning on the
 * coordinate along a. Exported for its tests.
 * @param q dimensions (≥ 1). @param c radius (> 0). @param d distance of the centre (≥ 0).
 * @returns probability in [0, 1]. @throws never.
 * @example mahalanobisBallProbability(2, 1, 0) // 1 − e^{−1/2} ≈ 0.3935
 */
export function mahalanobisBallProbability(q: number, c: number, d: number): number {
  return ballProbability(q, c, d);
}

function ballProbability(q: number, c: number, d: number): number {
  if (q === 1) return normalCdf(d + c) - normalCdf(d - c);
  // z = d + c·sin θ removes the square-root behaviour at the ends of [d − c, d + c].
  const n = 32;
  const h = Math.PI / n;
  let s = 0;
  for (let i = 0; i <= n; i++) {
    const theta = -Math.PI / 2 + i * h;
    const w = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
    const cos = Math.cos(theta);
    s += w * normalPdf(d + c * Math.sin(theta)) * chiSquareCdf(c * c * cos * cos, q - 1) * c * cos;
  }
  return (s * h) / 3;
}

/**
 * Chi-square CDF for a whole number of degrees of freedom, in closed form
 * (Abramowitz & Stegun 1964, 26.4.4–26.4.5, from memory): for even df = 2r,
 * 1 − e^{−y/2} Σ_{i<r} (y/2)^i / i!; for odd df = 2r + 1,
 * 2Φ(√y) − 1 − 2φ(√y) Σ_{i=1}^{r} y^{i − 1/2} / (1·3·…·(2i − 1)).
 * Exported for its test only.
 * @param y value (≤ 0 gives 0). @param df whole degrees of freedom (≥ 1).
 * @returns P(χ²_df ≤ y). @throws never.
 * @example chiSquareCdf(2, 2) // 1 − e^{−1} ≈ 0.6321
 */
export function chiSquareCdf(y: number, df: number): number {
  if (!(y > 0)) return 0;
  if (df % 2 === 0) {
    let term = 1;
    let sum = 1;
    for (let i = 1; i < df / 2; i++) {
      term *= y / 2 / i;
      sum += term;
    }
    return Math.max(0, 1 - Math.exp(-y / 2) * sum);
  }
  const r = (df - 1) / 2;
  const s = Math.sqrt(y);
  let term = s; // y^{1/2} / 1
  let sum = 0;
  for (let i = 1; i <= r; i++) {
    sum += term;
    term *= y / (2 * i + 1);
  }
  return Math.min(1, Math.max(0, 2 * normalCdf(s) - 1 - 2 * normalPdf(s) * sum));
}

/** Density of the chi distribution (length of a df-dimensional standard normal vector). */
function chiPdf(v: number, df: number): number {
  if (v <= 0) return df === 1 ? 2 * normalPdf(0) : 0;
  // 2^{1 − df/2} v^{df − 1} e^{−v²/2} / Γ(df/2)
  return Math.exp((1 - df / 2) * Math.LN2 + (df - 1) * Math.log(v) - (v * v) / 2 - logGammaHalf(df));
}

/** log Γ(df/2) for a whole df ≥ 1 (Γ(1/2) = √π, Γ(x + 1) = xΓ(x)). */
function logGammaHalf(df: number): number {
  let x = df % 2 === 0 ? 1 : 0.5;
  let log = df % 2 === 0 ? 0 : 0.5 * Math.log(Math.PI);
  while (x < df / 2) {
    log += Math.log(x);
    x += 1;
  }
  return log;
}
