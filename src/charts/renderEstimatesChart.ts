import { scaleLinear } from 'd3-scale';
import type { RenderOptions } from './chartTypes';
import type { EstimatesChartData } from './estimatesChartData';
import { estimatesChartText } from './estimatesChartText';
import { ANALYSIS_STYLES, GROUP_COLOURS } from './palette';
import {
  COMPACT_WIDTH,
  FONT,
  add,
  axisBottom,
  axisLabelLines,
  fitLabel,
  fmt,
  labelWidth,
  lineHeight,
  linkSeries,
  markerPath,
  opacityFor,
  prepareSvg,
  strokeFor,
  text,
  wrapLabel,
} from './svgHelpers';

interface EstimatesLayout {
  compact: boolean;
  left: number;
  right: number;
  bottom: number;
  titleLines: string[];
  subLines: string[];
  subY: number;
  refs: { value: number; label: string; dash: string; x: number; anchor: 'start' | 'end'; y: number }[];
  top: number;
  minRowH: number;
  minHeight: number;
}

function subtitle(data: EstimatesChartData): string {
  return data.mode === 'simulation'
    ? `Histograms of ${data.replications} simulated studies; diamond = expected estimate shown before simulation`
    : 'Bars: where 95% of study estimates should fall; diamond = expected estimate';
}

function layoutEstimates(data: EstimatesChartData, width: number): EstimatesLayout {
  const compact = width < COMPACT_WIDTH;
  const left = compact ? 34 : 162;
  const right = compact ? 34 : 24;
  const titleLines = wrapLabel(data.title, width - 24, FONT.title, true);
  const subLines = wrapLabel(subtitle(data), width - 24, FONT.tick);
  const subY = 18 + (titleLines.length - 1) * lineHeight(FONT.title) + 18;
  const subBottom = subY + (subLines.length - 1) * lineHeight(FONT.tick);
  // Reference lines: no effect, and the hoped-for effect (one line when the hoped-for effect is 0).
  // Each label runs away from the other line, kept inside the chart; a second row when they collide.
  const x = scaleLinear().domain(data.xDomain).range([left, width - right]);
  const raw: [number, string, string][] =
    data.tau === 0 ? [[0, 'No effect (the hoped-for effect is 0)', 'none']] : [[0, 'No effect', '3 3'], [data.tau, `Hoped-for effect ${fmt(data.tau, 2)}`, 'none']];
  const placed = raw.map(([value, label, dash]) => {
    const xv = x(value);
    const towardRight = value === 0 ? data.tau < 0 || (data.tau === 0 && xv < (left + width - right) / 2) : data.tau > 0;
    const fit = fitLabel(xv, towardRight ? 'start' : 'end', label, width, { gap: 4 });
    const w = labelWidth(label);
    const x0 = fit.anchor === 'start' ? fit.x : fit.x - w;
    return { value, label, dash, ...fit, x0, x1: x0 + w };
  });
  const collide = placed.length === 2 && Math.min(placed[0]!.x1, placed[1]!.x1) + 6 > Math.max(placed[0]!.x0, placed[1]!.x0);
  const top = subBottom + 26 + (collide ? 14 : 0);
  const refs = placed.map((p, i) => ({ value: p.value, label: p.label, dash: p.dash, x: p.x, anchor: p.anchor, y: top - 8 - (collide && i === 1 ? 14 : 0) }));
  const hasBins = data.rows.some((r) => r.bins);
  const minRowH = compact ? (hasBins ? 96 : 60) : hasBins ? 70 : 50;
  const bottom = 52 + (axisLabelLines(data.xLabel, width).length - 1) * lineHeight(FONT.label);
  const minHeight = Math.ceil(top + minRowH * data.rows.length + bottom);
  return { compact, left, right, bottom, titleLines, subLines, subY, refs, top, minRowH, minHeight };
}

/** The least height (px) the estimates chart needs at a width so its rows and labels never overlap. */
export function estimatesChartMinHeight(data: EstimatesChartData, width: number): number {
  return layoutEstimates(data, width).minHeight;
}

/**
 * Draw the estimates chart into `svg`: one row per analysis, with the
 * histogram of simulated estimates (or, before a simulation, the closed-form
 * 95% range), the expected estimate, and reference lines at zero and at the
 * hoped-for effect. Drawn taller than asked when the width needs it; narrow
 * charts put each analysis' name above its row.
 */
export function renderEstimatesChart(svg: SVGSVGElement, data: EstimatesChartData, opts: RenderOptions): void {
  const alt = estimatesChartText(data);
  const { width } = opts;
  const L = layoutEstimates(data, width);
  const height = Math.max(opts.height, L.minHeight);
  const root = prepareSvg(svg, { ...opts, height }, data.title, alt.sentences.join(' '));
  const { left, right, top, bottom, compact } = L;
  const x = scaleLinear().domain(data.xDomain).range([left, width - right]);
  const rowH = (height - top - bottom) / data.rows.length;

  L.titleLines.forEach((l, i) => text(root, 12, 18 + i * lineHeight(FONT.title), l, { 'font-size': FONT.title, 'font-weight': 'bold' }));
  L.subLines.forEach((l, i) => text(root, 12, L.subY + i * lineHeight(FONT.tick), l, { fill: GROUP_COLOURS.muted }));

  for (const r of L.refs) {
    const xv = x(r.value);
    add(root, 'line', { x1: xv, x2: xv, y1: top - 6, y2: height - bottom, stroke: GROUP_COLOURS.reference, 'stroke-width': 1.2, 'stroke-dasharray': r.dash });
    text(root, r.x, r.y, r.label, { 'text-anchor': r.anchor });
  }

  data.rows.forEach((r, i) => {
    const st = ANALYSIS_STYLES[r.id];
    const y0 = top + i * rowH;
    const base = y0 + rowH - 8;
    const g = add(root, 'g', { opacity: opacityFor(r.id, opts.highlight) });
    g.attr('data-series', r.id);
    add(g, 'line', { x1: left, x2: width - right, y1: base, y2: base, stroke: '#bbbbbb' });
    const label = add(g, 'g');
    const weight = opts.highlight === r.id ? 'bold' : 'normal';
    if (compact) {
      add(label, 'path', { d: markerPath(st.marker, 16, y0 + 10, 4.5), fill: st.colour });
      text(label, 28, y0 + 14, st.shortLabel, { 'font-size': FONT.label, 'font-weight': weight });
    } else {
      add(label, 'path', { d: markerPath(st.marker, 14, y0 + rowH / 2 + (r.bins ? -8 : 0), 4.5), fill: st.colour });
      text(label, 26, y0 + rowH / 2 + (r.bins ? -4 : 4), st.shortLabel, { 'font-size': FONT.label, 'font-weight': weight });
    }
    linkSeries(label, r.id, opts, true);
    const series = add(g, 'g');
    linkSeries(series, r.id, opts, false);
    // Narrow rows start below the analysis' name (and, with histograms, its figures).
    const plotTop = compact ? y0 + (r.bins ? 34 : 20) : y0;
    if (r.bins && data.maxCount > 0) {
      const h = scaleLinear().domain([0, data.maxCount]).range([base, plotTop + 6]);
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
      const yy = (plotTop + y0 + rowH) / 2 + (compact ? 2 : 0);
      add(series, 'line', {
        x1: x(r.interval.lower), x2: x(r.interval.upper), y1: yy, y2: yy,
        stroke: st.colour, 'stroke-width': strokeFor(r.id, opts.highlight, 3), 'stroke-dasharray': st.dash || 'none',
      });
      for (const v of [r.interval.lower, r.interval.upper]) {
        add(series, 'line', { x1: x(v), x2: x(v), y1: yy - 7, y2: yy + 7, stroke: st.colour, 'stroke-width': 2 });
      }
      const lo = fmt(r.interval.lower, 1);
      const hi = fmt(r.interval.upper, 1);
      const loFit = fitLabel(x(r.interval.lower), 'end', lo, width, { gap: 4 });
      const hiFit = fitLabel(x(r.interval.upper), 'start', hi, width, { gap: 4 });
      text(series, loFit.x, yy + 4, lo, { 'text-anchor': loFit.anchor, fill: st.colour });
      text(series, hiFit.x, yy + 4, hi, { 'text-anchor': hiFit.anchor, fill: st.colour });
    }
    const yDiamond = r.bins ? base : (plotTop + y0 + rowH) / 2 + (compact ? 2 : 0);
    add(series, 'path', { d: markerPath('diamond', x(r.expected), yDiamond, 5.5), fill: '#ffffff', stroke: '#111111', 'stroke-width': 1.5 });
    if (r.bins) {
      const expected = `expected ${fmt(r.expected, 2)}`;
      const simulated = r.simulatedMean !== null ? `simulated ${fmt(r.simulatedMean, 2)}` : null;
      if (compact) {
        // Narrow: the figures on one line under the name, clear of the bars.
        text(label, 28, y0 + 28, simulated ? `${expected}, ${simulated}` : expected, { fill: '#333333' });
      } else {
        // With histograms, numbers go under the row label so they never sit on the bars.
        text(label, 26, y0 + rowH / 2 + 19, expected, { fill: '#333333' });
        if (simulated) text(label, 26, y0 + rowH / 2 + 33, simulated, { fill: '#333333' });
      }
    } else {
      const label2 = `expected ${fmt(r.expected, 2)}`;
      const w = labelWidth(label2);
      const cx = Math.min(Math.max(x(r.expected), 4 + w / 2), width - 4 - w / 2);
      text(series, cx, yDiamond - 10, label2, { 'text-anchor': 'middle', fill: '#111111' });
    }
  });
  axisBottom(root, x, height - bottom + 4, data.xLabel, 8);
}
