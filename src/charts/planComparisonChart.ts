import { scaleLinear } from 'd3-scale';
import type { PlanComparisonRow } from '../core/comparePlans';
import type { ChartSize, ChartText, RenderOptions } from './chartTypes';
import { add, FONT, prepareSvg, text } from './svgHelpers';

/** What the candidate-plans chart draws: per variant, the artefact's share of the effect and the power with and without it. */
export interface PlanComparisonChartData {
  title: string;
  /** The tolerable share of the effect (of the first plan), drawn as a shaded band; null when the effect is 0. */
  tolerableShare: number | null;
  rows: { name: string; analysisName: string; artefactShare: number | null; power: number | null; powerWithoutBias: number | null }[];
}

/** The chart's data from comparePlans' rows (a pure transform: nothing computed, only picked). */
export function planComparisonChartData(rows: readonly PlanComparisonRow[], tolerableShare: number | null): PlanComparisonChartData {
  return {
    title: 'Candidate plans: artefact as a share of the effect, and power',
    tolerableShare,
    rows: rows.map((r) => ({ name: r.name, analysisName: r.analysisName, artefactShare: r.artefactShare, power: r.power, powerWithoutBias: r.powerWithoutBias })),
  };
}

const pct = (x: number | null): string => (x === null ? 'n/a' : `${Math.round(x * 100)}%`);

/** The text alternative: one sentence per variant and a table of the plotted values. */
export function planComparisonChartText(data: PlanComparisonChartData): ChartText {
  return {
    title: data.title,
    sentences: data.rows.map(
      (r) => `${r.name} (${r.analysisName}): artefact ${pct(r.artefactShare)} of the effect; power ${pct(r.power)} (${pct(r.powerWithoutBias)} without the artefact).`,
    ),
    table: {
      caption: data.title,
      columns: ['Variant', 'Analysis', 'Artefact, share of effect', 'Power', 'Power without artefact'],
      rows: data.rows.map((r) => [r.name, r.analysisName, pct(r.artefactShare), pct(r.power), pct(r.powerWithoutBias)]),
    },
  };
}

/** The chart's height for a number of variants. */
export function planComparisonChartSize(width: number, count: number): ChartSize {
  return { width, height: 90 + count * 46 + (width < 520 ? count * 16 + 36 : 0) };
}

/**
 * Draw the chart: left, each variant's artefact as a bar from zero (share of
 * the effect) over the shaded tolerable band; right, its power as a bar with
 * a tick at the power without the artefact. Labels above the bars when narrow.
 */
export function renderPlanComparisonChart(svg: SVGSVGElement, data: PlanComparisonChartData, opts: RenderOptions): void {
  const desc = planComparisonChartText(data).sentences.join(' ');
  const root = prepareSvg(svg, opts, data.title, desc);
  const narrow = opts.width < 520;
  const left = narrow ? 8 : Math.min(200, opts.width * 0.3);
  const gap = narrow ? 16 : 28;
  const right = 8;
  const top = narrow ? 62 : 44;
  const rowH = 46 + (narrow ? 16 : 0);
  const plotW = (opts.width - left - right - gap) / 2;
  // Room inside each plot for the value labels beside the bars.
  const pad = 34;
  const x0 = left;
  const x1 = left + plotW + gap;
  if (narrow) {
    const [head, tail] = data.title.split(': ');
    text(root, 8, 18, `${head}:`, { 'font-size': FONT.title, 'font-weight': 'bold' });
    text(root, 8, 34, tail ?? '', { 'font-size': FONT.title, 'font-weight': 'bold' });
  } else text(root, 8, 18, data.title, { 'font-size': FONT.title, 'font-weight': 'bold' });
  const shares = data.rows.flatMap((r) => (r.artefactShare === null ? [] : [r.artefactShare]));
  const tol = data.tolerableShare ?? 0;
  const ext = Math.max(0.3, tol * 1.2, ...shares.map(Math.abs)) * 1.05;
  const sx = scaleLinear().domain([-ext, ext]).range([x0 + pad, x0 + plotW - pad]).nice();
  const px = scaleLinear().domain([0, 1]).range([x1, x1 + plotW - 6]);
  const bottom = top + data.rows.length * rowH;
  text(root, x0, top - 10, narrow ? 'Artefact / effect' : 'Artefact, share of the effect', { 'font-size': FONT.label });
  text(root, x1, top - 10, narrow ? 'Power' : 'Power (tick: without the artefact)', { 'font-size': FONT.label });
  if (data.tolerableShare !== null) {
    add(root, 'rect', { x: sx(-tol), y: top, width: sx(tol) - sx(-tol), height: bottom - top, fill: '#e3f1e6' });
  }
  add(root, 'line', { x1: sx(0), x2: sx(0), y1: top, y2: bottom, stroke: '#555555', 'stroke-width': 1 });
  for (const t of sx.ticks(narrow ? 2 : 4)) {
    text(root, sx(t), bottom + 14, `${Math.round(t * 100)}%`, { 'text-anchor': 'middle' });
  }
  for (const t of narrow ? [0.5, 1] : [0.5, 0.8, 1]) text(root, px(t), bottom + 14, `${Math.round(t * 100)}%`, { 'text-anchor': t === 1 ? 'end' : 'middle' });
  add(root, 'line', { x1: px(0), x2: px(0), y1: top, y2: bottom, stroke: '#555555', 'stroke-width': 1 });
  add(root, 'line', { x1: px(0.8), x2: px(0.8), y1: top, y2: bottom, stroke: '#999999', 'stroke-dasharray': '2 3' });
  if (narrow) text(root, 8, bottom + 30, 'Shaded: tolerable. Tick: power without the artefact.', { 'font-size': FONT.note });
  data.rows.forEach((r, i) => {
    const y = top + i * rowH + (narrow ? 16 : 0);
    const label = `${r.name}`;
    if (narrow) text(root, 8, y + 2, label.length > 60 ? `${label.slice(0, 57)}...` : label, { 'font-size': FONT.tick, 'font-weight': 'bold' });
    else text(root, left - 8, y + 20, label.length > 28 ? `${label.slice(0, 26)}...` : label, { 'text-anchor': 'end', 'font-size': FONT.tick });
    if (r.artefactShare !== null) {
      const a = sx(Math.min(0, r.artefactShare));
      const w = Math.abs(sx(r.artefactShare) - sx(0));
      const ok = Math.abs(r.artefactShare) <= tol;
      add(root, 'rect', { x: a, y: y + 8, width: Math.max(1, w), height: 20, fill: ok ? '#2e7d4f' : '#b3412e' });
      text(root, r.artefactShare < 0 ? a - 4 : a + w + 4, y + 22, pct(r.artefactShare), { 'text-anchor': r.artefactShare < 0 ? 'end' : 'start' });
    }
    if (r.power !== null) {
      add(root, 'rect', { x: px(0), y: y + 8, width: px(r.power) - px(0), height: 20, fill: '#3b6ea5' });
      const inside = r.power > 0.75;
      text(root, inside ? px(r.power) - 4 : px(r.power) + 4, y + 22, pct(r.power), inside ? { 'text-anchor': 'end', fill: '#ffffff' } : {});
    }
    if (r.powerWithoutBias !== null) add(root, 'line', { x1: px(r.powerWithoutBias), x2: px(r.powerWithoutBias), y1: y + 4, y2: y + 32, stroke: '#111111', 'stroke-width': 2 });
  });
}

/** The chart as a standalone SVG string (for the PDF); needs a DOM (browser or jsdom). */
export function planComparisonChartSvg(data: PlanComparisonChartData, size: ChartSize): string {
  const svg = document.createElementNS('http://www.w3.org/2000/svg', 'svg');
  renderPlanComparisonChart(svg, data, { ...size, highlight: null });
  const body = new XMLSerializer().serializeToString(svg);
  return body.includes('xmlns="http://www.w3.org/2000/svg"') ? body : body.replace('<svg', '<svg xmlns="http://www.w3.org/2000/svg"');
}
