import { expectedBalance } from '../core/expectedBalance';
import type { ChartInput } from './chartTypes';

/** One measure's balance before and after matching (SMD, programme minus comparison, pooled SD). */
export interface BalanceRow {
  measure: 'observed' | 'trueScore';
  label: string;
  before: number;
  after: number;
}

/** Plain data for the "Balance" chart. */
export interface BalanceChartData {
  chart: 'balance';
  title: string;
  xLabel: string;
  source: 'closed-form' | 'simulation';
  rows: [BalanceRow, BalanceRow];
  /** SMD thresholds drawn as reference lines (Stuart 2010; Austin 2009: 0.1 strict, 0.25 lenient). */
  thresholds: [number, number];
  /** Axis maximum for |SMD|. */
  xMax: number;
}

/**
 * Transform plan + results into the balance chart's data: observed-pretest
 * and true-score SMDs before and after matching, from the simulation's
 * matching summary or, before a simulation, from core's closed form
 * (exact matching). Pure and deterministic.
 */
export function balanceChartData({ analytic, simulation }: ChartInput): BalanceChartData {
  const b = simulation
    ? {
        observedSMDBefore: simulation.matching.observedSMDBefore,
        observedSMDAfter: simulation.matching.observedSMDAfter,
        trueSMDBefore: simulation.matching.trueSMDBefore,
        trueSMDAfter: simulation.matching.trueSMDAfter,
      }
    : expectedBalance(analytic.model);
  const rows: [BalanceRow, BalanceRow] = [
    { measure: 'observed', label: 'Observed pretest', before: b.observedSMDBefore, after: b.observedSMDAfter },
    { measure: 'trueScore', label: 'True score (hidden)', before: b.trueSMDBefore, after: b.trueSMDAfter },
  ];
  for (const r of rows) {
    if (!Number.isFinite(r.before) || !Number.isFinite(r.after)) {
      throw new Error(`The balance of the ${r.label.toLowerCase()} could not be computed (no matched pairs?).`);
    }
  }
  const largest = Math.max(0.3, ...rows.flatMap((r) => [Math.abs(r.before), Math.abs(r.after)]));
  return {
    chart: 'balance',
    title: 'Balance: looks balanced on the observed pretest, is not on the true score',
    xLabel: 'Absolute standardised mean difference (pooled SD units)',
    source: simulation ? 'simulation' : 'closed-form',
    rows,
    thresholds: [0.1, 0.25],
    xMax: Math.ceil(largest * 10 * 1.05) / 10,
  };
}
