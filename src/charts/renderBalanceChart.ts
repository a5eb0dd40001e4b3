import { scaleLinear } from 'd3-scale';
import type { RenderOptions } from './chartTypes';
import type { BalanceChartData } from './balanceChartData';
import { balanceChartText } from './balanceChartText';
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
  prepareSvg,
  text,
  wrapLabel,
} from './svgHelpers';

interface BalanceLayout {
  compact: boolean;
  left: number;
  right: number;
  bottom: number;
  titleLines: string[];
  subLines: string[];
  subY: number;
  legendY: number;
  thresholds: { value: number; label: string; y: number }[];
  top: number;
  minHeight: number;
}

function subtitle(data: BalanceChartData): string {
  return data.source === 'simulation' ? 'From the simulated studies (mean over replications)' : 'Closed form: exact matching from an unlimited comparison pool';
}

function layoutBalance(data: BalanceChartData, width: number): BalanceLayout {
  const compact = width < COMPACT_WIDTH;
  const left = compact ? 20 : 150;
  const right = 28;
  const titleLines = wrapLabel(data.title, width - 24, FONT.title, true);
  const subLines = wrapLabel(subtitle(data), width - 24);
  const subY = 18 + (titleLines.length - 1) * lineHeight(FONT.title) + 18;
  const legendY = subY + (subLines.length - 1) * lineHeight(FONT.tick) + 18;
  // Threshold labels beside their lines; the second on a row above when they would collide.
  const x = scaleLinear().domain([0, data.xMax]).range([left, width - right]);
  const labels = [
    { value: data.thresholds[0], label: `${fmt(data.thresholds[0], 2)} strict` },
    { value: data.thresholds[1], label: `${fmt(data.thresholds[1], 2)} lenient` },
  ];
  const collide = x(labels[0]!.value) + 3 + labelWidth(labels[0]!.label) + 6 > x(labels[1]!.value) + 3;
  const top = legendY + 24 + (collide ? 14 : 0);
  const thresholds = labels.map((l, i) => ({ ...l, y: top - 8 - (collide && i === 1 ? 14 : 0) }));
  const bottom = 56 + (axisLabelLines(data.xLabel, width).length - 1) * lineHeight(FONT.label);
  const minHeight = Math.ceil(top + (compact ? 76 : 60) * data.rows.length + bottom);
  return { compact, left, right, bottom, titleLines, subLines, subY, legendY, thresholds, top, minHeight };
}

/** The least height (px) the balance chart needs at a width so its rows and labels never overlap. */
export function balanceChartMinHeight(data: BalanceChartData, width: number): number {
  return layoutBalance(data, width).minHeight;
}

/**
 * Draw the balance chart into `svg`: for the observed pretest and the true
 * score, |SMD| before (hollow circle) and after matching (filled circle),
 * joined by an arrow, with threshold lines at 0.1 and 0.25.
 * Matching concerns the matched-difference analysis, so that analysis'
 * highlight emphasises this chart and other highlights dim it a little.
 * Narrow charts put each row's name above it.
 */
export function renderBalanceChart(svg: SVGSVGElement, data: BalanceChartData, opts: RenderOptions): void {
  const alt = balanceChartText(data);
  const { width } = opts;
  const L = layoutBalance(data, width);
  const height = Math.max(opts.height, L.minHeight);
  const root = prepareSvg(svg, { ...opts, height }, data.title, alt.sentences.join(' '));
  const { left, right, top, bottom, legendY } = L;
  const x = scaleLinear().domain([0, data.xMax]).range([left, width - right]);
  L.titleLines.forEach((l, i) => text(root, 12, 18 + i * lineHeight(FONT.title), l, { 'font-size': FONT.title, 'font-weight': 'bold' }));
  L.subLines.forEach((l, i) => text(root, 12, L.subY + i * lineHeight(FONT.tick), l, { fill: GROUP_COLOURS.muted }));
  // Legend.
  add(root, 'circle', { cx: 18, cy: legendY, r: 5, fill: '#ffffff', stroke: '#222222', 'stroke-width': 1.5 });
  text(root, 28, legendY + 4, 'Before matching');
  add(root, 'circle', { cx: 138, cy: legendY, r: 5, fill: '#222222' });
  text(root, 148, legendY + 4, 'After matching');

  for (const t of L.thresholds) {
    add(root, 'line', { x1: x(t.value), x2: x(t.value), y1: t.y + 2, y2: height - bottom, stroke: GROUP_COLOURS.threshold, 'stroke-dasharray': '4 3' });
    text(root, x(t.value) + 3, t.y, t.label, { fill: GROUP_COLOURS.muted });
  }

  const emph = opts.highlight === null || opts.highlight === 'matchedDifference';
  const plot = add(root, 'g', { opacity: emph ? 1 : DIMMED_OPACITY + 0.4 });
  linkSeries(plot, 'matchedDifference', opts, false);
  const rowH = (height - top - bottom) / data.rows.length;
  // A value label centred on its marker, kept inside the chart.
  const centred = (xv: number, label: string, bold: boolean) => {
    const w = labelWidth(label, FONT.tick, bold);
    return Math.min(Math.max(xv, 4 + w / 2), width - 4 - w / 2);
  };
  data.rows.forEach((r, i) => {
    const yy = top + rowH * (i + 0.5) + (L.compact ? 10 : 0);
    const colour = r.measure === 'observed' ? GROUP_COLOURS.comparison : ANALYSIS_STYLES.matchedDifference.colour;
    text(plot, 12, L.compact ? yy - 28 : yy + 4, r.label, { 'font-size': FONT.label, 'font-weight': 'bold', fill: colour });
    add(plot, 'line', { x1: left, x2: width - right, y1: yy, y2: yy, stroke: '#e3e3e3' });
    const xb = x(Math.min(Math.abs(r.before), data.xMax));
    const xa = x(Math.min(Math.abs(r.after), data.xMax));
    if (Math.abs(xb - xa) > 12) {
      const dir = xa < xb ? 1 : -1;
      add(plot, 'line', { x1: xb - dir * 7, x2: xa + dir * 8, y1: yy, y2: yy, stroke: colour, 'stroke-width': 2 });
      add(plot, 'path', { d: `M${xa + dir * 14},${yy - 5}L${xa + dir * 8},${yy}L${xa + dir * 14},${yy + 5}`, fill: 'none', stroke: colour, 'stroke-width': 2 });
    }
    add(plot, 'circle', { cx: xb, cy: yy, r: 6, fill: '#ffffff', stroke: colour, 'stroke-width': 2 });
    add(plot, 'circle', { cx: xa, cy: yy, r: 6, fill: colour });
    const before = `before ${fmt(r.before, 2)}`;
    const after = `after ${fmt(r.after, 2)}`;
    text(plot, centred(xb, before, false), yy - 12, before, { 'text-anchor': 'middle', fill: colour });
    text(plot, centred(xa, after, true), yy + 22, after, { 'text-anchor': 'middle', fill: colour, 'font-weight': 'bold' });
  });
  axisBottom(root, x, height - bottom + 4, data.xLabel, 6);
}
