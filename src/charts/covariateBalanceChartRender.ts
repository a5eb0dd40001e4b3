import { scaleLinear } from 'd3-scale';
import type { ChartSize, RenderOptions } from './chartTypes';
import type { CovariateBalanceChartData, CovariateBalanceRow, CovariateBalanceStatus } from './covariateBalanceChartData';
import { COVARIATE_BALANCE_STATUS_WORDS, covariateBalanceChartText } from './covariateBalanceChartText';
import { ANALYSIS_STYLES, DIMMED_OPACITY, GROUP_COLOURS } from './palette';
import { COMPACT_WIDTH, FONT, add, axisBottom, axisLabelLines, fmt, labelWidth, lineHeight, linkSeries, prepareSvg, text, wrapLabel } from './svgHelpers';

/**
 * Colours: what the study sees (observed values) in the comparison grey, what
 * lies underneath (true scores) in the matched-difference rust; the "before"
 * bar of each lane is a pale tint of its colour, "after" is solid.
 */
const SEEN = { solid: GROUP_COLOURS.comparison, pale: '#d6d6d6' };
const UNDER = { solid: ANALYSIS_STYLES.matchedDifference.colour, pale: ANALYSIS_STYLES.matchedDifference.tint };
const FLAG = '#8a3b12';
const STATUS_COLOUR: Record<CovariateBalanceStatus, string> = {
  hidden: ANALYSIS_STYLES.matchedDifference.colour,
  balanced: '#2f6b3a',
  apart: FLAG,
  unmeasured: FLAG,
};

const LANES = [
  { key: 'seen', label: 'as measured', colours: SEEN },
  { key: 'under', label: 'true score', colours: UNDER },
] as const;

const BOTTOM = 56;
const LINE = lineHeight(FONT.tick);
/** Wide charts: the variable's header column and the lane-name column, in px. */
const HEAD_W = 172;
const LANE_LABEL_W = 84;
/** Compact charts: a lane is a text line (name and values) over its bars. */
const COMPACT_LANE_H = 32;
const WIDE_LANE_H = 22;

/** Cut a line that is still too wide after wrapping (a single long word) with "...". */
function fitLine(line: string, maxWidth: number, size: number, bold: boolean): string {
  if (labelWidth(line, size, bold) <= maxWidth) return line;
  let s = line;
  while (s.length > 1 && labelWidth(`${s}...`, size, bold) > maxWidth) s = s.slice(0, -1);
  return `${s}...`;
}

function wrapFit(content: string, maxWidth: number, size: number = FONT.tick, bold = false): string[] {
  return wrapLabel(content, maxWidth, size, bold).map((l) => fitLine(l, maxWidth, size, bold));
}

/** One header line of a row: its text and how it is drawn. */
interface HeadLine {
  text: string;
  attrs: Record<string, string | number>;
}

interface RowLayout {
  top: number;
  height: number;
  head: HeadLine[];
}

interface CovariateBalanceLayout {
  compact: boolean;
  /** The plot's horizontal range (bars and axis). */
  plotLeft: number;
  plotRight: number;
  titleLines: string[];
  subLines: string[];
  subY: number;
  legend: { x: number; y: number; item: number; label: string }[];
  top: number;
  rows: RowLayout[];
  height: number;
}

function tagOf(r: CovariateBalanceRow): string {
  return !r.measured ? 'not measured' : r.exact ? 'matched exactly' : '';
}

function spreadNote(r: CovariateBalanceRow): string {
  return r.varianceRatioOutside && r.varianceRatio !== null ? `spread differs: variance ratio ${fmt(r.varianceRatio, 2)}` : '';
}

/** The header lines of a row: name (and tag), what the balance amounts to, and a spread note when the variance ratio is off. */
function rowHead(r: CovariateBalanceRow, maxWidth: number, compact: boolean): HeadLine[] {
  const name = { 'font-size': FONT.label, 'font-weight': 'bold', fill: '#222222' };
  const tag = tagOf(r);
  const lines: HeadLine[] = [];
  if (compact) {
    for (const l of wrapFit(tag ? `${r.name} (${tag})` : r.name, maxWidth, FONT.label, true)) lines.push({ text: l, attrs: name });
  } else {
    for (const l of wrapFit(r.name, maxWidth, FONT.label, true)) lines.push({ text: l, attrs: name });
    if (tag) lines.push({ text: tag, attrs: { fill: r.measured ? GROUP_COLOURS.muted : FLAG, 'font-style': 'italic' } });
  }
  for (const l of wrapFit(COVARIATE_BALANCE_STATUS_WORDS[r.status], maxWidth, FONT.tick, true)) {
    lines.push({ text: l, attrs: { fill: STATUS_COLOUR[r.status], 'font-weight': 'bold' } });
  }
  const spread = spreadNote(r);
  if (spread) for (const l of wrapFit(spread, maxWidth)) lines.push({ text: l, attrs: { fill: FLAG } });
  return lines;
}

const LEGEND_LABELS = (data: CovariateBalanceChartData) => [
  'before matching',
  'after matching',
  `within ${fmt(data.thresholds[0], 1)} either way: looks balanced`,
];

function layoutCovariateBalance(data: CovariateBalanceChartData, width: number): CovariateBalanceLayout {
  const compact = width < COMPACT_WIDTH;
  const plotLeft = compact ? 20 : 12 + HEAD_W + 8 + LANE_LABEL_W;
  const plotRight = compact ? width - 20 : width - 12 - valueWidth(data);
  const titleLines = wrapFit(data.title, width - 24, FONT.title, true);
  const sub =
    data.source === 'simulation' ? `From ${data.replications} simulated studies (mean over replications)` : 'Closed form: exact matching from an unlimited comparison pool';
  const subLines = wrapFit(sub, width - 24);
  const subY = 18 + (titleLines.length - 1) * lineHeight(FONT.title) + 18;
  // Legend: pale and solid bars, and the band; items flow onto more rows (long ones wrap no further: they are short).
  let lx = 12;
  let ly = subY + (subLines.length - 1) * LINE + 20;
  const legend: CovariateBalanceLayout['legend'] = [];
  LEGEND_LABELS(data).forEach((label0, item) => {
    const label = fitLine(label0, width - 24 - 22, FONT.tick, false);
    const w = 22 + labelWidth(label) + 14;
    if (lx + w > width - 8 && lx > 12) {
      lx = 12;
      ly += 18;
    }
    legend.push({ x: lx, y: ly, item, label });
    lx += w;
  });
  const top = ly + 16;
  let y = top;
  const rows = data.rows.map((r) => {
    const head = rowHead(r, compact ? width - 24 : HEAD_W, compact);
    const headH = head.length * LINE;
    const height = compact ? 8 + headH + 2 * COMPACT_LANE_H + 4 : Math.max(12 + headH, 14 + 2 * WIDE_LANE_H);
    const row = { top: y, height, head };
    y += height;
    return row;
  });
  const bottom = BOTTOM + (axisLabelLines(data.xLabel, width).length - 1) * lineHeight(FONT.label);
  return { compact, plotLeft, plotRight, titleLines, subLines, subY, legend, top, rows, height: Math.ceil(y + bottom) };
}

/** "0.00 (was -0.50)": the figure after matching, and before. */
function laneValue(after: number, before: number): string {
  return `${fmt(after, 2)} (was ${fmt(before, 2)})`;
}

/** Width of the widest lane value, for the wide layout's right column. */
function valueWidth(data: CovariateBalanceChartData): number {
  const widest = Math.max(
    ...data.rows.flatMap((r) => [labelWidth(laneValue(r.observedAfter, r.observedBefore), FONT.tick, true), labelWidth(laneValue(r.trueAfter, r.trueBefore), FONT.tick, true)]),
  );
  return Math.ceil(widest) + 8;
}

/** Height that gives every variable its own block at a readable size, at a width (layout only; default the PDF's 720 px). */
export function covariateBalanceChartHeight(data: CovariateBalanceChartData, width = 720): number {
  return layoutCovariateBalance(data, width).height;
}

/**
 * Draw the per-covariate balance chart into `svg`: one block per variable
 * (pretest first), each with two lanes, "as measured" (the observed values)
 * above "true score" (what the matching cannot see). In each lane a pale bar
 * runs from zero to the signed SMD before matching and a solid bar to the SMD
 * after, with the figures written beside it; a shaded band marks the ±0.1
 * zone where a difference looks balanced. Each block names what the balance
 * amounts to ("looks balanced, is not", ...) and notes a variance ratio
 * outside 0.5 to 2. Matching concerns the matched-difference analysis, so that
 * analysis' highlight emphasises this chart. Narrow charts stack each
 * variable's name, and each lane's name and figures, above the bars.
 */
export function renderCovariateBalanceChart(svg: SVGSVGElement, data: CovariateBalanceChartData, opts: RenderOptions): void {
  const alt = covariateBalanceChartText(data);
  const { width } = opts;
  const L = layoutCovariateBalance(data, width);
  const height = Math.max(opts.height, L.height);
  const root = prepareSvg(svg, { ...opts, height }, data.title, alt.sentences.join(' '));
  const { compact, plotLeft, plotRight, top } = L;
  const x = scaleLinear().domain([data.xMin, data.xMax]).range([plotLeft, plotRight]);
  L.titleLines.forEach((l, i) => text(root, 12, 18 + i * lineHeight(FONT.title), l, { 'font-size': FONT.title, 'font-weight': 'bold' }));
  L.subLines.forEach((l, i) => text(root, 12, L.subY + i * LINE, l, { fill: GROUP_COLOURS.muted }));
  for (const { x: lx, y: ly, item, label } of L.legend) {
    if (item === 0) add(root, 'rect', { x: lx, y: ly - 6, width: 14, height: 12, fill: SEEN.pale });
    else if (item === 1) add(root, 'rect', { x: lx, y: ly - 3, width: 14, height: 6, fill: SEEN.solid });
    else add(root, 'rect', { x: lx, y: ly - 7, width: 14, height: 14, fill: GROUP_COLOURS.band });
    text(root, lx + 20, ly + 4, label);
  }

  const plotBottom = L.rows.length > 0 ? L.rows[L.rows.length - 1]!.top + L.rows[L.rows.length - 1]!.height : top;
  // Row shading first, then the band and the zero line, so both stay visible on top of it.
  L.rows.forEach((row, i) => {
    if (i % 2 === 1) add(root, 'rect', { x: 4, y: row.top, width: width - 8, height: row.height, fill: '#f4f5f6' });
  });
  const [strict] = data.thresholds;
  add(root, 'rect', { x: x(-strict), y: top, width: x(strict) - x(-strict), height: plotBottom - top, fill: GROUP_COLOURS.band, opacity: 0.7 });
  add(root, 'line', { x1: x(0), x2: x(0), y1: top, y2: plotBottom, stroke: '#444444', 'stroke-width': 1 });

  const emph = opts.highlight === null || opts.highlight === 'matchedDifference';
  const plot = add(root, 'g', { opacity: emph ? 1 : DIMMED_OPACITY + 0.4 });
  linkSeries(plot, 'matchedDifference', opts, false);
  const at = (v: number) => x(Math.max(data.xMin, Math.min(data.xMax, v)));
  data.rows.forEach((r, i) => {
    const R = L.rows[i]!;
    const g = add(plot, 'g');
    g.attr('data-covariate', r.name).attr('data-status', r.status);
    R.head.forEach((h, k) => text(g, 12, R.top + 16 + k * LINE, h.text, h.attrs));
    const figures: [number, number][] = [
      [r.observedBefore, r.observedAfter],
      [r.trueBefore, r.trueAfter],
    ];
    LANES.forEach((lane, k) => {
      const [before, after] = figures[k]!;
      const value = laneValue(after, before);
      let mid: number;
      if (compact) {
        const lineY = R.top + 8 + R.head.length * LINE + k * COMPACT_LANE_H + 12;
        text(g, 12, lineY, lane.label, { fill: lane.colours.solid, 'font-weight': 'bold' });
        text(g, width - 12, lineY, value, { fill: lane.colours.solid, 'font-weight': 'bold', 'text-anchor': 'end' });
        mid = lineY + 11;
      } else {
        mid = R.top + 14 + WIDE_LANE_H * (k + 0.5);
        text(g, 12 + HEAD_W + 8, mid + 4, lane.label, { fill: lane.colours.solid, 'font-weight': 'bold' });
        text(g, plotRight + 8, mid + 4, value, { fill: lane.colours.solid, 'font-weight': 'bold' });
      }
      const x0 = x(0);
      const xb = at(before);
      const xa = at(after);
      add(g, 'rect', { x: Math.min(x0, xb), y: mid - 7, width: Math.abs(xb - x0), height: 14, fill: lane.colours.pale });
      add(g, 'rect', { x: Math.min(x0, xa), y: mid - 3, width: Math.abs(xa - x0), height: 6, fill: lane.colours.solid });
      // An end cap, so a figure near zero still shows where it lies.
      add(g, 'line', { x1: xa, x2: xa, y1: mid - 7, y2: mid + 7, stroke: lane.colours.solid, 'stroke-width': 2 });
    });
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
