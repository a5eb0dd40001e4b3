import type { AnalysisId } from '../core/plan';
import type { ExploreCellSummary, ExploreResult } from '../core/explore/exploreTypes';
import { analysePlan } from '../core/analysePlan';
import { exploreInputWords } from '../core/explore/exploreInputs';
import { formatExploreValue } from '../core/explore/exploreCells';
import { ANALYSIS_STYLES } from './palette';

/** One axis of the explorer chart: the input's label with its unit, its values and their labels. */
export interface ExplorerChartAxis {
  label: string;
  shortLabel: string;
  values: number[];
  valueLabels: string[];
}

/** One cell as the chart draws it (every figure copied from the core's cell summary). */
export interface ExplorerChartCell {
  index: number;
  /** Position: row = index along axis 0, col = index along axis 1 (0 with one axis). */
  row: number;
  col: number;
  values: number[];
  /** "reliability 0.80, caliper 0.20". */
  where: string;
  status: ExploreCellSummary['status'];
  share: number | null;
  shareMCSE: number | null;
  closedFormShare: number | null;
  discardedShare: number | null;
  power: number | null;
  powerMCSE: number | null;
  /** Share significant in the wrong direction (part of power). */
  wrongSign: number | null;
  tolerable: boolean | null;
  /** The impossible variant's problem, or the failure, in plain words. */
  note: string | null;
}

/** Everything the explorer chart and its text alternative draw. */
export interface ExplorerChartData {
  title: string;
  /** Two inputs: a heat map; one: curves. */
  mode: 'heatmap' | 'curves';
  analysisId: AnalysisId;
  analysisLabel: string;
  /** The plan's tolerable share of the effect (the band and the outline). */
  tolerableShare: number;
  /** The hoped-for effect in posttest points (analysePlan's tau; 0 if the base plan's figures cannot be computed). */
  tau: number;
  axes: ExplorerChartAxis[];
  cells: ExplorerChartCell[];
  /** Half-width of the colour scale (shares), symmetric about 0: the largest |share| done, at least twice the tolerable share. */
  colourExtent: number;
  /** The curves' vertical range (shares): simulated ± 2 MC SE, closed forms and the tolerable band. */
  yDomain: [number, number];
  counts: { done: number; pending: number; impossible: number; failed: number; total: number };
  replications: number;
}

/**
 * The explorer chart's data from an exploration: axes with their values, each
 * cell's figures as the core summarised them (simulated share with its MC SE,
 * closed form, discarded share, power, tolerable), and the scales' extents.
 * Reference: none (a layout of core and sim figures; nothing is computed here).
 * @param result an ExploreResult (cells in any state). @returns the chart data. @throws never.
 */
export function explorerChartData(result: ExploreResult): ExplorerChartData {
  const { spec, plan } = result;
  const axes = spec.axes.map((axis, k) => {
    const words = exploreInputWords(axis.input);
    const seen: number[] = [];
    for (const c of result.cells) if (!seen.includes(c.values[k]!)) seen.push(c.values[k]!);
    return {
      label: words.unit === '' ? words.label : `${words.label} (${words.unit})`,
      shortLabel: words.shortLabel,
      values: seen,
      valueLabels: seen.map(formatExploreValue),
    };
  });
  const cells: ExplorerChartCell[] = result.cells.map((c) => {
    const row = axes[0]!.values.indexOf(c.values[0]!);
    const col = axes.length > 1 ? axes[1]!.values.indexOf(c.values[1]!) : 0;
    const done = c.status === 'done';
    return {
      index: c.index,
      row,
      col,
      values: c.values,
      where: axes.map((a, k) => `${a.shortLabel} ${a.valueLabels[k === 0 ? row : col]}`).join(', '),
      status: c.status,
      share: done && c.artefactShare !== undefined ? c.artefactShare : null,
      shareMCSE: done && c.artefactShareMCSE !== undefined ? c.artefactShareMCSE : null,
      closedFormShare: c.closedFormShare ?? null,
      discardedShare: done && c.discardedShare !== undefined ? c.discardedShare : null,
      power: done && c.power !== undefined ? c.power : null,
      powerMCSE: done && c.powerMCSE !== undefined ? c.powerMCSE : null,
      wrongSign: done && c.wrongSignRate !== undefined ? c.wrongSignRate : null,
      tolerable: done && c.tolerable !== undefined ? c.tolerable : null,
      note: c.status === 'impossible' ? (c.problem ?? 'This variant is not a valid plan.') : c.status === 'failed' ? (c.failure ?? 'The simulation failed.') : null,
    };
  });
  const tol = plan.analysis.tolerableBiasShare;
  const shares = cells.flatMap((c) => (c.share === null ? [] : [c.share]));
  const colourExtent = Math.max(2 * tol, 0.05, ...shares.map(Math.abs));
  const ys = [
    tol,
    -tol,
    0,
    ...cells.flatMap((c) => (c.share === null ? [] : [c.share - 2 * (c.shareMCSE ?? 0), c.share + 2 * (c.shareMCSE ?? 0)])),
    ...cells.flatMap((c) => (c.closedFormShare === null ? [] : [c.closedFormShare])),
  ];
  const lo = Math.min(...ys);
  const hi = Math.max(...ys);
  const pad = (hi - lo) * 0.08 || 0.05;
  const count = (s: ExploreCellSummary['status']) => cells.filter((c) => c.status === s).length;
  const analytic = baseAnalysis(result);
  const analysisLabel = analytic?.analyses[spec.analysisId]?.name ?? ANALYSIS_STYLES[spec.analysisId].shortLabel;
  const varied = axes.map((a) => a.shortLabel).join(' and ');
  return {
    title: `Design explorer: simulated artefact of the ${inSentence(analysisLabel)} as ${varied} ${axes.length === 1 ? 'varies' : 'vary'}`,
    mode: axes.length === 2 ? 'heatmap' : 'curves',
    analysisId: spec.analysisId,
    analysisLabel,
    tolerableShare: tol,
    tau: analytic?.tau ?? 0,
    axes,
    cells,
    colourExtent,
    yDomain: [lo - pad, hi + pad],
    counts: { done: count('done'), pending: count('pending'), impossible: count('impossible'), failed: count('failed'), total: cells.length },
    replications: spec.replications,
  };
}

/**
 * The base plan's closed-form results (names and tau), or null when they cannot be computed.
 * Kept per plan object: while a grid fills in, every new chart data has the same base plan,
 * and analysePlan takes several ms (a plan object is never changed in place).
 */
function baseAnalysis(result: ExploreResult): ReturnType<typeof analysePlan> | null {
  const kept = baseAnalyses.get(result.plan);
  if (kept !== undefined) return kept;
  let analytic: ReturnType<typeof analysePlan> | null;
  try {
    analytic = analysePlan(result.plan);
  } catch {
    analytic = null;
  }
  baseAnalyses.set(result.plan, analytic);
  return analytic;
}
const baseAnalyses = new WeakMap<object, ReturnType<typeof analysePlan> | null>();

/** An analysis name inside a sentence: its first letter lower-cased unless it starts an acronym ("ANCOVA …" stays). */
export function inSentence(name: string): string {
  return name.length > 1 && name[1] === name[1]!.toLowerCase() ? name[0]!.toLowerCase() + name.slice(1) : name;
}
