import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import type { NormalSampler } from '../normalSampler';
import { normalQuantile } from '../normalQuantile';
import type { CovariateSimModel } from './covariateSimModel';

/**
 * One replication's two pools under the several-covariate model, stored by
 * variable: for variable j (pretest first), observed[j][i] and trueScore[j][i]
 * for person i, comparison members at i in [0, nC), programme members at
 * i in [nC, nC + nP). Buffers are allocated once (createCovariatePools) and
 * overwritten by every draw.
 */
export interface CovariatePools {
  readonly nProgramme: number;
  readonly nComparison: number;
  /** nC + nP. */
  readonly size: number;
  /** Number of variables (pretest + covariates). */
  readonly variables: number;
  readonly observed: Float64Array[];
  readonly trueScore: Float64Array[];
  readonly outcome: Float64Array;
  /** The replication's standard normal variates (see drawCovariatePools for the layout). */
  readonly normals: Float64Array;
  /** Normal variates per person: variables + error-prone variables + 1. */
  readonly stride: number;
  /** Lower Cholesky factors of sigmaT per group, row-major variables × variables. */
  readonly choleskyProgramme: Float64Array;
  readonly choleskyComparison: Float64Array;
  readonly meanProgramme: Float64Array;
  readonly meanComparison: Float64Array;
  readonly sem: Float64Array;
  /** Indices of the variables measured with error (sem > 0), ascending. */
  readonly errorVariables: Int32Array;
  /** Per variable, its position in errorVariables (the error variate's slot after the p true-score variates), or −1 without error. */
  readonly errorSlot: Int32Array;
  /**
   * How each variable is recorded: CONTINUOUS, WHOLE_NUMBERS (a categorical
   * variable matched exactly: the draw rounded) or INDICATOR (a 0/1 variable
   * matched exactly: the draw thresholded so each group keeps its mean).
   */
  readonly recording: Uint8Array;
  /** Per variable, the indicator's threshold in each group (+Infinity: always 0; −Infinity: always 1). */
  readonly thresholdProgramme: Float64Array;
  readonly thresholdComparison: Float64Array;
  readonly beta: Float64Array;
  readonly residualSD: number;
  /** Outcome shift of the programme group: growth gap + tau. */
  readonly programmeShift: number;
}

/** Recording of a variable (CovariatePools.recording). */
export const CONTINUOUS = 0;
export const WHOLE_NUMBERS = 1;
export const INDICATOR = 2;

/**
 * Whether an exactly matched variable is a 0/1 indicator: both group means in
 * [0, 1] and an SD of at most 0.5 (the largest a 0/1 variable can have).
 * @param programmeMean mean in the programme group. @param comparisonMean mean in the comparison group.
 * @param sd within-group SD. @returns true for an indicator. @throws never.
 * @example isIndicator(0.45, 0.5, 0.5) // true; isIndicator(40, 42, 8) // false
 */
export function isIndicator(programmeMean: number, comparisonMean: number, sd: number): boolean {
  const inUnit = (m: number) => m >= 0 && m <= 1;
  return inUnit(programmeMean) && inUnit(comparisonMean) && sd <= 0.5 + 1e-12;
}

/**
 * Allocate the pools' buffers and the generating constants for a model.
 * @param model the several-covariate model (src/core/multivariate, or a hand-made one in tests).
 * @returns reusable pools for drawCovariatePools.
 * @throws Error when a group's true-score covariance matrix is not positive
 *   definite (the core's validation rejects such plans first, naming the covariates).
 * @example createCovariatePools(model).stride // variables + error-prone variables + 1
 */
export function createCovariatePools(model: CovariateSimModel): CovariatePools {
  const p = model.names.length;
  const nP = model.n.programme;
  const nC = model.n.comparison;
  const size = nP + nC;
  const errorVariables = Int32Array.from(model.sem.map((s, j) => (s > 0 ? j : -1)).filter((j) => j >= 0));
  const stride = p + errorVariables.length + 1;
  const chol = (s: readonly (readonly number[])[], who: string): Float64Array => {
    const m = new Matrix(s.map((row, i) => row.map((x, j) => (j >= i ? x : (s[j]?.[i] as number)))));
    const c = new CholeskyDecomposition(m);
    if (!c.isPositiveDefinite()) {
      throw new Error(`The ${who} group's true-score covariance matrix of the pretest and covariates is not positive definite, so it cannot be simulated.`);
    }
    const l = c.lowerTriangularMatrix;
    const out = new Float64Array(p * p);
    for (let i = 0; i < p; i++) for (let j = 0; j <= i; j++) out[i * p + j] = l.get(i, j);
    return out;
  };
  const recording = Uint8Array.from(model.exact.map((e, j) => {
    if (!(e && model.measured[j])) return CONTINUOUS;
    const sd = Math.sqrt(model.sigmaT.comparison[j]?.[j] as number);
    return isIndicator(model.mean.programme[j] as number, model.mean.comparison[j] as number, sd) ? INDICATOR : WHOLE_NUMBERS;
  }));
  // An indicator is 1 when its normal draw N(mean_g, sd²) exceeds mean_g + sd Φ^-1(1 − mean_g), i.e. with probability mean_g.
  const threshold = (g: 'programme' | 'comparison') =>
    Float64Array.from(model.mean[g], (m, j) => {
      if (recording[j] !== INDICATOR) return 0;
      const sd = Math.sqrt(model.sigmaT[g][j]?.[j] as number);
      if (m <= 0) return Infinity;
      if (m >= 1) return -Infinity;
      return m + sd * normalQuantile(1 - m);
    });
  return {
    nProgramme: nP,
    nComparison: nC,
    size,
    variables: p,
    observed: Array.from({ length: p }, () => new Float64Array(size)),
    trueScore: Array.from({ length: p }, () => new Float64Array(size)),
    outcome: new Float64Array(size),
    normals: new Float64Array(size * stride),
    stride,
    choleskyProgramme: chol(model.sigmaT.programme, 'programme'),
    choleskyComparison: chol(model.sigmaT.comparison, 'comparison'),
    meanProgramme: Float64Array.from(model.mean.programme),
    meanComparison: Float64Array.from(model.mean.comparison),
    sem: Float64Array.from(model.sem),
    errorVariables,
    errorSlot: Int32Array.from(model.sem, (_, j) => errorVariables.indexOf(j)),
    recording,
    thresholdProgramme: threshold('programme'),
    thresholdComparison: threshold('comparison'),
    beta: Float64Array.from(model.beta),
    residualSD: model.residualSD,
    programmeShift: model.growthGap + model.effect,
  };
}

/**
 * Draw one replication's pools from the several-covariate model
 * (docs/simulation.md, "Several covariates"): for each person, true scores
 * T = mean_g + L_g z (L_g the Cholesky factor of the group's true-score
 * covariance; Gentle 2003, "Random Number Generation and Monte Carlo
 * Methods", sec. 5.3.1, the standard construction of multivariate normal
 * variates), observed X_j = T_j + sem_j z', outcome
 * Y = [P](growthGap + tau) + beta'T + residualSD z''.
 *
 * A variable matched exactly is recorded in categories, and the category is
 * its true value (the outcome depends on it): a 0/1 indicator (isIndicator:
 * group means in [0, 1], SD ≤ 0.5) is 1 when its normal draw exceeds the
 * group's threshold mean_g + sd Φ^-1(1 − mean_g), so each group keeps its
 * proportion mean_g (a liability-threshold model); any other exact variable
 * is the draw rounded to the nearest whole number (age in years, a band
 * number). Its correlations with the rest follow from the normal draw. The
 * closed forms treat it as continuous: they agree closely when the SD spans
 * several categories, only roughly for an indicator (docs/simulation.md).
 *
 * The replication's normal variates are drawn in one go, in a fixed layout:
 * comparison members first, then programme members; per person `stride`
 * variates: one per variable for the true scores, one per error-prone
 * variable, one for the outcome residual. So the numbers depend only on the
 * sampler's stream (replication i's own stream in the engine).
 *
 * @param pools buffers from createCovariatePools; overwritten.
 * @param normal a standard normal sampler on the replication's stream.
 * @returns nothing (fills pools.observed, pools.trueScore, pools.outcome).
 * @throws never.
 * @example
 *   // With sigmaT = [[64]], sem [6], mean 50: observed pretest ~ N(50, 100) (64 + 36).
 */
export function drawCovariatePools(pools: CovariatePools, normal: NormalSampler): void {
  const { nComparison: nC, size, variables: p, stride, observed, trueScore, outcome, normals: z } = pools;
  const { sem, errorSlot, recording, beta, residualSD } = pools;
  normal.fillStandard(z, z.length);
  // Variable by variable over each group's rows (drawVariable): the true score
  // T_a = mean_a + L[a, 0] z_0 + … + L[a, a] z_a (terms added in that order) in one
  // sweep, its recording, the outcome's term, the observed value (with its error,
  // when it has one); the outcome is Y = shift + residualSD z'' + beta_0 T_0 + beta_1 T_1 + …,
  // accumulated in that order. Every kept double takes the same operations in the
  // same order as a person-by-person draw (and as the earlier term-by-term sweeps).
  for (let g = 0; g < 2; g++) {
    const programme = g === 1;
    const from = programme ? nC : 0;
    const to = programme ? size : nC;
    const L = programme ? pools.choleskyProgramme : pools.choleskyComparison;
    const mu = programme ? pools.meanProgramme : pools.meanComparison;
    const shift = programme ? pools.programmeShift : 0;
    const cut = programme ? pools.thresholdProgramme : pools.thresholdComparison;
    for (let i = from, at = from * stride + stride - 1; i < to; i++, at += stride) outcome[i] = shift + residualSD * (z[at] as number);
    for (let a = 0; a < p; a++) {
      const e = errorSlot[a] as number;
      drawVariable(
        trueScore[a] as Float64Array,
        observed[a] as Float64Array,
        outcome,
        z,
        from,
        to,
        stride,
        mu[a] as number,
        L,
        a * p,
        a + 1,
        recording[a] as number,
        cut[a] as number,
        beta[a] as number,
        e >= 0 ? p + e : -1,
        e >= 0 ? (sem[a] as number) : 0,
      );
    }
  }
}

/**
 * One variable over rows [from, to) (drawCovariatePools): T from its `terms`
 * normal variates (one loop per number of terms up to six, the general loop
 * beyond), then its recording, outcome += beta T, and O = T, or T + sem z_err
 * recorded (errorAt ≥ 0: the error variate's position in a person's block).
 * Short loops with no choice inside them run about twice as fast as one loop
 * doing all of it.
 */
function drawVariable(
  T: Float64Array,
  O: Float64Array,
  outcome: Float64Array,
  z: Float64Array,
  from: number,
  to: number,
  stride: number,
  m: number,
  L: Float64Array,
  row: number,
  terms: number,
  rec: number,
  threshold: number,
  ba: number,
  errorAt: number,
  s: number,
): void {
  const l0 = L[row] as number;
  const l1 = terms > 1 ? (L[row + 1] as number) : 0;
  const l2 = terms > 2 ? (L[row + 2] as number) : 0;
  const l3 = terms > 3 ? (L[row + 3] as number) : 0;
  const l4 = terms > 4 ? (L[row + 4] as number) : 0;
  const l5 = terms > 5 ? (L[row + 5] as number) : 0;
  const start = from * stride;
  if (rec === CONTINUOUS && errorAt >= 0 && terms <= 5) {
    // The common case (a fallible score of up to five terms): everything in one loop.
    fallibleScore(T, O, outcome, z, from, to, stride, m, l0, l1, l2, l3, l4, terms, ba, errorAt, s);
    return;
  }
  // T = m + l0 z0 + l1 z1 + … (added left to right, as the general loop does).
  if (terms === 1) for (let i = from, at = start; i < to; i++, at += stride) T[i] = m + l0 * (z[at] as number);
  else if (terms === 2) for (let i = from, at = start; i < to; i++, at += stride) T[i] = m + l0 * (z[at] as number) + l1 * (z[at + 1] as number);
  else if (terms === 3) {
    for (let i = from, at = start; i < to; i++, at += stride) T[i] = m + l0 * (z[at] as number) + l1 * (z[at + 1] as number) + l2 * (z[at + 2] as number);
  } else if (terms === 4) {
    for (let i = from, at = start; i < to; i++, at += stride) {
      T[i] = m + l0 * (z[at] as number) + l1 * (z[at + 1] as number) + l2 * (z[at + 2] as number) + l3 * (z[at + 3] as number);
    }
  } else if (terms === 5) {
    for (let i = from, at = start; i < to; i++, at += stride) {
      T[i] = m + l0 * (z[at] as number) + l1 * (z[at + 1] as number) + l2 * (z[at + 2] as number) + l3 * (z[at + 3] as number) + l4 * (z[at + 4] as number);
    }
  } else if (terms === 6) {
    for (let i = from, at = start; i < to; i++, at += stride) {
      T[i] = m + l0 * (z[at] as number) + l1 * (z[at + 1] as number) + l2 * (z[at + 2] as number) + l3 * (z[at + 3] as number) + l4 * (z[at + 4] as number) + l5 * (z[at + 5] as number);
    }
  } else {
    for (let i = from, at = start; i < to; i++, at += stride) {
      let t = m;
      for (let b = 0; b < terms; b++) t += (L[row + b] as number) * (z[at + b] as number);
      T[i] = t;
    }
  }
  if (rec === WHOLE_NUMBERS) for (let i = from; i < to; i++) T[i] = Math.round(T[i] as number);
  else if (rec === INDICATOR) for (let i = from; i < to; i++) T[i] = (T[i] as number) > threshold ? 1 : 0;
  if (errorAt >= 0 && rec === CONTINUOUS) {
    // The common case (a fallible score) in one loop: the outcome's term and the observed value.
    for (let i = from, at = start + errorAt; i < to; i++, at += stride) {
      const t = T[i] as number;
      outcome[i] = (outcome[i] as number) + ba * t;
      O[i] = t + s * (z[at] as number);
    }
    return;
  }
  for (let i = from; i < to; i++) outcome[i] = (outcome[i] as number) + ba * (T[i] as number);
  if (errorAt < 0) O.set(T.subarray(from, to), from);
  else {
    for (let i = from, at = start + errorAt; i < to; i++, at += stride) {
      const x = (T[i] as number) + s * (z[at] as number);
      O[i] = rec === WHOLE_NUMBERS ? Math.round(x) : x > 0.5 ? 1 : 0;
    }
  }
}

/**
 * drawVariable for a continuous variable measured with error and up to five terms, in one loop per
 * number of terms: T = m + l0 z0 + … (left to right), outcome += beta T, O = T + sem z_err; the
 * same operations as the separate loops.
 */
function fallibleScore(
  T: Float64Array,
  O: Float64Array,
  outcome: Float64Array,
  z: Float64Array,
  from: number,
  to: number,
  stride: number,
  m: number,
  l0: number,
  l1: number,
  l2: number,
  l3: number,
  l4: number,
  terms: number,
  ba: number,
  errorAt: number,
  s: number,
): void {
  const start = from * stride;
  if (terms === 1) {
    for (let i = from, at = start; i < to; i++, at += stride) {
      const t = m + l0 * (z[at] as number);
      T[i] = t;
      outcome[i] = (outcome[i] as number) + ba * t;
      O[i] = t + s * (z[at + errorAt] as number);
    }
  } else if (terms === 2) {
    for (let i = from, at = start; i < to; i++, at += stride) {
      const t = m + l0 * (z[at] as number) + l1 * (z[at + 1] as number);
      T[i] = t;
      outcome[i] = (outcome[i] as number) + ba * t;
      O[i] = t + s * (z[at + errorAt] as number);
    }
  } else if (terms === 3) {
    for (let i = from, at = start; i < to; i++, at += stride) {
      const t = m + l0 * (z[at] as number) + l1 * (z[at + 1] as number) + l2 * (z[at + 2] as number);
      T[i] = t;
      outcome[i] = (outcome[i] as number) + ba * t;
      O[i] = t + s * (z[at + errorAt] as number);
    }
  } else if (terms === 4) {
    for (let i = from, at = start; i < to; i++, at += stride) {
      const t = m + l0 * (z[at] as number) + l1 * (z[at + 1] as number) + l2 * (z[at + 2] as number) + l3 * (z[at + 3] as number);
      T[i] = t;
      outcome[i] = (outcome[i] as number) + ba * t;
      O[i] = t + s * (z[at + errorAt] as number);
    }
  } else {
    for (let i = from, at = start; i < to; i++, at += stride) {
      const t = m + l0 * (z[at] as number) + l1 * (z[at + 1] as number) + l2 * (z[at + 2] as number) + l3 * (z[at + 3] as number) + l4 * (z[at + 4] as number);
      T[i] = t;
      outcome[i] = (outcome[i] as number) + ba * t;
      O[i] = t + s * (z[at + errorAt] as number);
    }
  }
}
