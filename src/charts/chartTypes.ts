import type { AnalysisId } from '../core/plan';

/** The four linked charts. */
export type ChartId = 'pretest' | 'estimates' | 'sensitivity' | 'balance';

/**
 * Every chart renderChart / renderChartToSvgString / chartSize can draw: the
 * four linked charts and the design explorer's chart (drawn by the explorer
 * panel and the PDF; not linked to the others, so ChartId stays the four).
 */
export type DrawableChartId = ChartId | 'explorer';

/** Size of a drawn chart in CSS pixels (also the SVG viewBox). */
export interface ChartSize {
  width: number;
  height: number;
}

/** What every render takes besides its data. */
export interface RenderOptions extends ChartSize {
  /** The analysis emphasised in every chart; null = none (all drawn normally). */
  highlight: AnalysisId | null;
  /** Called when the user hovers or focuses a series or legend item (null on leave/blur). */
  onHighlight?: (id: AnalysisId | null) => void;
}

/** A table for screen readers and the PDF: header row plus body rows, all plain text. */
export interface TextTable {
  caption: string;
  columns: string[];
  rows: string[][];
}

/** Text alternative to a chart: sentences to read in order, plus a table of the plotted values. */
export interface ChartText {
  title: string;
  sentences: string[];
  table: TextTable;
}

/** What every chart transform reads: the plan, its closed-form results, and (optionally) a simulation. */
export interface ChartInput {
  plan: import('../core/plan').Plan;
  analytic: import('../core/analyticResults').AnalyticResults;
  /** Present once a simulation of this plan has run; charts get richer with it. */
  simulation?: import('../sim/types').SimulationResult | null;
}
