import * as d3 from 'd3';
import type { RenderOptions } from './chartTypes';
import type { EstimatesChartData } from './estimatesChartData';
import { estimatesChartText } from './estimatesChartText';
import { ANALYSIS_STYLES, GROUP_COLOURS } from './palette';
import { FONT, add, axisBottom, fmt, linkSeries, markerPath, opacityFor, prepareSvg, strokeFor, text } from './svgHelpers';

/**
 * Draw the estimates chart into `svg`: one row per analysis, with the
 * histogram of simulated estimates (or, before a simulation, the closed-form
 * 95% range), the expected estimate, and reference lines at zero and at the
 * hoped-for effect.
 */
export function renderEstimatesChart(svg: SVGSVGElement, data: EstimatesChartData, opts: RenderOptions): void {
  const alt = estimatesChartText(data);
  const root = prepareSvg(svg, opts, data.title, alt.sentences.join(' '));
  const { width, height } = opts;
  const left = 150;
  const right = 24;
  const top = 62;
  const bottom = 52;
  const x = d3.scaleLinear().domain(data.xDomain).range([left, width - right]);
  const rowH = (height - top - bottom) / data.rows.length;

  text(root, 12, 18, data.title, { 'font-size': FONT.title, 'font-weight': 'bold' });
  const sub =
    data.mode === 'simulation'
      ? `Histograms of ${data.replications} simulated studies; diamond = closed-form expected estimate`
      : 'Bars: where 95% of study estimates should fall; diamond = expected estimate';
  text(root, 12, 36, sub, { fill: GROUP_COLOURS.muted });

  // Reference lines: no effect, and the hoped-for effect (one line when the hoped-for effect is 0).
  const refs: [number, string, string][] =
    data.tau === 0 ? [[0, 'No effect (the hoped-for effect is 0)', 'none']] : [[0, 'No effect', '3 3'], [data.tau, `Hoped-for effect ${fmt(data.tau, 2)}`, 'none']];
  for (const [v, label, dash] of refs) {
    const xv = x(v);
    add(root, 'line', { x1: xv, x2: xv, y1: top - 6, y2: height - bottom, stroke: GROUP_COLOURS.reference, 'stroke-width': 1.2, 'stroke-dasharray': dash });
    // Each label runs away from the other line (zero's label on the side away from the effect).
    const towardRight = v === 0 ? data.tau < 0 || (data.tau === 0 && xv < (left + width - right) / 2) : data.tau > 0;
    text(root, xv + (towardRight ? 4 : -4), top - 8, label, { 'text-anchor': towardRight ? 'start' : 'end' });
  }

  data.rows.forEach((r, i) => {
    const st = ANALYSIS_STYLES[r.id];
    const y0 = top + i * rowH;
    const base = y0 + rowH - 8;
    const g = add(root, 'g', { opacity: opacityFor(r.id, opts.highlight) });
    g.attr('data-series', r.id);
    add(g, 'line', { x1: left, x2: width - right, y1: base, y2: base, stroke: '#bbbbbb' });
    const label = add(g, 'g');
    add(label, 'path', { d: markerPath(st.marker, 14, y0 + rowH / 2 + (r.bins ? -8 : 0), 4.5), fill: st.colour });
    text(label, 26, y0 + rowH / 2 + (r.bins ? -4 : 4), st.shortLabel, { 'font-size': FONT.label, 'font-weight': opts.highlight === r.id ? 'bold' : 'normal' });
    linkSeries(label, r.id, opts, true);
    const series = add(g, 'g');
    linkSeries(series, r.id, opts, false);
    if (r.bins && data.maxCount > 0) {
      const h = d3.scaleLinear().domain([0, data.maxCount]).range([base, y0 + 6]);
      for (const b of r.bins) {
        if (b.count === 0) continue;
        add(series, 'rect', {
          x: x(b.x0),
          y: h(b.count),
          width: Math.max(0.5, x(b.x1) - x(b.x0) - 0.5),
          height: base - h(b.count),
          fill: st.colour,
          'fill-opacity': opts.highlight === r.id ? 0.75 : 0.5,
        });
      }
    } else if (r.interval) {
      const yy = y0 + rowH / 2;
      add(series, 'line', {
        x1: x(r.interval.lower), x2: x(r.interval.upper), y1: yy, y2: yy,
        stroke: st.colour, 'stroke-width': strokeFor(r.id, opts.highlight, 3), 'stroke-dasharray': st.dash || 'none',
      });
      for (const v of [r.interval.lower, r.interval.upper]) {
        add(series, 'line', { x1: x(v), x2: x(v), y1: yy - 7, y2: yy + 7, stroke: st.colour, 'stroke-width': 2 });
      }
      text(series, x(r.interval.lower) - 4, yy + 4, fmt(r.interval.lower, 1), { 'text-anchor': 'end', fill: st.colour });
      text(series, x(r.interval.upper) + 4, yy + 4, fmt(r.interval.upper, 1), { fill: st.colour });
    }
    const yDiamond = r.bins ? base : y0 + rowH / 2;
    add(series, 'path', { d: markerPath('diamond', x(r.expected), yDiamond, 5.5), fill: '#ffffff', stroke: '#111111', 'stroke-width': 1.5 });
    if (r.bins) {
      // With histograms, numbers go under the row label so they never sit on the bars.
      text(label, 26, y0 + rowH / 2 + 19, `expected ${fmt(r.expected, 2)}`, { fill: '#333333' });
      if (r.simulatedMean !== null) text(label, 26, y0 + rowH / 2 + 33, `simulated ${fmt(r.simulatedMean, 2)}`, { fill: '#333333' });
    } else {
      text(series, x(r.expected), yDiamond - 10, `expected ${fmt(r.expected, 2)}`, { 'text-anchor': 'middle', fill: '#111111' });
    }
  });
  axisBottom(root, x, height - bottom + 4, data.xLabel, 8);
}
