import { bin as histogramBins, extent, tickIncrement, ticks } from 'd3-array';
import type { AnalysisId } from '../core/plan';
import { presentAnalyses } from '../core/presentAnalyses';
import { expectedEstimateInterval } from '../core/expectedEstimateInterval';
import { isFeasible } from '../sim/types';
import type { ChartInput } from './chartTypes';

/** One histogram bin of per-replication estimates (posttest points). */
export interface EstimateBin {
  x0: number;
  x1: number;
  count: number;
}

/** One analysis' row in the estimates chart. */
export interface EstimatesRow {
  id: AnalysisId;
  name: string;
  /** Closed-form expected estimate, posttest points. */
  expected: number;
  /** Closed-form range expected ± 1.96·SE (95% of studies); null when the analysis is not feasible (no SE). */
  interval: { lower: number; upper: number } | null;
  /** Simulated estimates binned (null before a simulation). */
  bins: EstimateBin[] | null;
  /** Replications whose estimate was computed and is drawn. */
  drawn: number;
  /** Simulated mean estimate and its Monte Carlo SE (null before a simulation). */
  simulatedMean: number | null;
  simulatedMeanMCSE: number | null;
}

/** Plain data for the "Estimates across simulated studies" chart. */
export interface EstimatesChartData {
  chart: 'estimates';
  title: string;
  xLabel: string;
  mode: 'closed-form' | 'simulation';
  /** Hoped-for programme effect, posttest points. */
  tau: number;
  xDomain: [number, number];
  /** Largest bin count across analyses (for a shared count scale). */
  maxCount: number;
  replications: number | null;
  rows: EstimatesRow[];
}

/** Number of histogram bins aimed at across the shared range (d3 picks round edges near it). */
const BIN_TARGET = 36;

/**
 * Transform plan + results into the estimates chart's data: per analysis the
 * expected estimate shown before simulation (closed form, or the quick planned-procedure figure for the matched difference) with its 95% range, and once a simulation
 * exists a histogram of the per-replication estimates on shared bin edges.
 * Pure and deterministic.
 */
export function estimatesChartData({ analytic, simulation }: ChartInput): EstimatesChartData {
  const tau = analytic.tau;
  const rows: EstimatesRow[] = presentAnalyses(analytic.analyses).map(([id, a]) => {
    const iv = a.se === null ? null : expectedEstimateInterval(a.expectedEstimate, a.se);
    const s = simulation ? (simulation.analyses[id] ?? null) : null;
    const sim = s && isFeasible(s) ? s : null; // an infeasible analysis has no simulated mean
    return {
      id,
      name: a.name,
      expected: a.expectedEstimate,
      interval: iv && { lower: iv.lower, upper: iv.upper },
      bins: null,
      drawn: 0,
      simulatedMean: sim ? sim.meanEstimate : null,
      simulatedMeanMCSE: sim ? sim.meanEstimateMCSE : null,
    };
  });
  const values: number[] = [0, tau];
  for (const r of rows) values.push(r.expected, ...(r.interval ? [r.interval.lower, r.interval.upper] : []));
  let maxCount = 0;
  if (simulation) {
    const finite = Object.fromEntries(
      rows.map((r) => [r.id, (simulation.estimates[r.id] ?? []).filter((v) => Number.isFinite(v))]),
    ) as Record<AnalysisId, number[]>;
    for (const r of rows) {
      const ext = extent(finite[r.id]);
      if (ext[0] !== undefined) values.push(ext[0], ext[1]!);
    }
    const [lo, hi] = extent(values) as [number, number];
    const thresholds = ticks(lo, hi, BIN_TARGET);
    const step = tickIncrement(lo, hi, BIN_TARGET);
    // Edges run from one step below the smallest value to one above the largest, so every estimate lands in a bin.
    const width = step > 0 ? step : 1 / -step;
    const first = Math.floor(lo / width) * width;
    const last = Math.ceil(hi / width) * width + (Math.ceil(hi / width) * width === hi ? width : 0);
    const bin = histogramBins().domain([first, last]).thresholds(thresholds.filter((t) => t > first && t < last));
    for (const r of rows) {
      const bins = bin(finite[r.id]).map((b) => ({ x0: b.x0!, x1: b.x1!, count: b.length }));
      r.bins = bins;
      r.drawn = finite[r.id].length;
      for (const b of bins) maxCount = Math.max(maxCount, b.count);
    }
    values.push(first, last);
  }
  const [lo, hi] = extent(values) as [number, number];
  const pad = (hi - lo || 1) * 0.04;
  return {
    chart: 'estimates',
    title: simulation ? 'Estimates across simulated studies' : 'Where the estimates are expected to fall (before simulation)',
    xLabel: 'Estimated programme effect (posttest points)',
    mode: simulation ? 'simulation' : 'closed-form',
    tau,
    xDomain: [lo - (simulation ? 0 : pad), hi + (simulation ? 0 : pad)],
    maxCount,
    replications: simulation ? simulation.replications : null,
    rows,
  };
}
