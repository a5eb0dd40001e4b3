import { choleskyInPlace, choleskySolveInPlace } from './smallCholesky';

/** The fitted logistic regression. */
export interface LogisticFit {
  /** Intercept, then one slope per column, on the columns' own scale (log-odds per unit). */
  coefficients: number[];
  /** Newton steps taken. */
  iterations: number;
  /** Residual deviance −2 log L at the estimate (NaN when options.finalDeviance is false). */
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
  /**
   * Reusable buffers from createLogisticWorkspace (for this many columns and at
   * least n rows), so a caller fitting many data sets of one shape allocates
   * nothing per fit; allocated afresh when absent or of another shape. The
   * results do not depend on it (it holds no state from one fit to the next).
   */
  workspace?: LogisticWorkspace;
  /**
   * Use the general row loop (rowPass: every sum in one sweep over the rows)
   * instead of the fast passes (logitPass and the sums after it; default false).
   * The two give the same bits; tests compare them.
   */
  generalPass?: boolean;
  /**
   * Compute the deviance at the estimate (default true). The pass after the last
   * Newton step then takes one exponential per row for it; with false that pass
   * computes only the logits (the same bits) and `deviance` is NaN. The
   * propensity engine, which keeps only the logits, passes false.
   */
  finalDeviance?: boolean;
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
  const y = options.workspace && options.workspace.rows >= n ? options.workspace.group : new Uint8Array(n);
  let ones = 0;
  for (let i = 0; i < n; i++) {
    if (outcome[i]) {
      y[i] = 1;
      ones++;
    } else y[i] = 0;
  }
  if (ones === 0 || ones === n) {
    throw new Error(`A logistic regression needs people in both groups${at}; all ${n} are in one group.`);
  }
  // Centre and scale each column into a row-major copy z[i * k + j] (one row's
  // values side by side, so each pass over the rows reads them in one sweep).
  const ws = options.workspace && options.workspace.rows >= n && options.workspace.columns === k ? options.workspace : createLogisticWorkspace(n, k);
  const { centre, scale, z } = ws;
  const standardise = (j: number, m: number, sd: number): void => {
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
  };
  // Four columns per sweep while there are four (each column's sums over the rows in order, as one
  // column at a time: the same bits), the rest one at a time; checked in column order.
  let j = 0;
  for (; j + 4 <= k; j += 4) {
    const c0 = columns[j] as Float64Array;
    const c1 = columns[j + 1] as Float64Array;
    const c2 = columns[j + 2] as Float64Array;
    const c3 = columns[j + 3] as Float64Array;
    let s0 = 0; let s1 = 0; let s2 = 0; let s3 = 0;
    for (let i = 0; i < n; i++) {
      s0 += c0[i] as number;
      s1 += c1[i] as number;
      s2 += c2[i] as number;
      s3 += c3[i] as number;
    }
    const m0 = s0 / n; const m1 = s1 / n; const m2 = s2 / n; const m3 = s3 / n;
    let q0 = 0; let q1 = 0; let q2 = 0; let q3 = 0;
    for (let i = 0; i < n; i++) {
      q0 += ((c0[i] as number) - m0) ** 2;
      q1 += ((c1[i] as number) - m1) ** 2;
      q2 += ((c2[i] as number) - m2) ** 2;
      q3 += ((c3[i] as number) - m3) ** 2;
    }
    const d0 = Math.sqrt(q0 / (n - 1)); const d1 = Math.sqrt(q1 / (n - 1)); const d2 = Math.sqrt(q2 / (n - 1)); const d3 = Math.sqrt(q3 / (n - 1));
    standardise(j, m0, d0);
    standardise(j + 1, m1, d1);
    standardise(j + 2, m2, d2);
    standardise(j + 3, m3, d3);
    for (let i = 0, t = j; i < n; i++, t += k) {
      z[t] = ((c0[i] as number) - m0) / d0;
      z[t + 1] = ((c1[i] as number) - m1) / d1;
      z[t + 2] = ((c2[i] as number) - m2) / d2;
      z[t + 3] = ((c3[i] as number) - m3) / d3;
    }
  }
  for (; j < k; j++) {
    const col = columns[j] as Float64Array;
    let s = 0;
    for (let i = 0; i < n; i++) s += col[i] as number;
    const m = s / n;
    let ss = 0;
    for (let i = 0; i < n; i++) ss += ((col[i] as number) - m) ** 2;
    const sd = Math.sqrt(ss / (n - 1));
    standardise(j, m, sd);
    for (let i = 0, t = j; i < n; i++, t += k) z[t] = ((col[i] as number) - m) / sd;
  }

  const maxIterations = options.maxIterations ?? 25;
  const tolerance = options.tolerance ?? 1e-10;
  const eta = options.linearPredictor && options.linearPredictor.length >= n ? options.linearPredictor : new Float64Array(n);
  const b = ws.b;
  b.fill(0);
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
  const general = options.generalPass === true;
  let dev = rowPass(z, y, n, k, b, eta, ws, true, general);
  const { trial, delta, factor } = ws;
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
      dev = options.finalDeviance === false && !general ? logitPass(z, y, n, k, b, eta, ws, false, false) : rowPass(z, y, n, k, b, eta, ws, false, general);
      converged = true;
      break;
    }
    let step = 1;
    let devTry = 0;
    for (let halvings = 0; ; halvings++) {
      for (let a = 0; a < q; a++) trial[a] = (b[a] as number) + step * (delta[a] as number);
      devTry = rowPass(z, y, n, k, trial, eta, ws, true, general);
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

/** Buffers of fitLogisticRegression, reusable from one fit to the next (createLogisticWorkspace). */
export interface LogisticWorkspace {
  /** Rows it can hold. */
  readonly rows: number;
  /** Columns (predictors, without the intercept). */
  readonly columns: number;
  /** 0/1 outcome per row. */
  readonly group: Uint8Array;
  /** Standardised columns, row-major: z[i · columns + j]. */
  readonly z: Float64Array;
  readonly centre: Float64Array;
  readonly scale: Float64Array;
  /** Coefficients (standardised scale), trial coefficients, Newton step. */
  readonly b: Float64Array;
  readonly trial: Float64Array;
  readonly delta: Float64Array;
  /** Cholesky factor of the information matrix, row-major q × q. */
  readonly factor: Float64Array;
  /** Upper triangle of X'WX (row-major q × q), filled by an information pass. */
  readonly hess: Float64Array;
  /** X'(y − p), filled by an information pass. */
  readonly grad: Float64Array;
  /** Running sums of one pass, packed: the gradient's q entries, then X'WX's upper triangle row by row. */
  readonly sums: Float64Array;
  /** Per row, p(1 − p) and y − p of the last information pass (the fast passes). */
  readonly weight: Float64Array;
  readonly residual: Float64Array;
  /** The deviance's products of 64 factors, one per chunk of rows (the fast passes). */
  readonly chunkProducts: Float64Array;
  /** Largest |logit| of the last pass. */
  maxAbsEta: number;
}

/**
 * Allocate the buffers of fitLogisticRegression for up to `rows` rows and
 * `columns` predictors.
 * @param rows rows (≥ 1). @param columns predictors without the intercept (1..20).
 * @returns a workspace to pass as options.workspace. @throws never.
 * @example createLogisticWorkspace(1380, 4).z.length // 5520
 */
export function createLogisticWorkspace(rows: number, columns: number): LogisticWorkspace {
  const q = columns + 1;
  return {
    rows,
    columns,
    group: new Uint8Array(rows),
    z: new Float64Array(rows * columns),
    centre: new Float64Array(columns),
    scale: new Float64Array(columns),
    b: new Float64Array(q),
    trial: new Float64Array(q),
    delta: new Float64Array(q),
    factor: new Float64Array(q * q),
    hess: new Float64Array(q * q),
    grad: new Float64Array(q),
    sums: new Float64Array(q + (q * (q + 1)) / 2),
    weight: new Float64Array(rows),
    residual: new Float64Array(rows),
    chunkProducts: new Float64Array(Math.ceil(rows / 64) + 1),
    maxAbsEta: 0,
  };
}

/**
 * One pass over the rows at coefficients b (standardised scale), row by row:
 * the logit of each row into eta, and the deviance; with `information`, also
 * the gradient X'(y − p) and the information X'WX (upper triangle), W =
 * diag(p(1 − p)), all accumulated in the same sweep (without it, the pass
 * after the last step, which needs only the logits and the deviance). Every
 * sum runs over the rows in order, with the same operations per row as a
 * column-by-column pass (logit b0 + b1 z1 + …, products (w z_a) z_c), so the
 * order of the sweep changes no bit. Module-level (not a closure) so V8 keeps
 * it optimised across calls.
 */
function rowPass(
  z: Float64Array,
  y: Uint8Array,
  n: number,
  k: number,
  b: Float64Array,
  eta: Float64Array,
  ws: LogisticWorkspace,
  information: boolean,
  general = false,
): number {
  if (!general) {
    // The fast passes below (the same bits).
    return information ? informationPass(z, y, n, k, b, eta, ws) : logitPass(z, y, n, k, b, eta, ws, false, true);
  }
  const q = k + 1;
  const sums = ws.sums;
  let linear = 0;
  let logs = 0;
  let product = 1;
  let inChunk = 0;
  let maxAbsEta = 0;
  const b0 = b[0] as number;
  let sw = 0;
  let sr = 0;
  if (information) sums.fill(0);
  for (let i = 0, base = 0; i < n; i++, base += k) {
    let e = b0;
    for (let j = 0; j < k; j++) e += (b[j + 1] as number) * (z[base + j] as number);
    eta[i] = e;
    const ae = Math.abs(e);
    if (ae > maxAbsEta) maxAbsEta = ae;
    // One exponential per row: ex = exp(−|e|), p = 1/(1 + exp(−e)).
    const ex = Math.exp(-ae);
    const onePlus = 1 + ex;
    const yi = y[i] as number;
    // Deviance term 2 [log(1 + exp(−|e|)) + max(∓e, 0)]: the logarithms are taken of products
    // of 64 factors in (1, 2] (exact enough, and one logarithm per 64 rows).
    linear += Math.max(0, yi === 0 ? e : -e);
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
    const r = yi - p;
    sw += w;
    sr += r;
    // sums: [0, k) gradient of the columns; then, per column a, X'WX's entries (0, a + 1) and (a + 1, c + 1) for c ≥ a.
    for (let a = 0, t = 0; a < k; a++) {
      const za = z[base + a] as number;
      const wa = w * za;
      sums[a] = (sums[a] as number) + r * za;
      sums[k + t] = (sums[k + t] as number) + wa;
      t++;
      for (let c = a; c < k; c++, t++) sums[k + t] = (sums[k + t] as number) + wa * (z[base + c] as number);
    }
  }
  ws.maxAbsEta = maxAbsEta;
  const deviance = 2 * (logs + Math.log(product) + linear);
  if (!information) return deviance;
  const { hess, grad } = ws;
  hess[0] = sw;
  grad[0] = sr;
  for (let a = 0, t = 0; a < k; a++) {
    grad[a + 1] = sums[a] as number;
    hess[a + 1] = sums[k + t] as number;
    t++;
    for (let c = a; c < k; c++, t++) hess[(a + 1) * q + c + 1] = sums[k + t] as number;
  }
  return deviance;
}

/*
 * The fast passes (the engine's): the same sums as rowPass, in steps. First
 * each row's logit (one loop per number of columns), then the deviance and the
 * row's weight w = p(1 − p) and residual r = y − p, kept in the workspace
 * (logitPass); then
 * short loops sum the gradient and the information from those, with at most
 * eleven sums in one loop (sumsFor1…4; pair by pair beyond four columns), so
 * V8 keeps every running sum in a register: a single loop over all of them
 * (fifteen information entries and five gradient entries for four columns)
 * spills them to memory and ran about 1.7 times slower. Every sum still runs
 * over the rows in order with the same operations per row as rowPass (w and r
 * are the same doubles, stored and read back), so the results are the same to
 * the last bit (a test compares them with rowPass on data of one to nine
 * columns).
 */

/** The information pass: logitPass, then the sums for k columns. Returns the deviance. */
function informationPass(z: Float64Array, y: Uint8Array, n: number, k: number, b: Float64Array, eta: Float64Array, ws: LogisticWorkspace): number {
  const deviance = logitPass(z, y, n, k, b, eta, ws, true, true);
  if (k === 1) sumsFor1(z, n, ws);
  else if (k === 2) sumsFor2(z, n, ws);
  else if (k === 3) sumsFor3(z, n, ws);
  else if (k === 4) sumsFor4(z, n, ws);
  else sumsByPair(z, n, k, ws);
  return deviance;
}

/**
 * The rows at coefficients b: the logit of each row into eta (b0 + b1 z1 + …,
 * in that order) and ws.maxAbsEta (logits); then each row's exp(−|logit|), and
 * from it, with `deviance`, the deviance (as rowPass; NaN without), and with
 * `weights`, w_i = p_i (1 − p_i) and r_i = y_i − p_i into ws.weight and
 * ws.residual, in one more loop.
 */
function logitPass(
  z: Float64Array,
  y: Uint8Array,
  n: number,
  k: number,
  b: Float64Array,
  eta: Float64Array,
  ws: LogisticWorkspace,
  weights: boolean,
  deviance: boolean,
): number {
  ws.maxAbsEta = logits(z, n, k, b, eta);
  if (!deviance && !weights) return NaN;
  const { weight, residual } = ws;
  // The exponentials first, in a loop of their own (little is live across the calls), into
  // ws.weight, which the next loop reads and then overwrites with p(1 − p).
  for (let i = 0; i < n; i++) weight[i] = Math.exp(-Math.abs(eta[i] as number));
  // Each chunk of 64 rows' product is kept and its logarithm added after the loop, in order (the
  // same sum as adding it at once; a call inside the loop made V8 box the running sums).
  const chunkProducts = ws.chunkProducts;
  let chunks = 0;
  let linear = 0;
  let product = 1;
  let inChunk = 0;
  for (let i = 0; i < n; i++) {
    const e = eta[i] as number;
    const ex = weight[i] as number;
    const onePlus = 1 + ex;
    const yi = y[i] as number;
    linear += Math.max(0, yi === 0 ? e : -e);
    product *= onePlus;
    if (++inChunk === 64) {
      chunkProducts[chunks++] = product;
      product = 1;
      inChunk = 0;
    }
    if (!weights) continue;
    const inv = 1 / onePlus;
    const p = e >= 0 ? inv : ex * inv;
    weight[i] = p * (1 - p);
    residual[i] = yi - p;
  }
  if (!deviance) return NaN;
  let logs = 0;
  for (let c = 0; c < chunks; c++) logs += Math.log(chunkProducts[c] as number);
  return 2 * (logs + Math.log(product) + linear);
}

/** Each row's logit b0 + b1 z1 + … (added in that order) into eta, in one loop per number of columns up to four; returns the largest |logit|. */
function logits(z: Float64Array, n: number, k: number, b: Float64Array, eta: Float64Array): number {
  const b0 = b[0] as number;
  const b1 = b[1] as number;
  const b2 = k >= 2 ? (b[2] as number) : 0;
  const b3 = k >= 3 ? (b[3] as number) : 0;
  const b4 = k >= 4 ? (b[4] as number) : 0;
  let largest = 0;
  if (k === 4) {
    for (let i = 0, base = 0; i < n; i++, base += 4) {
      const e = b0 + b1 * (z[base] as number) + b2 * (z[base + 1] as number) + b3 * (z[base + 2] as number) + b4 * (z[base + 3] as number);
      eta[i] = e;
      const ae = Math.abs(e);
      if (ae > largest) largest = ae;
    }
  } else if (k === 3) {
    for (let i = 0, base = 0; i < n; i++, base += 3) {
      const e = b0 + b1 * (z[base] as number) + b2 * (z[base + 1] as number) + b3 * (z[base + 2] as number);
      eta[i] = e;
      const ae = Math.abs(e);
      if (ae > largest) largest = ae;
    }
  } else if (k === 2) {
    for (let i = 0, base = 0; i < n; i++, base += 2) {
      const e = b0 + b1 * (z[base] as number) + b2 * (z[base + 1] as number);
      eta[i] = e;
      const ae = Math.abs(e);
      if (ae > largest) largest = ae;
    }
  } else if (k === 1) {
    for (let i = 0; i < n; i++) {
      const e = b0 + b1 * (z[i] as number);
      eta[i] = e;
      const ae = Math.abs(e);
      if (ae > largest) largest = ae;
    }
  } else {
    for (let i = 0, base = 0; i < n; i++, base += k) {
      let e = b0;
      for (let j = 0; j < k; j++) e += (b[j + 1] as number) * (z[base + j] as number);
      eta[i] = e;
      const ae = Math.abs(e);
      if (ae > largest) largest = ae;
    }
  }
  return largest;
}

/** The gradient and information sums for 1 column, from ws.weight and ws.residual. */
function sumsFor1(z: Float64Array, n: number, ws: LogisticWorkspace): void {
  const { weight, residual, hess, grad } = ws;
  let sw = 0; let sr = 0; let g1 = 0; let h01 = 0; let h11 = 0;
  for (let i = 0; i < n; i++) {
    const w = weight[i] as number;
    const r = residual[i] as number;
    const z1 = z[i] as number;
    sw += w;
    sr += r;
    g1 += r * z1;
    const w1 = w * z1;
    h01 += w1;
    h11 += w1 * z1;
  }
  hess[0] = sw; grad[0] = sr; grad[1] = g1; hess[1] = h01; hess[3] = h11;
}

/** The same for 2 columns. */
function sumsFor2(z: Float64Array, n: number, ws: LogisticWorkspace): void {
  const { weight, residual, hess, grad } = ws;
  let sw = 0; let sr = 0; let g1 = 0; let g2 = 0;
  let h01 = 0; let h11 = 0; let h12 = 0; let h02 = 0; let h22 = 0;
  for (let i = 0, base = 0; i < n; i++, base += 2) {
    const w = weight[i] as number;
    const r = residual[i] as number;
    const z1 = z[base] as number;
    const z2 = z[base + 1] as number;
    sw += w;
    sr += r;
    g1 += r * z1;
    g2 += r * z2;
    const w1 = w * z1;
    h01 += w1;
    h11 += w1 * z1;
    h12 += w1 * z2;
    const w2 = w * z2;
    h02 += w2;
    h22 += w2 * z2;
  }
  hess[0] = sw; grad[0] = sr; grad[1] = g1; grad[2] = g2;
  hess[1] = h01; hess[4] = h11; hess[5] = h12; hess[2] = h02; hess[8] = h22;
}

/** The same for 3 columns, in two loops. */
function sumsFor3(z: Float64Array, n: number, ws: LogisticWorkspace): void {
  const { weight, residual, hess, grad } = ws;
  let sw = 0; let sr = 0; let g1 = 0; let g2 = 0; let g3 = 0;
  let h01 = 0; let h11 = 0; let h12 = 0; let h13 = 0;
  for (let i = 0, base = 0; i < n; i++, base += 3) {
    const w = weight[i] as number;
    const r = residual[i] as number;
    const z1 = z[base] as number;
    const z2 = z[base + 1] as number;
    const z3 = z[base + 2] as number;
    sw += w;
    sr += r;
    g1 += r * z1;
    g2 += r * z2;
    g3 += r * z3;
    const w1 = w * z1;
    h01 += w1;
    h11 += w1 * z1;
    h12 += w1 * z2;
    h13 += w1 * z3;
  }
  let h02 = 0; let h22 = 0; let h23 = 0; let h03 = 0; let h33 = 0;
  for (let i = 0, base = 0; i < n; i++, base += 3) {
    const w = weight[i] as number;
    const z2 = z[base + 1] as number;
    const z3 = z[base + 2] as number;
    const w2 = w * z2;
    h02 += w2;
    h22 += w2 * z2;
    h23 += w2 * z3;
    const w3 = w * z3;
    h03 += w3;
    h33 += w3 * z3;
  }
  hess[0] = sw; grad[0] = sr; grad[1] = g1; grad[2] = g2; grad[3] = g3;
  hess[1] = h01; hess[5] = h11; hess[6] = h12; hess[7] = h13;
  hess[2] = h02; hess[10] = h22; hess[11] = h23; hess[3] = h03; hess[15] = h33;
}

/** The same for 4 columns, in two loops. */
function sumsFor4(z: Float64Array, n: number, ws: LogisticWorkspace): void {
  const { weight, residual, hess, grad } = ws;
  let sw = 0; let sr = 0; let g1 = 0; let g2 = 0; let g3 = 0; let g4 = 0;
  let h01 = 0; let h11 = 0; let h12 = 0; let h13 = 0; let h14 = 0;
  for (let i = 0, base = 0; i < n; i++, base += 4) {
    const w = weight[i] as number;
    const r = residual[i] as number;
    const z1 = z[base] as number;
    const z2 = z[base + 1] as number;
    const z3 = z[base + 2] as number;
    const z4 = z[base + 3] as number;
    sw += w;
    sr += r;
    g1 += r * z1;
    g2 += r * z2;
    g3 += r * z3;
    g4 += r * z4;
    const w1 = w * z1;
    h01 += w1;
    h11 += w1 * z1;
    h12 += w1 * z2;
    h13 += w1 * z3;
    h14 += w1 * z4;
  }
  let h02 = 0; let h22 = 0; let h23 = 0; let h24 = 0;
  let h03 = 0; let h33 = 0; let h34 = 0; let h04 = 0; let h44 = 0;
  for (let i = 0, base = 0; i < n; i++, base += 4) {
    const w = weight[i] as number;
    const z2 = z[base + 1] as number;
    const z3 = z[base + 2] as number;
    const z4 = z[base + 3] as number;
    const w2 = w * z2;
    h02 += w2;
    h22 += w2 * z2;
    h23 += w2 * z3;
    h24 += w2 * z4;
    const w3 = w * z3;
    h03 += w3;
    h33 += w3 * z3;
    h34 += w3 * z4;
    const w4 = w * z4;
    h04 += w4;
    h44 += w4 * z4;
  }
  hess[0] = sw; grad[0] = sr; grad[1] = g1; grad[2] = g2; grad[3] = g3; grad[4] = g4;
  hess[1] = h01; hess[6] = h11; hess[7] = h12; hess[8] = h13; hess[9] = h14;
  hess[2] = h02; hess[12] = h22; hess[13] = h23; hess[14] = h24;
  hess[3] = h03; hess[18] = h33; hess[19] = h34; hess[4] = h04; hess[24] = h44;
}

/** The same for any number of columns: the weights' and residuals' sums, then column by column and pair by pair. */
function sumsByPair(z: Float64Array, n: number, k: number, ws: LogisticWorkspace): void {
  const { weight, residual, hess, grad } = ws;
  const q = k + 1;
  let sw = 0;
  let sr = 0;
  for (let i = 0; i < n; i++) {
    sw += weight[i] as number;
    sr += residual[i] as number;
  }
  hess[0] = sw;
  grad[0] = sr;
  for (let a = 0; a < k; a++) {
    let g = 0;
    let h0 = 0;
    for (let i = 0, at = a; i < n; i++, at += k) {
      const za = z[at] as number;
      g += (residual[i] as number) * za;
      h0 += (weight[i] as number) * za;
    }
    grad[a + 1] = g;
    hess[a + 1] = h0;
    for (let c = a; c < k; c++) {
      let h = 0;
      for (let i = 0, at = i * k; i < n; i++, at += k) h += ((weight[i] as number) * (z[at + a] as number)) * (z[at + c] as number);
      hess[(a + 1) * q + c + 1] = h;
    }
  }
}
