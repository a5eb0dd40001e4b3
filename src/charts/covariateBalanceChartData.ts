import type { ExpectedCovariateBalance } from '../core/multivariate/expectedCovariateBalance';
import type { CovariateBalance } from '../sim/types';
import type { ChartInput } from './chartTypes';

/**
 * What a variable's balance after matching amounts to, in plain words:
 * - 'hidden': looks balanced as measured (|observed SMD| < 0.1) but is not on the true scores;
 * - 'balanced': within 0.1 as measured and on the true scores;
 * - 'apart': still 0.1 or more apart as measured;
 * - 'unmeasured': never measured, so matching cannot reach it.
 */
export type CovariateBalanceStatus = 'hidden' | 'balanced' | 'apart' | 'unmeasured';

/** One variable's balance before and after matching (SMDs: programme minus comparison, pooled SD). */
export interface CovariateBalanceRow {
  /** "Pretest" or the covariate's name. */
  name: string;
  measured: boolean;
  exact: boolean;
  observedBefore: number;
  observedAfter: number;
  trueBefore: number;
  /** The hidden imbalance: true-score SMD in the matched sample. */
  trueAfter: number;
  /** Observed variance ratio (programme / comparison) after matching; null when not available. */
  varianceRatio: number | null;
  /** Whether the variance ratio falls outside the acceptable range (Rubin 2001). */
  varianceRatioOutside: boolean;
  status: CovariateBalanceStatus;
  /** Monte Carlo SEs of the simulated figures; null for closed-form figures. */
  mcse: { observedAfter: number; trueAfter: number; varianceRatio: number | null } | null;
}

/** Plain data for the per-covariate balance chart ("as measured" beside "underneath", per variable). */
export interface CovariateBalanceChartData {
  chart: 'covariateBalance';
  title: string;
  xLabel: string;
  source: 'closed-form' | 'simulation';
  /** Simulated studies the figures average over; null for closed-form figures. */
  replications: number | null;
  rows: CovariateBalanceRow[];
  /** SMD conventions named in the text: below 0.1 strict, below 0.25 lenient (Normand et al. 2001; Austin 2009; Rubin 2001; Stuart 2010). */
  thresholds: [number, number];
  /** Acceptable variance-ratio range (Rubin 2001; Stuart 2010). */
  varianceRatioRange: [number, number];
  /** Signed axis range for the SMDs (programme minus comparison): round tenths, always containing −0.2 to 0.2. */
  xMin: number;
  xMax: number;
}

/** SMD conventions (common practice: Normand et al. 2001, Austin 2009 for 0.1; Rubin 2001, Stuart 2010 for 0.25). */
export const SMD_THRESHOLDS: [number, number] = [0.1, 0.25];
/** Variance ratios outside this range flag poor balance (Rubin 2001; Stuart 2010). */
export const VARIANCE_RATIO_RANGE: [number, number] = [0.5, 2];

/** Whether a variance ratio falls outside VARIANCE_RATIO_RANGE (false when it is null or not a finite number). */
export function isVarianceRatioOutside(vr: number | null): boolean {
  const [lo, hi] = VARIANCE_RATIO_RANGE;
  return vr !== null && Number.isFinite(vr) && (vr < lo || vr > hi);
}

/**
 * The row's status from its figures after matching, on the strict 0.1
 * convention (common practice: Austin 2009). An unmeasured variable is
 * 'unmeasured' whatever its figures.
 */
export function covariateBalanceStatus(r: Pick<CovariateBalanceRow, 'measured' | 'observedAfter' | 'trueAfter'>): CovariateBalanceStatus {
  const [strict] = SMD_THRESHOLDS;
  if (!r.measured) return 'unmeasured';
  if (Math.abs(r.observedAfter) >= strict) return 'apart';
  return Math.abs(r.trueAfter) >= strict ? 'hidden' : 'balanced';
}

/** Whether the per-covariate chart applies: the simulation or the closed form reports balance per covariate. */
export function hasCovariateBalance(input: ChartInput): boolean {
  return Boolean((input.simulation?.balance?.length ?? 0) > 0 || (input.analytic.covariateBalance?.length ?? 0) > 0);
}

/**
 * The figures one row needs, from either source: src/core's closed-form
 * ExpectedCovariateBalance, or src/sim's CovariateBalance (the same fields
 * plus their Monte Carlo SEs).
 */
type BalanceFigures = ExpectedCovariateBalance &
  Partial<Pick<CovariateBalance, 'observedSMDAfterMCSE' | 'trueSMDAfterMCSE' | 'varianceRatioAfterMCSE'>>;

/**
 * Transform per-covariate balance into the chart's data: for the pretest and
 * every covariate (measured or not), the observed and the true-score SMD
 * before and after matching, the observed variance ratio after matching
 * (flagged when outside 0.5–2) and the row's status. The figures are the
 * simulation's (src/sim, means over replications with Monte Carlo SEs) when
 * a run of this plan carries them, else core's closed form (exact matching
 * from an unlimited pool). Nothing is computed here beyond the flags and the
 * axis range. Pure and deterministic.
 *
 * @throws Error when neither source has per-covariate balance, or a figure
 *   is not a finite number (no matched sets).
 */
export function covariateBalanceChartData({ analytic, simulation }: ChartInput): CovariateBalanceChartData {
  const simulated = simulation?.balance && simulation.balance.length > 0 ? simulation.balance : null;
  const balance: readonly BalanceFigures[] | undefined = simulated ?? analytic.covariateBalance;
  if (!balance || balance.length === 0) {
    throw new Error('This plan has no balance per covariate (it matches on the pretest alone and lists no covariates).');
  }
  const rows: CovariateBalanceRow[] = balance.map((b) => {
    for (const [label, v] of [
      ['observed SMD before matching', b.observedSMDBefore],
      ['observed SMD after matching', b.observedSMDAfter],
      ['true-score SMD before matching', b.trueSMDBefore],
      ['true-score SMD after matching', b.trueSMDAfter],
    ] as const) {
      if (!Number.isFinite(v)) throw new Error(`The ${label} of ${b.name} could not be computed (no matched sets?).`);
    }
    const vr = Number.isFinite(b.varianceRatioAfter) ? b.varianceRatioAfter : null;
    const figures = { measured: b.measured, observedAfter: b.observedSMDAfter, trueAfter: b.trueSMDAfter };
    return {
      name: b.name,
      measured: b.measured,
      exact: b.exact,
      observedBefore: b.observedSMDBefore,
      observedAfter: b.observedSMDAfter,
      trueBefore: b.trueSMDBefore,
      trueAfter: b.trueSMDAfter,
      varianceRatio: vr,
      varianceRatioOutside: isVarianceRatioOutside(vr),
      status: covariateBalanceStatus(figures),
      mcse: simulated
        ? {
            observedAfter: b.observedSMDAfterMCSE ?? NaN,
            trueAfter: b.trueSMDAfterMCSE ?? NaN,
            varianceRatio: vr === null || !Number.isFinite(b.varianceRatioAfterMCSE) ? null : (b.varianceRatioAfterMCSE as number),
          }
        : null,
    };
  });
  const values = rows.flatMap((r) => [r.observedBefore, r.observedAfter, r.trueBefore, r.trueAfter]);
  // Round outwards to tenths with 5% headroom; the ±0.1 "looks balanced" band always shows with room around it.
  const out = (v: number) => Math.ceil(v * 10 * 1.05 - 1e-9) / 10;
  return {
    chart: 'covariateBalance',
    title: 'Balance on each covariate: as measured, and underneath on the true scores',
    xLabel: 'Standardised mean difference, programme minus comparison (pooled SD units)',
    source: simulated ? 'simulation' : 'closed-form',
    replications: simulated && simulation ? simulation.replications : null,
    rows,
    thresholds: SMD_THRESHOLDS,
    varianceRatioRange: VARIANCE_RATIO_RANGE,
    xMin: -out(Math.max(0.2, ...values.map((v) => -v))),
    xMax: out(Math.max(0.2, ...values)),
  };
}
