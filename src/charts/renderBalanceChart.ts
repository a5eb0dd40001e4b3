import * as d3 from 'd3';
import type { RenderOptions } from './chartTypes';
import type { BalanceChartData } from './balanceChartData';
import { balanceChartText } from './balanceChartText';
import { ANALYSIS_STYLES, DIMMED_OPACITY, GROUP_COLOURS } from './palette';
import { FONT, add, axisBottom, fmt, linkSeries, prepareSvg, text } from './svgHelpers';

/**
 * Draw the balance chart into `svg`: for the observed pretest and the true
 * score, |SMD| before (hollow circle) and after matching (filled circle),
 * joined by an arrow, with threshold lines at 0.1 and 0.25.
 * Matching concerns the matched-difference analysis, so that analysis'
 * highlight emphasises this chart and other highlights dim it a little.
 */
export function renderBalanceChart(svg: SVGSVGElement, data: BalanceChartData, opts: RenderOptions): void {
  const alt = balanceChartText(data);
  const root = prepareSvg(svg, opts, data.title, alt.sentences.join(' '));
  const { width, height } = opts;
  const left = 150;
  const right = 28;
  const top = 76;
  const bottom = 56;
  const x = d3.scaleLinear().domain([0, data.xMax]).range([left, width - right]);
  text(root, 12, 18, data.title, { 'font-size': FONT.title, 'font-weight': 'bold' });
  text(root, 12, 36, data.source === 'simulation' ? 'From the simulated studies (mean over replications)' : 'Closed form: exact matching from an unlimited comparison pool', {
    fill: GROUP_COLOURS.muted,
  });
  // Legend.
  add(root, 'circle', { cx: 18, cy: 54, r: 5, fill: '#ffffff', stroke: '#222222', 'stroke-width': 1.5 });
  text(root, 28, 58, 'Before matching');
  add(root, 'circle', { cx: 138, cy: 54, r: 5, fill: '#222222' });
  text(root, 148, 58, 'After matching');

  for (const [t, label] of [
    [data.thresholds[0], `${fmt(data.thresholds[0], 2)} strict`],
    [data.thresholds[1], `${fmt(data.thresholds[1], 2)} lenient`],
  ] as [number, string][]) {
    add(root, 'line', { x1: x(t), x2: x(t), y1: top - 6, y2: height - bottom, stroke: GROUP_COLOURS.threshold, 'stroke-dasharray': '4 3' });
    text(root, x(t) + 3, top - 8, label, { fill: GROUP_COLOURS.muted });
  }

  const emph = opts.highlight === null || opts.highlight === 'matchedDifference';
  const plot = add(root, 'g', { opacity: emph ? 1 : DIMMED_OPACITY + 0.4 });
  linkSeries(plot, 'matchedDifference', opts, false);
  const rowH = (height - top - bottom) / data.rows.length;
  data.rows.forEach((r, i) => {
    const yy = top + rowH * (i + 0.5);
    const colour = r.measure === 'observed' ? GROUP_COLOURS.comparison : ANALYSIS_STYLES.matchedDifference.colour;
    text(plot, 12, yy + 4, r.label, { 'font-size': FONT.label, 'font-weight': 'bold', fill: colour });
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
    text(plot, xb, yy - 12, `before ${fmt(r.before, 2)}`, { 'text-anchor': 'middle', fill: colour });
    text(plot, xa, yy + 22, `after ${fmt(r.after, 2)}`, { 'text-anchor': 'middle', fill: colour, 'font-weight': 'bold' });
  });
  axisBottom(root, x, height - bottom + 4, data.xLabel, 6);
}
