import * as d3 from 'd3';
import type { ChartSize, RenderOptions } from './chartTypes';
import type { CovariateBalanceChartData } from './covariateBalanceChartData';
import { covariateBalanceChartText } from './covariateBalanceChartText';
import { ANALYSIS_STYLES, DIMMED_OPACITY, GROUP_COLOURS } from './palette';
import {
  COMPACT_WIDTH,
  FONT,
  add,
  axisBottom,
  axisLabelLines,
  fmt,
  labelWidth,
  lineHeight,
  linkSeries,
  markerPath,
  prepareSvg,
  text,
  wrapLabel,
} from './svgHelpers';

const BOTTOM = 56;
const ROW_H = 46;
const COMPACT_ROW_H = 66;

/** Colours: observed values in the comparison grey, true scores in the matched-difference rust, flags in the warning brown. */
const OBSERVED = GROUP_COLOURS.comparison;
const TRUE_SCORE = ANALYSIS_STYLES.matchedDifference.colour;
const FLAG = '#8a3b12';

interface CovariateBalanceLayout {
  compact: boolean;
  left: number;
  right: number;
  titleLines: string[];
  subLines: string[];
  subY: number;
  legend: { x: number; y: number; item: number }[];
  ratioNote: string[];
  ratioNoteY: number;
  thresholds: { value: number; label: string; y: number }[];
  top: number;
  rowH: number;
  height: number;
}

const LEGEND = ['Observed, before', 'Observed, after', 'True score, after (hidden)'];

function layoutCovariateBalance(data: CovariateBalanceChartData, width: number): CovariateBalanceLayout {
  const compact = width < COMPACT_WIDTH;
  const left = compact ? 20 : 160;
  const right = compact ? 28 : 112;
  const titleLines = wrapLabel(data.title, width - 24, FONT.title, true);
  const sub =
    data.source === 'simulation' ? `From ${data.replications} simulated studies (mean over replications)` : 'Closed form: exact matching from an unlimited comparison pool';
  const subLines = wrapLabel(sub, width - 24);
  const subY = 18 + (titleLines.length - 1) * lineHeight(FONT.title) + 18;
  // Legend: shape and fill tell the three figures apart, not colour alone; items flow onto more rows.
  let lx = 12;
  let ly = subY + (subLines.length - 1) * lineHeight(FONT.tick) + 20;
  const legend: CovariateBalanceLayout['legend'] = [];
  LEGEND.forEach((label, item) => {
    const w = 22 + labelWidth(label) + 14;
    if (lx + w > width - 8 && lx > 12) {
      lx = 12;
      ly += 18;
    }
    legend.push({ x: lx, y: ly, item });
    lx += w;
  });
  // Narrow: the variance ratio sits on each row's name line, explained once under the legend.
  const ratioNote = compact
    ? wrapLabel(`Variance ratio after matching (ok ${fmt(data.varianceRatioRange[0], 1)} to ${fmt(data.varianceRatioRange[1], 0)}) at the right of each name.`, width - 24)
    : [];
  const ratioNoteY = ly + 20;
  const headerBottom = compact ? ratioNoteY + (ratioNote.length - 1) * lineHeight(FONT.tick) : ly + 4;
  const x = d3.scaleLinear().domain([0, data.xMax]).range([left, width - right]);
  const shown = [
    { value: data.thresholds[0], label: `${fmt(data.thresholds[0], 2)} strict` },
    { value: data.thresholds[1], label: `${fmt(data.thresholds[1], 2)} lenient` },
  ].filter((t) => t.value <= data.xMax);
  const collide = shown.length === 2 && x(shown[0]!.value) + 3 + labelWidth(shown[0]!.label) + 6 > x(shown[1]!.value) + 3;
  // Wide charts head the right column with two lines ("Variance ratio" / its range) just above the rows.
  const top = Math.max(headerBottom + 26 + (collide ? 14 : 0), compact ? 0 : ly + 40);
  const thresholds = shown.map((t, i) => ({ ...t, y: top - 10 - (collide && i === 1 ? 14 : 0) }));
  const rowH = compact ? COMPACT_ROW_H : ROW_H;
  const bottom = BOTTOM + (axisLabelLines(data.xLabel, width).length - 1) * lineHeight(FONT.label);
  const height = Math.ceil(top + bottom + rowH * data.rows.length);
  return { compact, left, right, titleLines, subLines, subY, legend, ratioNote, ratioNoteY, thresholds, top, rowH, height };
}

/** Height that gives every variable its own row at a readable size, at a width (layout only; default the PDF's 720 px). */
export function covariateBalanceChartHeight(data: CovariateBalanceChartData, width = 720): number {
  return layoutCovariateBalance(data, width).height;
}

/**
 * Draw the per-covariate balance chart into `svg`: one row per variable
 * (pretest first), |SMD| of the observed values before (hollow circle) and
 * after matching (filled circle), and of the true scores after matching
 * (diamond), with reference lines at 0.1 and 0.25 and, at the right, the
 * variance ratio after matching, flagged when outside 0.5 to 2. Unmeasured
 * covariates are labelled so. Matching concerns the matched-difference
 * analysis, so that analysis' highlight emphasises this chart. Narrow charts
 * put each variable's name (and its variance ratio) above its row.
 */
export function renderCovariateBalanceChart(svg: SVGSVGElement, data: CovariateBalanceChartData, opts: RenderOptions): void {
  const alt = covariateBalanceChartText(data);
  const { width } = opts;
  const L = layoutCovariateBalance(data, width);
  const height = Math.max(opts.height, L.height);
  const root = prepareSvg(svg, { ...opts, height }, data.title, alt.sentences.join(' '));
  const { left, right, top, compact } = L;
  const x = d3.scaleLinear().domain([0, data.xMax]).range([left, width - right]);
  L.titleLines.forEach((l, i) => text(root, 12, 18 + i * lineHeight(FONT.title), l, { 'font-size': FONT.title, 'font-weight': 'bold' }));
  L.subLines.forEach((l, i) => text(root, 12, L.subY + i * lineHeight(FONT.tick), l, { fill: GROUP_COLOURS.muted }));
  for (const { x: lx, y: ly, item } of L.legend) {
    if (item === 0) add(root, 'circle', { cx: lx + 6, cy: ly, r: 5, fill: '#ffffff', stroke: OBSERVED, 'stroke-width': 1.5 });
    else if (item === 1) add(root, 'circle', { cx: lx + 6, cy: ly, r: 5, fill: OBSERVED });
    else add(root, 'path', { d: markerPath('diamond', lx + 6, ly, 5), fill: TRUE_SCORE });
    text(root, lx + 16, ly + 4, LEGEND[item]!);
  }
  if (compact) {
    L.ratioNote.forEach((l, i) => text(root, 12, L.ratioNoteY + i * lineHeight(FONT.tick), l, { fill: GROUP_COLOURS.muted }));
  } else {
    text(root, width - right + 10, top - 18, 'Variance ratio', { 'font-weight': 'bold' });
    text(root, width - right + 10, top - 5, `ok ${fmt(data.varianceRatioRange[0], 1)} to ${fmt(data.varianceRatioRange[1], 0)}`, { fill: GROUP_COLOURS.muted });
  }

  const rowH = L.rowH;
  const plotBottom = top + rowH * data.rows.length;
  // Alternate row shading first, so the reference lines stay visible on top of it.
  data.rows.forEach((_, i) => {
    if (i % 2 === 1) add(root, 'rect', { x: 4, y: top + rowH * i, width: width - 8, height: rowH, fill: '#f4f5f6' });
  });
  for (const t of L.thresholds) {
    add(root, 'line', { x1: x(t.value), x2: x(t.value), y1: t.y + 2, y2: plotBottom, stroke: GROUP_COLOURS.threshold, 'stroke-dasharray': '4 3' });
    text(root, x(t.value) + 3, t.y, t.label, { fill: GROUP_COLOURS.muted });
  }

  const emph = opts.highlight === null || opts.highlight === 'matchedDifference';
  const plot = add(root, 'g', { opacity: emph ? 1 : DIMMED_OPACITY + 0.4 });
  linkSeries(plot, 'matchedDifference', opts, false);
  const clamp = (v: number) => x(Math.min(Math.abs(v), data.xMax));
  data.rows.forEach((r, i) => {
    const rowTop = top + rowH * i;
    // Wide: the name in the left margin, centred on the row; narrow: on a line of its own at the row's top.
    const yy = compact ? rowTop + 40 : rowTop + rowH / 2;
    const row = add(plot, 'g');
    row.attr('data-covariate', r.name);
    const vr = r.varianceRatio === null ? 'n/a' : fmt(r.varianceRatio, 2);
    const vrText = r.varianceRatioOutside ? `${vr}  outside!` : vr;
    const vrAttrs = { fill: r.varianceRatioOutside ? FLAG : '#222222', 'font-weight': r.varianceRatioOutside ? 'bold' : 'normal' };
    const tag = !r.measured ? 'not measured' : r.exact ? 'matched exactly' : '';
    if (compact) {
      const vrLabel = `VR ${vrText}`;
      const room = width - 24 - labelWidth(vrLabel, FONT.tick, true) - 12;
      const full = tag ? `${r.name} (${tag})` : r.name;
      const shown = labelWidth(full, FONT.label, true) <= room ? full : r.name;
      const name = labelWidth(shown, FONT.label, true) <= room ? shown : `${shown.slice(0, Math.max(4, Math.floor(room / (FONT.label * 0.65)) - 3))}...`;
      text(row, 12, rowTop + 14, name, { 'font-size': FONT.label, 'font-weight': 'bold', fill: '#222222' });
      text(row, width - 12, rowTop + 14, vrLabel, { ...vrAttrs, 'text-anchor': 'end' });
    } else {
      const name = r.name.length > 22 ? `${r.name.slice(0, 21)}...` : r.name;
      text(row, 12, yy + (r.measured && !r.exact ? 4 : -2), name, { 'font-size': FONT.label, 'font-weight': 'bold', fill: '#222222' });
      if (!r.measured) text(row, 12, yy + 12, 'not measured', { fill: FLAG, 'font-style': 'italic' });
      else if (r.exact) text(row, 12, yy + 12, 'matched exactly', { fill: GROUP_COLOURS.muted });
      text(row, width - right + 10, yy + 4, vrText, vrAttrs);
    }
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
    const before = fmt(r.observedBefore, 2);
    const bw = labelWidth(before);
    text(row, Math.min(Math.max(xb, 4 + bw / 2), width - 4 - bw / 2), yo - 9, before, { 'text-anchor': 'middle', fill: GROUP_COLOURS.muted });
    add(row, 'circle', { cx: xa, cy: yo, r: 5, fill: OBSERVED });
    // Label the after value too when it is visibly off zero and clear of the before label.
    if (Math.abs(r.observedAfter) >= 0.05 && Math.abs(xb - xa) > 34) {
      text(row, xa, yo - 9, fmt(r.observedAfter, 2), { 'text-anchor': 'middle', fill: OBSERVED, 'font-weight': 'bold' });
    }
    add(row, 'line', { x1: xa, x2: xt, y1: yo, y2: yt, stroke: TRUE_SCORE, 'stroke-width': 1, 'stroke-dasharray': '2 2' });
    add(row, 'path', { d: markerPath('diamond', xt, yt, 5.5), fill: TRUE_SCORE });
    text(row, Math.min(xt + 9, width - right - 34), yt + 4, fmt(r.trueAfter, 2), { fill: TRUE_SCORE, 'font-weight': 'bold' });
  });
  axisBottom(root, x, plotBottom + 4, data.xLabel, 6);
}

/** The chart's size for a given width: full width, height by the number of variables (and, when narrow, their stacked labels). */
export function covariateBalanceChartSize(data: CovariateBalanceChartData, width: number): ChartSize {
  return { width, height: covariateBalanceChartHeight(data, width) };
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
