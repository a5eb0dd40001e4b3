import type { ExpectedCovariateBalance } from '../core/multivariate/expectedCovariateBalance';
import type { CovariateBalance } from '../sim/types';
import type { ChartInput } from './chartTypes';

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
  /** Monte Carlo SEs of the simulated figures; null for closed-form figures. */
  mcse: { observedAfter: number; trueAfter: number; varianceRatio: number | null } | null;
}

/** Plain data for the per-covariate balance chart. */
export interface CovariateBalanceChartData {
  chart: 'covariateBalance';
  title: string;
  xLabel: string;
  source: 'closed-form' | 'simulation';
  /** Simulated studies the figures average over; null for closed-form figures. */
  replications: number | null;
  rows: CovariateBalanceRow[];
  /** SMD reference lines: 0.1 strict, 0.25 lenient (Normand et al. 2001; Austin 2009; Rubin 2001; Stuart 2010). */
  thresholds: [number, number];
  /** Acceptable variance-ratio range (Rubin 2001; Stuart 2010). */
  varianceRatioRange: [number, number];
  /** Axis maximum for |SMD| (a round number at least 0.3). */
  xMax: number;
}

/** SMD reference lines (common practice: Normand et al. 2001, Austin 2009 for 0.1; Rubin 2001, Stuart 2010 for 0.25). */
export const SMD_THRESHOLDS: [number, number] = [0.1, 0.25];
/** Variance ratios outside this range flag poor balance (Rubin 2001; Stuart 2010). */
export const VARIANCE_RATIO_RANGE: [number, number] = [0.5, 2];

/** Whether a variance ratio falls outside VARIANCE_RATIO_RANGE (false when it is null or not a finite number). */
export function isVarianceRatioOutside(vr: number | null): boolean {
  const [lo, hi] = VARIANCE_RATIO_RANGE;
  return vr !== null && Number.isFinite(vr) && (vr < lo || vr > hi);
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
 * every covariate (measured or not), the observed SMD before and after
 * matching, the true-score SMD after matching, and the observed variance
 * ratio after matching, flagged when outside 0.5–2. The figures are the
 * simulation's (src/sim, means over replications with Monte Carlo SEs) when
 * a run of this plan carries them, else core's closed form (exact matching
 * from an unlimited pool). Nothing is computed here beyond the flag and the
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
      ['true-score SMD after matching', b.trueSMDAfter],
    ] as const) {
      if (!Number.isFinite(v)) throw new Error(`The ${label} of ${b.name} could not be computed (no matched sets?).`);
    }
    const vr = Number.isFinite(b.varianceRatioAfter) ? b.varianceRatioAfter : null;
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
      mcse: simulated
        ? {
            observedAfter: b.observedSMDAfterMCSE ?? NaN,
            trueAfter: b.trueSMDAfterMCSE ?? NaN,
            varianceRatio: vr === null || !Number.isFinite(b.varianceRatioAfterMCSE) ? null : (b.varianceRatioAfterMCSE as number),
          }
        : null,
    };
  });
  const largest = Math.max(0.3, ...rows.flatMap((r) => [Math.abs(r.observedBefore), Math.abs(r.observedAfter), Math.abs(r.trueAfter)]));
  return {
    chart: 'covariateBalance',
    title: 'Balance on each covariate: observed after matching, and on the true scores',
    xLabel: 'Absolute standardised mean difference (pooled SD units)',
    source: simulated ? 'simulation' : 'closed-form',
    replications: simulated && simulation ? simulation.replications : null,
    rows,
    thresholds: SMD_THRESHOLDS,
    varianceRatioRange: VARIANCE_RATIO_RANGE,
    xMax: Math.ceil(largest * 10 * 1.05) / 10,
  };
}
