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
  /** Monte Carlo SEs of the simulated figures. */
  mcse: { observedAfter: number; trueAfter: number; varianceRatio: number | null };
}

/** Plain data for the per-covariate balance chart. */
export interface CovariateBalanceChartData {
  chart: 'covariateBalance';
  title: string;
  xLabel: string;
  source: 'simulation';
  replications: number;
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

/** Whether the per-covariate chart applies: the simulation reports balance per covariate. */
export function hasCovariateBalance(input: ChartInput): boolean {
  return Boolean(input.simulation?.balance && input.simulation.balance.length > 0);
}

/**
 * Transform a simulation's per-covariate balance into the chart's data:
 * for the pretest and every covariate (measured or not), the observed SMD
 * before and after matching, the true-score SMD after matching, and the
 * observed variance ratio after matching flagged when outside 0.5–2. Every
 * figure is the engine's (src/sim); nothing is computed here beyond the
 * flag and the axis range. Pure and deterministic.
 *
 * @throws Error when the simulation carries no per-covariate balance, or a
 *   figure is not a finite number (no matched sets).
 */
export function covariateBalanceChartData({ simulation }: ChartInput): CovariateBalanceChartData {
  const balance = simulation?.balance;
  if (!simulation || !balance || balance.length === 0) {
    throw new Error('Balance per covariate comes from the simulation: run it to see this chart.');
  }
  const [lo, hi] = VARIANCE_RATIO_RANGE;
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
      varianceRatioOutside: vr !== null && (vr < lo || vr > hi),
      mcse: {
        observedAfter: b.observedSMDAfterMCSE,
        trueAfter: b.trueSMDAfterMCSE,
        varianceRatio: vr === null || !Number.isFinite(b.varianceRatioAfterMCSE) ? null : b.varianceRatioAfterMCSE,
      },
    };
  });
  const largest = Math.max(0.3, ...rows.flatMap((r) => [Math.abs(r.observedBefore), Math.abs(r.observedAfter), Math.abs(r.trueAfter)]));
  return {
    chart: 'covariateBalance',
    title: 'Balance on each covariate: observed after matching, and on the true scores',
    xLabel: 'Absolute standardised mean difference (pooled SD units)',
    source: 'simulation',
    replications: simulation.replications,
    rows,
    thresholds: SMD_THRESHOLDS,
    varianceRatioRange: VARIANCE_RATIO_RANGE,
    xMax: Math.ceil(largest * 10 * 1.05) / 10,
  };
}
