import * as d3 from 'd3';
import type { ChartSize, RenderOptions } from './chartTypes';
import type { CovariateBalanceChartData } from './covariateBalanceChartData';
import { covariateBalanceChartText } from './covariateBalanceChartText';
import { ANALYSIS_STYLES, DIMMED_OPACITY, GROUP_COLOURS } from './palette';
import { FONT, add, axisBottom, fmt, linkSeries, markerPath, prepareSvg, text } from './svgHelpers';

const TOP = 96;
const BOTTOM = 56;
const ROW_H = 46;

/** Height that gives every variable its own row at a readable size (layout only). */
export function covariateBalanceChartHeight(data: CovariateBalanceChartData): number {
  return TOP + BOTTOM + ROW_H * data.rows.length;
}

/** Colours: observed values in the comparison grey, true scores in the matched-difference rust, flags in the warning brown. */
const OBSERVED = GROUP_COLOURS.comparison;
const TRUE_SCORE = ANALYSIS_STYLES.matchedDifference.colour;
const FLAG = '#8a3b12';

/**
 * Draw the per-covariate balance chart into `svg`: one row per variable
 * (pretest first), |SMD| of the observed values before (hollow circle) and
 * after matching (filled circle), and of the true scores after matching
 * (diamond), with reference lines at 0.1 and 0.25 and, at the right, the
 * variance ratio after matching, flagged when outside 0.5 to 2. Unmeasured
 * covariates are labelled so. Matching concerns the matched-difference
 * analysis, so that analysis' highlight emphasises this chart.
 */
export function renderCovariateBalanceChart(svg: SVGSVGElement, data: CovariateBalanceChartData, opts: RenderOptions): void {
  const alt = covariateBalanceChartText(data);
  const root = prepareSvg(svg, opts, data.title, alt.sentences.join(' '));
  const { width, height } = opts;
  const left = 160;
  const right = 112;
  const x = d3.scaleLinear().domain([0, data.xMax]).range([left, width - right]);
  text(root, 12, 18, data.title, { 'font-size': FONT.title, 'font-weight': 'bold' });
  text(
    root,
    12,
    36,
    data.source === 'simulation'
      ? `From ${data.replications} simulated studies (mean over replications)`
      : 'Closed form: exact matching from an unlimited comparison pool',
    { fill: GROUP_COLOURS.muted },
  );

  // Legend: shape and fill tell the three figures apart, not colour alone.
  const ly = 56;
  add(root, 'circle', { cx: 18, cy: ly, r: 5, fill: '#ffffff', stroke: OBSERVED, 'stroke-width': 1.5 });
  text(root, 28, ly + 4, 'Observed, before');
  add(root, 'circle', { cx: 138, cy: ly, r: 5, fill: OBSERVED });
  text(root, 148, ly + 4, 'Observed, after');
  add(root, 'path', { d: markerPath('diamond', 256, ly, 5), fill: TRUE_SCORE });
  text(root, 266, ly + 4, 'True score, after (hidden)');
  text(root, width - right + 10, TOP - 16, 'Variance ratio', { 'font-weight': 'bold' });
  text(root, width - right + 10, TOP - 4, `after (ok ${fmt(data.varianceRatioRange[0], 1)} to ${fmt(data.varianceRatioRange[1], 0)})`, { fill: GROUP_COLOURS.muted });

  const plotBottom = height - BOTTOM;
  const rowH = (plotBottom - TOP) / Math.max(1, data.rows.length);
  // Alternate row shading first, so the reference lines stay visible on top of it.
  data.rows.forEach((_, i) => {
    if (i % 2 === 1) add(root, 'rect', { x: 4, y: TOP + rowH * i, width: width - 8, height: rowH, fill: '#f4f5f6' });
  });
  for (const [t, label] of [
    [data.thresholds[0], `${fmt(data.thresholds[0], 2)} strict`],
    [data.thresholds[1], `${fmt(data.thresholds[1], 2)} lenient`],
  ] as [number, string][]) {
    if (t > data.xMax) continue;
    add(root, 'line', { x1: x(t), x2: x(t), y1: TOP - 8, y2: plotBottom, stroke: GROUP_COLOURS.threshold, 'stroke-dasharray': '4 3' });
    text(root, x(t) + 3, TOP - 10, label, { fill: GROUP_COLOURS.muted });
  }

  const emph = opts.highlight === null || opts.highlight === 'matchedDifference';
  const plot = add(root, 'g', { opacity: emph ? 1 : DIMMED_OPACITY + 0.4 });
  linkSeries(plot, 'matchedDifference', opts, false);
  const clamp = (v: number) => x(Math.min(Math.abs(v), data.xMax));
  data.rows.forEach((r, i) => {
    const yy = TOP + rowH * (i + 0.5);
    const row = add(plot, 'g');
    row.attr('data-covariate', r.name);
    const name = r.name.length > 22 ? `${r.name.slice(0, 21)}...` : r.name;
    text(row, 12, yy + (r.measured && !r.exact ? 4 : -2), name, { 'font-size': FONT.label, 'font-weight': 'bold', fill: '#222222' });
    if (!r.measured) text(row, 12, yy + 12, 'not measured', { fill: FLAG, 'font-style': 'italic' });
    else if (r.exact) text(row, 12, yy + 12, 'matched exactly', { fill: GROUP_COLOURS.muted });
    add(row, 'line', { x1: left, x2: width - right, y1: yy, y2: yy, stroke: '#e0e0e0' });
    const xb = clamp(r.observedBefore);
    const xa = clamp(r.observedAfter);
    const xt = clamp(r.trueAfter);
    // Observed: before → after on the row's upper lane; the true score sits on the lower lane.
    const yo = yy - 4;
    const yt = yy + 11;
    if (Math.abs(xb - xa) > 10) add(row, 'line', { x1: xb, x2: xa, y1: yo, y2: yo, stroke: OBSERVED, 'stroke-width': 1.5 });
    add(row, 'circle', { cx: xb, cy: yo, r: 5, fill: '#ffffff', stroke: OBSERVED, 'stroke-width': 1.5 });
    // The before value sits above its hollow circle (the after value is in the text alternative and usually near 0).
    text(row, xb, yo - 9, fmt(r.observedBefore, 2), { 'text-anchor': 'middle', fill: GROUP_COLOURS.muted });
    add(row, 'circle', { cx: xa, cy: yo, r: 5, fill: OBSERVED });
    // Label the after value too when it is visibly off zero and clear of the before label.
    if (Math.abs(r.observedAfter) >= 0.05 && Math.abs(xb - xa) > 34) {
      text(row, xa, yo - 9, fmt(r.observedAfter, 2), { 'text-anchor': 'middle', fill: OBSERVED, 'font-weight': 'bold' });
    }
    add(row, 'line', { x1: xa, x2: xt, y1: yo, y2: yt, stroke: TRUE_SCORE, 'stroke-width': 1, 'stroke-dasharray': '2 2' });
    add(row, 'path', { d: markerPath('diamond', xt, yt, 5.5), fill: TRUE_SCORE });
    text(row, Math.min(xt + 9, width - right - 34), yt + 4, fmt(r.trueAfter, 2), { fill: TRUE_SCORE, 'font-weight': 'bold' });
    const vr = r.varianceRatio === null ? 'n/a' : fmt(r.varianceRatio, 2);
    text(row, width - right + 10, yy + 4, r.varianceRatioOutside ? `${vr}  outside!` : vr, {
      fill: r.varianceRatioOutside ? FLAG : '#222222',
      'font-weight': r.varianceRatioOutside ? 'bold' : 'normal',
    });
  });
  axisBottom(root, x, plotBottom + 4, data.xLabel, 6);
}

/** The chart's size for a given width: full width, height by the number of variables. */
export function covariateBalanceChartSize(data: CovariateBalanceChartData, width: number): ChartSize {
  return { width, height: covariateBalanceChartHeight(data) };
}

/**
 * A standalone SVG document string of the chart (for the PDF and exports):
 * explicit size, inline styling, no interactive attributes. Needs a DOM.
 * @throws Error when width is not a positive finite number, or no DOM is available.
 */
export function covariateBalanceChartSvgString(data: CovariateBalanceChartData, width: number): string {
  if (!(Number.isFinite(width) && width > 0)) throw new Error(`Chart width must be a positive number of pixels; got ${String(width)}.`);
  if (typeof document === 'undefined') throw new Error('Drawing a chart needs a DOM (a browser, or jsdom in tests and the command line).');
  const svg = document.createElementNS('http://www.w3.org/2000/svg', 'svg');
  renderCovariateBalanceChart(svg, data, { ...covariateBalanceChartSize(data, width), highlight: null });
  const body = new XMLSerializer().serializeToString(svg);
  return body.includes('xmlns="http://www.w3.org/2000/svg"') ? body : body.replace('<svg', '<svg xmlns="http://www.w3.org/2000/svg"');
}
