import type { AnalysisId } from '../core/plan';

/** Marker shapes drawn beside each analysis, so colour is never the only cue. */
export type MarkerShape = 'circle' | 'square' | 'triangle' | 'diamond';

/** How one analysis is drawn in every chart, the on-screen tables and the PDF. */
export interface AnalysisStyle {
  /** Stroke and fill colour (hex). */
  colour: string;
  /** A paler tint of the same hue for fills behind text (hex). */
  tint: string;
  /** SVG stroke-dasharray ('' = solid line). */
  dash: string;
  /** Marker drawn at points and in legends. */
  marker: MarkerShape;
  /** Short label for legends (our own words). */
  shortLabel: string;
}

/**
 * Meanward's analysis palette. The four two-group hues differ in lightness as well as
 * hue (rust, blue, ochre, plum), so they stay apart under the common forms of
 * colour-vision deficiency and in greyscale print; each also has its own dash
 * pattern and marker shape. UI and report code reuse this object so an
 * analysis looks the same everywhere.
 */
export const ANALYSIS_STYLES: Record<AnalysisId, AnalysisStyle> = {
  matchedDifference: { colour: '#b5401a', tint: '#f3d9cf', dash: '', marker: 'circle', shortLabel: 'Matched difference' },
  ancova: { colour: '#1f5c9e', tint: '#d3e1f1', dash: '7 3', marker: 'square', shortLabel: 'ANCOVA' },
  gainScore: { colour: '#8a6a00', tint: '#efe3bf', dash: '2 3', marker: 'triangle', shortLabel: 'Gain score' },
  correctedAncova: { colour: '#6a3d8f', tint: '#e3d6ee', dash: '9 3 2 3', marker: 'diamond', shortLabel: 'Corrected ANCOVA' },
  // Only with a selection rule on an observed basis; a dark green apart from the groups' teal.
  regressionDiscontinuity: { colour: '#3b6e1e', tint: '#dbe9d0', dash: '4 2 1 2', marker: 'square', shortLabel: 'Regression discontinuity' },
  // Only in a one-group study (it is then the only analysis).
  prePostChange: { colour: '#b5401a', tint: '#f3d9cf', dash: '', marker: 'circle', shortLabel: 'Pre–post change' },
  // Only with clusters (where the corrected ANCOVA is not offered): a wine red apart from the rust.
  personLevelAncova: { colour: '#7a2f5a', tint: '#ead3df', dash: '5 2', marker: 'diamond', shortLabel: 'Person-level ANCOVA' },
};

/**
 * Colours for the two groups and for reference marks. Groups use teal and
 * dark grey (with solid vs dashed lines) so they are not mistaken for analyses.
 */
export const GROUP_COLOURS = {
  programme: '#0b6e69',
  comparison: '#4d4d4d',
  reference: '#333333',
  band: '#cfe8d4',
  region: '#ececec',
  threshold: '#777777',
  muted: '#555555',
} as const;

/** Opacity for series that are not the highlighted analysis. */
export const DIMMED_OPACITY = 0.22;

/** The one font family charts use (svg2pdf.js knows only the standard PDF fonts). */
export const CHART_FONT = 'sans-serif';

/**
 * The design explorer's heat map: a diverging scale centred on no artefact
 * (off-white), toward rust where the artefact pulls the estimate below the
 * hoped-for effect and toward blue where it pushes it above (the matched
 * difference's and ANCOVA's hues, darkened at the ends so the two sides differ
 * in lightness as well), the tolerable region's outline, and the marks of
 * cells not simulated yet or impossible.
 */
export const EXPLORER_COLOURS = {
  below: '#8f2f0f',
  zero: '#f7f5ef',
  above: '#17467a',
  tolerable: '#1d5a2a',
  pending: '#b9b9b9',
  impossible: '#7a7a7a',
  selected: '#111111',
  closedForm: '#333333',
} as const;
