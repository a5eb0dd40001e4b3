import { choleskyInPlace, choleskySolveInPlace } from './smallCholesky';

/** The fitted logistic regression. */
export interface LogisticFit {
  /** Intercept, then one slope per column, on the columns' own scale (log-odds per unit). */
  coefficients: number[];
  /** Newton steps taken. */
  iterations: number;
  /** Residual deviance −2 log L at the estimate. */
  deviance: number;
}

/** Options of fitLogisticRegression. */
export interface LogisticOptions {
  /** Names of the columns, for messages (default "covariate 1", …). */
  names?: readonly string[];
  /** Receives the fitted linear predictor (the logit) of every row, when given (length ≥ n). */
  linearPredictor?: Float64Array;
  /** Most Newton steps before giving up (default 25). */
  maxIterations?: number;
  /** Convergence: the Newton decrement (the deviance decrease the next step promises) relative to the deviance, λ² / (|D| + 0.1), below this (default 1e-10). */
  tolerance?: number;
  /** Where the data come from, added to messages in brackets, e.g. "simulated replication 12" (default none). */
  where?: string;
  /**
   * Starting coefficients (intercept first, the columns' own scale), e.g. the
   * linear discriminant's, which are the logistic model's own when the columns
   * are normal with a common covariance matrix in both groups (Efron 1975;
   * from memory). Newton's method then needs fewer steps; the estimate is the same.
   */
  start?: readonly number[];
  /** Reusable buffer of at least columns × n doubles for the standardised columns (allocated when absent). */
  scratch?: Float64Array;
}

/** Fitted logits beyond this size mean fitted probabilities within about 1e-13 of 0 or 1. */
const SEPARATION_LOGIT = 30;

/**
 * Maximum-likelihood logistic regression of a 0/1 outcome on numeric columns
 * (with an intercept) by Newton–Raphson, which for the canonical logit link is
 * iteratively reweighted least squares (McCullagh & Nelder 1989, "Generalized
 * Linear Models", 2nd ed., sec. 2.5 and 4.4; from memory). Each step solves
 * (X'WX) δ = X'(y − p) by Cholesky (choleskyInPlace), with W = diag(p(1 − p)); a step
 * that raises the deviance is halved (up to 30 times); convergence when the
 * deviance decrease the next step promises (the Newton decrement) falls below
 * the tolerance relative to the deviance, |D| + 0.1 (the scale of R's glm
 * criterion, common practice); that last step is taken. Columns are centred
 * and scaled internally for numerical stability; coefficients are returned on
 * the columns' own scale.
 *
 * Used for the propensity score: the outcome is membership of the programme
 * group, the columns the measured covariates, and the fitted logit is the
 * linear propensity score matched on (Rosenbaum & Rubin 1985).
 *
 * @param columns the predictors, each a Float64Array of at least n values (1..20 columns).
 * @param outcome 0/1 per row (at least n values; anything non-zero counts as 1).
 * @param n number of rows used (≥ columns + 2).
 * @param options names for messages, optional output of the fitted logits, iteration limit, tolerance.
 * @returns coefficients (intercept first), Newton steps, deviance.
 * @throws Error with a researcher-readable message when the outcome has only one
 *   value, a column is constant or not finite, the columns are collinear, or the
 *   groups are separated completely or almost completely (no finite estimate:
 *   fitted probabilities reach 0 or 1, or no convergence within the limit).
 * @example
 *   // 2 × 2 table: x = 0 → 10 of 40 are 1; x = 1 → 30 of 40:
 *   // intercept log(10/30) = −1.0986, slope = log odds ratio log(9) = 2.1972 (Agresti 2013, sec. 5.1; from memory).
 */
export function fitLogisticRegression(
  columns: readonly Float64Array[],
  outcome: ArrayLike<number>,
  n: number,
  options: LogisticOptions = {},
): LogisticFit {
  const k = columns.length;
  const q = k + 1;
  const at = options.where ? ` (${options.where})` : '';
  const names = options.names ?? columns.map((_, j) => `covariate ${j + 1}`);
  const list = (): string => names.slice(0, k).join(', ');
  if (!Number.isInteger(n) || n < q + 1) {
    throw new Error(`A logistic regression on ${k} covariate(s) needs at least ${q + 1} people${at}; got ${n}.`);
  }
  const y = new Uint8Array(n);
  let ones = 0;
  for (let i = 0; i < n; i++) {
    if (outcome[i]) {
      y[i] = 1;
      ones++;
    }
  }
  if (ones === 0 || ones === n) {
    throw new Error(`A logistic regression needs people in both groups${at}; all ${n} are in one group.`);
  }
  // Centre and scale each column into a column-major copy z[j * n + i].
  const centre = new Float64Array(k);
  const scale = new Float64Array(k);
  const z = options.scratch && options.scratch.length >= k * n ? options.scratch : new Float64Array(k * n);
  for (let j = 0; j < k; j++) {
    const col = columns[j] as Float64Array;
    let s = 0;
    for (let i = 0; i < n; i++) s += col[i] as number;
    const m = s / n;
    let ss = 0;
    for (let i = 0; i < n; i++) ss += ((col[i] as number) - m) ** 2;
    const sd = Math.sqrt(ss / (n - 1));
    if (!Number.isFinite(m) || !Number.isFinite(sd)) {
      throw new Error(`The covariate "${names[j]}" has values that are not finite numbers${at}.`);
    }
    if (!(sd > 0)) {
      throw new Error(
        `The covariate "${names[j]}" takes a single value (${m}) in every one of the ${n} people${at}, so it cannot enter the propensity score.`,
      );
    }
    centre[j] = m;
    scale[j] = 1 / sd;
    const base = j * n;
    for (let i = 0; i < n; i++) z[base + i] = ((col[i] as number) - m) / sd;
  }

  const maxIterations = options.maxIterations ?? 25;
  const tolerance = options.tolerance ?? 1e-10;
  const eta = options.linearPredictor && options.linearPredictor.length >= n ? options.linearPredictor : new Float64Array(n);
  const ws: PassWorkspace = {
    weight: new Float64Array(n),
    residual: new Float64Array(n),
    hess: new Float64Array(q * q),
    grad: new Float64Array(q),
    maxAbsEta: 0,
  };
  const b = new Float64Array(q);
  b[0] = Math.log(ones / (n - ones));
  const start = options.start;
  if (start && start.length === q && start.every((v) => Number.isFinite(v))) {
    // To the standardised scale: slope_j · sd_j; intercept + Σ slope_j · centre_j.
    let intercept = start[0] as number;
    for (let j = 0; j < k; j++) {
      b[j + 1] = (start[j + 1] as number) / (scale[j] as number);
      intercept += (start[j + 1] as number) * (centre[j] as number);
    }
    b[0] = intercept;
  }
  let dev = rowPass(z, y, n, k, b, eta, ws, true);
  const trial = new Float64Array(q);
  const delta = new Float64Array(q);
  const factor = new Float64Array(q * q);
  let iterations = 0;
  let converged = false;
  const separated = (why: string): Error =>
    new Error(
      `The propensity score cannot be fitted${at}: the measured covariates (${list()}) separate the programme and ` +
        `comparison groups completely or almost completely (${why}), so the logistic regression has no finite estimate. ` +
        'Matching needs groups that overlap: bring the group means closer, leave a covariate out of the propensity score, or use ANCOVA instead.',
    );
  while (iterations < maxIterations) {
    iterations++;
    // Solve (X'WX) delta = X'(y − p); the pass filled the upper triangle.
    const hess = ws.hess;
    for (let a = 0; a < q; a++) for (let c = a; c < q; c++) factor[c * q + a] = hess[a * q + c] as number;
    if (!choleskyInPlace(factor, q)) {
      if (ws.maxAbsEta > SEPARATION_LOGIT / 2) throw separated('fitted probabilities reach 0 or 1');
      throw new Error(
        `The propensity score cannot be fitted${at}: the measured covariates (${list()}) are collinear ` +
          '(one is an exact linear combination of the others in these data). Leave one of them out.',
      );
    }
    delta.set(ws.grad);
    choleskySolveInPlace(factor, q, delta);
    // Newton decrement λ² = g' H^-1 g, the deviance decrease the full step promises (Boyd &
    // Vandenberghe 2004, "Convex Optimization", sec. 9.5.1): when it is below the tolerance
    // relative to the deviance, take the step and stop (quadratic convergence makes the
    // remaining error far smaller still).
    let lambda2 = 0;
    for (let a = 0; a < q; a++) lambda2 += (delta[a] as number) * (ws.grad[a] as number);
    if (lambda2 / (Math.abs(dev) + 0.1) < tolerance) {
      for (let a = 0; a < q; a++) b[a] = (b[a] as number) + (delta[a] as number);
      dev = rowPass(z, y, n, k, b, eta, ws, false);
      converged = true;
      break;
    }
    let step = 1;
    let devTry = 0;
    for (let halvings = 0; ; halvings++) {
      for (let a = 0; a < q; a++) trial[a] = (b[a] as number) + step * (delta[a] as number);
      devTry = rowPass(z, y, n, k, trial, eta, ws, true);
      if (devTry <= dev * (1 + 1e-12) + 1e-12 || halvings >= 30) break;
      step /= 2;
    }
    b.set(trial);
    dev = devTry;
    if (!Number.isFinite(dev)) throw separated('the deviance is no longer finite');
  }
  if (!converged) throw separated(`no convergence after ${maxIterations} Newton steps`);
  if (ws.maxAbsEta > SEPARATION_LOGIT) throw separated('fitted probabilities reach 0 or 1');

  const coefficients = new Array<number>(q);
  let intercept = b[0] as number;
  for (let j = 0; j < k; j++) {
    const slope = (b[j + 1] as number) * (scale[j] as number);
    coefficients[j + 1] = slope;
    intercept -= slope * (centre[j] as number);
  }
  coefficients[0] = intercept;
  return { coefficients, iterations, deviance: dev };
}

/** Buffers and the largest |logit| of the last pass. */
interface PassWorkspace {
  /** p(1 − p) per row. */
  weight: Float64Array;
  /** y − p per row. */
  residual: Float64Array;
  /** Upper triangle of X'WX (row-major q × q). */
  hess: Float64Array;
  /** X'(y − p). */
  grad: Float64Array;
  maxAbsEta: number;
}

/**
 * One pass over the rows at coefficients b (standardised scale): the logits
 * into eta and the deviance; with `information`, also the weights p(1 − p)
 * and residuals y − p, then the gradient X'(y − p) and information X'WX
 * (upper triangle) column by column, each sum in a register (without it, the
 * pass after the last step, which needs only the deviance). Module-level (not
 * a closure) so V8 keeps it optimised across calls.
 */
function rowPass(
  z: Float64Array,
  y: Uint8Array,
  n: number,
  k: number,
  b: Float64Array,
  eta: Float64Array,
  ws: PassWorkspace,
  information: boolean,
): number {
  const { hess, grad, weight, residual } = ws;
  const q = k + 1;
  let linear = 0;
  let logs = 0;
  let product = 1;
  let inChunk = 0;
  let maxAbsEta = 0;
  linearPredictor(z, n, k, b, eta);
  let sw = 0;
  let sr = 0;
  for (let i = 0; i < n; i++) {
    const e = eta[i] as number;
    const ae = e < 0 ? -e : e;
    if (ae > maxAbsEta) maxAbsEta = ae;
    // One exponential per row: ex = exp(−|e|), p = 1/(1 + exp(−e)).
    const ex = Math.exp(-ae);
    const onePlus = 1 + ex;
    // Deviance term 2 [log(1 + exp(−|e|)) + max(∓e, 0)]: the logarithms are taken of products
    // of 64 factors in (1, 2] (exact enough, and one logarithm per 64 rows).
    linear += y[i] ? (e < 0 ? ae : 0) : e > 0 ? ae : 0;
    product *= onePlus;
    if (++inChunk === 64) {
      logs += Math.log(product);
      product = 1;
      inChunk = 0;
    }
    if (!information) continue;
    const inv = 1 / onePlus;
    const p = e >= 0 ? inv : ex * inv;
    const w = p * (1 - p);
    const r = (y[i] as number) - p;
    weight[i] = w;
    residual[i] = r;
    sw += w;
    sr += r;
  }
  ws.maxAbsEta = maxAbsEta;
  const deviance = 2 * (logs + Math.log(product) + linear);
  if (!information) return deviance;
  hess[0] = sw;
  grad[0] = sr;
  for (let a = 0; a < k; a++) {
    const ba = a * n;
    let g = 0;
    let h0 = 0;
    for (let i = 0; i < n; i++) {
      const za = z[ba + i] as number;
      g += (residual[i] as number) * za;
      h0 += (weight[i] as number) * za;
    }
    grad[a + 1] = g;
    hess[a + 1] = h0;
    for (let c = a; c < k; c++) {
      const bc = c * n;
      let h = 0;
      for (let i = 0; i < n; i++) h += (weight[i] as number) * (z[ba + i] as number) * (z[bc + i] as number);
      hess[(a + 1) * q + c + 1] = h;
    }
  }
  return deviance;
}

/** eta[i] = b[0] + Σ_j b[j + 1] z[j · n + i] for i < n (column by column, in that order). */
function linearPredictor(z: Float64Array, n: number, k: number, b: Float64Array, eta: Float64Array): void {
  eta.fill(b[0] as number, 0, n);
  for (let j = 0; j < k; j++) {
    const bj = b[j + 1] as number;
    const base = j * n;
    for (let i = 0; i < n; i++) eta[i] = (eta[i] as number) + bj * (z[base + i] as number);
  }
}
