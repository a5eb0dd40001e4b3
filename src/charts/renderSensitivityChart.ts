import { scaleLinear } from 'd3-scale';
import { line as lineShape } from 'd3-shape';
import type { RenderOptions } from './chartTypes';
import type { SensitivityChartData } from './sensitivityChartData';
import { sensitivityChartText } from './sensitivityChartText';
import { ANALYSIS_STYLES, GROUP_COLOURS } from './palette';
import {
  COMPACT_WIDTH,
  FONT,
  add,
  analysisLegend,
  axisBottom,
  axisLabelLines,
  axisLeft,
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

interface SensitivityLayout {
  compact: boolean;
  left: number;
  right: number;
  bottom: number;
  titleLines: string[];
  legendY: number;
  noteLines: string[];
  minHeight: number;
}

function coincideNotes(data: SensitivityChartData): string[] {
  // What the curve holds fixed comes first (core's sensitivityCurve says it).
  return [data.holdsFixed, ...data.coincident.map(([a, b]) => `${ANALYSIS_STYLES[a].shortLabel} and ${ANALYSIS_STYLES[b].shortLabel} coincide on this axis (one line hides the other).`)];
}

function layoutSensitivity(data: SensitivityChartData, width: number): SensitivityLayout {
  const compact = width < COMPACT_WIDTH;
  const titleLines = wrapLabel(data.title, width - 24, FONT.title, true);
  const legendY = 18 + (titleLines.length - 1) * lineHeight(FONT.title) + 20;
  const noteLines = coincideNotes(data).flatMap((n) => wrapLabel(n, width - 24));
  const bottom = 52 + (axisLabelLines(data.xLabel, width).length - 1) * lineHeight(FONT.label);
  // The plot is at least as tall as its rotated axis title.
  const plotMin = Math.max(150, labelWidth(data.yLabel, FONT.label) + 20);
  const legendRows = 4 * 18; // at most one row per analysis
  const minHeight = Math.ceil(legendY + (compact ? legendRows : 18) + 4 + noteLines.length * 16 + 14 + plotMin + bottom);
  return { compact, left: compact ? 62 : 70, right: compact ? 16 : 150, bottom, titleLines, legendY, noteLines, minHeight };
}

/** The least height (px) the sensitivity chart needs at a width so its labels never overlap. */
export function sensitivityChartMinHeight(data: SensitivityChartData, width: number): number {
  return layoutSensitivity(data, width).minHeight;
}

/**
 * Draw the sensitivity chart into `svg`: one expected-bias curve per analysis,
 * the tolerated band (± share × effect), lines where the bias equals or
 * cancels the hoped-for effect, and markers at the break-even and current x.
 * Narrow charts label the reference lines inside the plot, wide ones beside it.
 */
export function renderSensitivityChart(svg: SVGSVGElement, data: SensitivityChartData, opts: RenderOptions): void {
  const alt = sensitivityChartText(data);
  const { width } = opts;
  const L = layoutSensitivity(data, width);
  const height = Math.max(opts.height, L.minHeight);
  const root = prepareSvg(svg, { ...opts, height }, data.title, alt.sentences.join(' '));
  const { left, right, bottom, compact } = L;
  L.titleLines.forEach((l, i) => text(root, 12, 18 + i * lineHeight(FONT.title), l, { 'font-size': FONT.title, 'font-weight': 'bold' }));
  const legendH = analysisLegend(root, data.series.map((s) => s.id), 12, L.legendY, width - 24, opts);
  let top = L.legendY + legendH + 4;
  // Curves drawn exactly on top of each other would hide one analysis: say so.
  for (const line of L.noteLines) {
    text(root, 12, top + 10, line, { fill: GROUP_COLOURS.muted });
    top += 16;
  }
  top += 14;
  const x = scaleLinear().domain(data.xDomain).range([left, width - right]);
  const y = scaleLinear().domain(data.yDomain).range([height - bottom, top]);
  const digits = data.mode === 'reliability' || data.mode === 'screenerReliability' ? 2 : 1;
  // Reference-line labels: in the right margin when wide, inside the plot's right end (above the line) when narrow.
  // Labels inside the plot take turns: each moves down (or up) a line until it is clear of those placed.
  const placed: { x0: number; x1: number; y0: number; y1: number }[] = [];
  const boxAt = (xv: number, yv: number, label: string, anchor: 'start' | 'end', bold: boolean) => {
    const w = labelWidth(label, FONT.tick, bold);
    const x0 = anchor === 'start' ? xv : xv - w;
    return { x0, x1: x0 + w, y0: yv - FONT.tick, y1: yv + 3 };
  };
  const clear = (b: { x0: number; x1: number; y0: number; y1: number }) =>
    placed.every((p) => Math.min(p.x1, b.x1) + 2 <= Math.max(p.x0, b.x0) || Math.min(p.y1, b.y1) + 1 <= Math.max(p.y0, b.y0));
  const placeFree = (xv: number, yv: number, step: number, label: string, anchor: 'start' | 'end', bold: boolean): number => {
    let yy = yv;
    for (let i = 0; i < 8 && !clear(boxAt(xv, yy, label, anchor, bold)); i++) yy += step;
    placed.push(boxAt(xv, yy, label, anchor, bold));
    return yy;
  };
  // Narrow charts label inside the plot: a white halo keeps those labels legible over lines (screen only;
  // the PDF and exports are drawn wide, with labels beside the plot).
  const halo: Record<string, string | number> = compact ? { stroke: '#ffffff', 'stroke-width': 3, 'paint-order': 'stroke', 'stroke-linejoin': 'round' } : {};
  const side = (yv: number, label: string, fill = '#222222') => {
    if (compact) text(root, width - right - 2, placeFree(width - right - 2, yv - 4, -14, label, 'end', false), label, { 'text-anchor': 'end', fill, ...halo });
    else text(root, width - right + 6, placeFree(width - right + 6, yv + 4, 14, label, 'start', false), label, { fill });
  };

  // Tolerated band and reference lines (none when no effect is hoped for: then any bias is a false finding).
  if (data.band.upper > data.band.lower) {
    add(root, 'rect', {
      x: left, y: y(data.band.upper), width: width - right - left, height: Math.max(0, y(data.band.lower) - y(data.band.upper)),
      fill: GROUP_COLOURS.band,
    });
    const mid = (y(data.band.upper) + y(data.band.lower)) / 2;
    side(compact ? mid + 8 : mid, `Tolerated: +/- ${fmt(data.band.upper, 2)}`, '#2f6b3a');
  }
  add(root, 'line', { x1: left, x2: width - right, y1: y(0), y2: y(0), stroke: '#999999' });
  if (data.tau !== 0) {
    for (const [v, label] of [
      [data.tau, 'Bias = effect'],
      [-data.tau, 'Cancels effect'],
    ] as [number, string][]) {
      add(root, 'line', { x1: left, x2: width - right, y1: y(v), y2: y(v), stroke: GROUP_COLOURS.reference, 'stroke-dasharray': '5 3' });
      side(y(v), `${label} (${fmt(v, 2)})`);
    }
  } else {
    side(y(0), 'No effect hoped for');
  }
  axisLeft(root, y, left, data.yLabel, 6);
  axisBottom(root, x, height - bottom + 4, data.xLabel, 8);

  // Break-even and current x, labelled beside their lines and kept inside the plot.
  const inPlot = (xv: number, anchor: 'start' | 'end', label: string): { x: number; anchor: 'start' | 'end' } => {
    const w = labelWidth(label, FONT.tick, true);
    const fitsStart = xv + 4 + w <= width - right;
    const fitsEnd = xv - 4 - w >= left;
    if (anchor === 'start' ? fitsStart : fitsStart && !fitsEnd) return { x: xv + 4, anchor: 'start' };
    if (fitsEnd) return { x: xv - 4, anchor: 'end' };
    return { x: left + 2, anchor: 'start' };
  };
  for (const be of data.breakEvenX) {
    add(root, 'line', { x1: x(be), x2: x(be), y1: top, y2: height - bottom, stroke: '#2f6b3a', 'stroke-width': 1.5, 'stroke-dasharray': '6 2' });
    const label = `Break-even ${fmt(be, data.mode === 'reliability' ? 3 : digits)}`;
    const p = inPlot(x(be), 'end', label);
    text(root, p.x, placeFree(p.x, top + 12, 14, label, p.anchor, true), label, { 'text-anchor': p.anchor, fill: '#2f6b3a', 'font-weight': 'bold', ...halo });
  }
  add(root, 'line', { x1: x(data.current), x2: x(data.current), y1: top, y2: height - bottom, stroke: '#111111', 'stroke-width': 1.5 });
  const planLabel = `This plan ${fmt(data.current, digits)}`;
  const p = inPlot(x(data.current), 'start', planLabel);
  text(root, p.x, placeFree(p.x, height - bottom - 8, -14, planLabel, p.anchor, true), planLabel, { 'font-weight': 'bold', 'text-anchor': p.anchor, ...halo });

  const line = lineShape<{ x: number; bias: number }>()
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
