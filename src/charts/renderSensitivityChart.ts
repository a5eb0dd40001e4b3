import * as d3 from 'd3';
import { ANALYSIS_IDS } from '../core/plan';
import type { RenderOptions } from './chartTypes';
import type { SensitivityChartData } from './sensitivityChartData';
import { sensitivityChartText } from './sensitivityChartText';
import { ANALYSIS_STYLES, GROUP_COLOURS } from './palette';
import { FONT, add, analysisLegend, axisBottom, axisLeft, fmt, linkSeries, markerPath, opacityFor, prepareSvg, strokeFor, text } from './svgHelpers';

/**
 * Draw the sensitivity chart into `svg`: one expected-bias curve per analysis,
 * the tolerated band (± share × effect), lines where the bias equals or
 * cancels the hoped-for effect, and markers at the break-even and current x.
 */
export function renderSensitivityChart(svg: SVGSVGElement, data: SensitivityChartData, opts: RenderOptions): void {
  const alt = sensitivityChartText(data);
  const root = prepareSvg(svg, opts, data.title, alt.sentences.join(' '));
  const { width, height } = opts;
  const left = 70;
  const right = 150;
  const bottom = 52;
  text(root, 12, 18, data.title, { 'font-size': FONT.title, 'font-weight': 'bold' });
  const legendH = analysisLegend(root, ANALYSIS_IDS, 12, 38, width - 24, opts);
  let top = 38 + legendH + 4;
  // Curves drawn exactly on top of each other would hide one analysis: say so.
  for (const [a, b] of data.coincident) {
    text(root, 12, top + 10, `${ANALYSIS_STYLES[a].shortLabel} and ${ANALYSIS_STYLES[b].shortLabel} coincide on this axis (one line hides the other).`, { fill: GROUP_COLOURS.muted });
    top += 16;
  }
  top += 14;
  const x = d3.scaleLinear().domain(data.xDomain).range([left, width - right]);
  const y = d3.scaleLinear().domain(data.yDomain).range([height - bottom, top]);
  const digits = data.mode === 'reliability' ? 2 : 1;

  // Tolerated band and reference lines (none when no effect is hoped for: then any bias is a false finding).
  if (data.band.upper > data.band.lower) {
    add(root, 'rect', {
      x: left, y: y(data.band.upper), width: width - right - left, height: Math.max(0, y(data.band.lower) - y(data.band.upper)),
      fill: GROUP_COLOURS.band,
    });
    text(root, width - right + 6, (y(data.band.upper) + y(data.band.lower)) / 2 + 4, `Tolerated: +/- ${fmt(data.band.upper, 2)}`, { fill: '#2f6b3a' });
  }
  add(root, 'line', { x1: left, x2: width - right, y1: y(0), y2: y(0), stroke: '#999999' });
  if (data.tau !== 0) {
    for (const [v, label] of [
      [data.tau, 'Bias = effect'],
      [-data.tau, 'Cancels effect'],
    ] as [number, string][]) {
      add(root, 'line', { x1: left, x2: width - right, y1: y(v), y2: y(v), stroke: GROUP_COLOURS.reference, 'stroke-dasharray': '5 3' });
      text(root, width - right + 6, y(v) + 4, `${label} (${fmt(v, 2)})`, { 'font-size': FONT.note });
    }
  } else {
    text(root, width - right + 6, y(0) + 4, 'No effect hoped for', { 'font-size': FONT.note });
  }
  axisLeft(root, y, left, data.yLabel, 6);
  axisBottom(root, x, height - bottom + 4, data.xLabel, 8);

  // Break-even and current x.
  for (const be of data.breakEvenX) {
    add(root, 'line', { x1: x(be), x2: x(be), y1: top, y2: height - bottom, stroke: '#2f6b3a', 'stroke-width': 1.5, 'stroke-dasharray': '6 2' });
    const leftRoom = x(be) - left > 100;
    text(root, x(be) + (leftRoom ? -4 : 4), top + 12, `Break-even ${fmt(be, digits)}`, { 'text-anchor': leftRoom ? 'end' : 'start', fill: '#2f6b3a', 'font-weight': 'bold' });
  }
  add(root, 'line', { x1: x(data.current), x2: x(data.current), y1: top, y2: height - bottom, stroke: '#111111', 'stroke-width': 1.5 });
  const rightRoom = width - right - x(data.current) > 90;
  text(root, x(data.current) + (rightRoom ? 4 : -4), height - bottom - 8, `This plan ${fmt(data.current, digits)}`, { 'font-weight': 'bold', 'text-anchor': rightRoom ? 'start' : 'end' });

  const line = d3
    .line<{ x: number; bias: number }>()
    .x((p) => x(p.x))
    .y((p) => y(p.bias))
    .digits(2);
  for (const s of data.series) {
    const st = ANALYSIS_STYLES[s.id];
    const g = add(root, 'g', { opacity: opacityFor(s.id, opts.highlight) });
    g.attr('data-series', s.id);
    add(g, 'path', { d: line(s.points) ?? '', fill: 'none', stroke: st.colour, 'stroke-width': strokeFor(s.id, opts.highlight, 2.2), 'stroke-dasharray': st.dash || 'none' });
    add(g, 'path', { d: markerPath(st.marker, x(data.current), y(s.currentBias), 5), fill: st.colour, stroke: '#ffffff', 'stroke-width': 1 });
    linkSeries(g, s.id, opts, false);
  }
}
