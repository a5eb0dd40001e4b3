import { type ScaleLinear } from 'd3-scale';
import { type Selection, select } from 'd3-selection';
import type { AnalysisId } from '../core/plan';
import { ANALYSIS_STYLES, CHART_FONT, DIMMED_OPACITY, type MarkerShape } from './palette';
import type { RenderOptions } from './chartTypes';

/** A d3 selection of an SVG element of any kind. */
export type Sel = Selection<SVGElement, unknown, null, undefined>;

/** Font sizes in px: nothing below 11 (readability, also in the PDF). */
export const FONT = { tick: 11, label: 12, title: 13, note: 11 } as const;

/** Append an SVG element with attributes (every appearance attribute inline, no CSS classes needed). */
export function add(parent: Sel, tag: string, attrs: Record<string, string | number> = {}): Sel {
  const node = parent.append(tag) as unknown as Sel;
  for (const [k, v] of Object.entries(attrs)) node.attr(k, typeof v === 'number' ? round(v) : v);
  return node;
}

/** Round coordinates to 2 decimals so SVG output is compact and stable. */
export function round(v: number): string {
  const r = Math.round(v * 100) / 100;
  return String(Object.is(r, -0) ? 0 : r);
}

/** Append a text element in the chart font. */
export function text(parent: Sel, x: number, y: number, content: string, attrs: Record<string, string | number> = {}): Sel {
  const t = add(parent, 'text', { x, y, 'font-family': CHART_FONT, 'font-size': FONT.tick, fill: '#222222', ...attrs });
  t.text(content);
  return t;
}

/**
 * Empty the svg and set its size, viewBox, role and accessible title/description.
 * Returns the root selection.
 */
export function prepareSvg(svg: SVGSVGElement, opts: RenderOptions, title: string, desc: string): Sel {
  const root = select(svg as SVGElement) as unknown as Sel;
  root.selectAll('*').remove();
  root
    .attr('xmlns', 'http://www.w3.org/2000/svg')
    .attr('width', opts.width)
    .attr('height', opts.height)
    .attr('viewBox', `0 0 ${opts.width} ${opts.height}`)
    .attr('role', 'img')
    .attr('font-family', CHART_FONT);
  add(root, 'title').text(title);
  add(root, 'desc').text(desc);
  add(root, 'rect', { x: 0, y: 0, width: opts.width, height: opts.height, fill: '#ffffff' });
  return root;
}

/** Numeric tick format with an ASCII minus (d3 uses U+2212, outside the PDF's Latin-1 fonts). */
export function tickFormat(scale: ScaleLinear<number, number>, count: number): (v: number) => string {
  const f = scale.tickFormat(count);
  return (v: number) => f(v).replace('\u2212', '-');
}

/** Draw a bottom axis with inline styling; `label` includes units. */
export function axisBottom(
  g: Sel,
  scale: ScaleLinear<number, number>,
  y: number,
  label: string,
  count = 6,
  format?: (v: number) => string,
): void {
  const [r0, r1] = scale.range() as [number, number];
  add(g, 'line', { x1: r0, x2: r1, y1: y, y2: y, stroke: '#444444', 'stroke-width': 1 });
  // Fewer ticks when their labels would not fit side by side (narrow charts).
  let n = count;
  let ticks = scale.ticks(n);
  let fmt = format ?? tickFormat(scale, n);
  while (n > 2 && ticks.length > 1) {
    const widest = Math.max(...ticks.map((t) => labelWidth(fmt(t))));
    if (Math.abs(r1 - r0) / (ticks.length - 1) >= widest + 8) break;
    n -= 1;
    ticks = scale.ticks(n);
    fmt = format ?? tickFormat(scale, n);
  }
  for (const t of ticks) {
    const x = scale(t);
    add(g, 'line', { x1: x, x2: x, y1: y, y2: y + 4, stroke: '#444444', 'stroke-width': 1 });
    text(g, x, y + 16, fmt(t), { 'text-anchor': 'middle' });
  }
  // The axis title: centred under the plot, wrapped and kept inside the chart.
  const width = svgWidthOf(g) ?? r1 + 24;
  axisLabelLines(label, width).forEach((line, i) => {
    const w = labelWidth(line, FONT.label);
    const cx = Math.min(Math.max((r0 + r1) / 2, 4 + w / 2), width - 4 - w / 2);
    text(g, cx, y + 34 + i * lineHeight(FONT.label), line, { 'text-anchor': 'middle', 'font-size': FONT.label });
  });
}

/** The lines a bottom axis title takes in a chart `width` px wide (for layouts: each extra line needs lineHeight(FONT.label) px). */
export function axisLabelLines(label: string, width: number): string[] {
  return wrapLabel(label, width - 8, FONT.label);
}

/** The width attribute of the svg a selection belongs to. */
function svgWidthOf(g: Sel): number | null {
  const node = g.node() as SVGElement | null;
  const svg = node?.localName === 'svg' ? node : node?.ownerSVGElement;
  const w = Number.parseFloat(svg?.getAttribute('width') ?? '');
  return Number.isFinite(w) && w > 0 ? w : null;
}

/** Draw a left axis with inline styling and a rotated label (with units), labelOffset px left of the axis. */
export function axisLeft(
  g: Sel,
  scale: ScaleLinear<number, number>,
  x: number,
  label: string,
  count = 5,
  format?: (v: number) => string,
  labelOffset = 44,
): void {
  const [r0, r1] = scale.range() as [number, number];
  add(g, 'line', { x1: x, x2: x, y1: r0, y2: r1, stroke: '#444444', 'stroke-width': 1 });
  // Ticks at least 18 px apart (short plots get fewer).
  const n = Math.max(2, Math.min(count, Math.floor(Math.abs(r1 - r0) / 18)));
  const fmt = format ?? tickFormat(scale, n);
  for (const t of scale.ticks(n)) {
    const y = scale(t);
    add(g, 'line', { x1: x - 4, x2: x, y1: y, y2: y, stroke: '#444444', 'stroke-width': 1 });
    text(g, x - 7, y + 4, fmt(t), { 'text-anchor': 'end' });
  }
  const cy = (r0 + r1) / 2;
  text(g, 0, 0, label, {
    'text-anchor': 'middle',
    'font-size': FONT.label,
    transform: `translate(${round(x - labelOffset)},${round(cy)}) rotate(-90)`,
  });
}

/** Path for a marker of the given shape centred on (x, y), size = half-width in px. */
export function markerPath(shape: MarkerShape, x: number, y: number, size: number): string {
  const s = size;
  switch (shape) {
    case 'circle':
      return `M${round(x - s)},${round(y)}a${round(s)},${round(s)} 0 1,0 ${round(2 * s)},0a${round(s)},${round(s)} 0 1,0 ${round(-2 * s)},0Z`;
    case 'square':
      return `M${round(x - s)},${round(y - s)}h${round(2 * s)}v${round(2 * s)}h${round(-2 * s)}Z`;
    case 'triangle':
      return `M${round(x)},${round(y - s * 1.15)}L${round(x + s * 1.15)},${round(y + s * 0.85)}L${round(x - s * 1.15)},${round(y + s * 0.85)}Z`;
    case 'diamond':
      return `M${round(x)},${round(y - s * 1.3)}L${round(x + s * 1.1)},${round(y)}L${round(x)},${round(y + s * 1.3)}L${round(x - s * 1.1)},${round(y)}Z`;
  }
}

/** Opacity of an analysis' marks given the linked highlight. */
export function opacityFor(id: AnalysisId, highlight: AnalysisId | null): number {
  return highlight === null || highlight === id ? 1 : DIMMED_OPACITY;
}

/** Stroke width of an analysis' lines given the linked highlight. */
export function strokeFor(id: AnalysisId, highlight: AnalysisId | null, base = 2): number {
  return highlight === id ? base + 1.5 : base;
}

/**
 * Make a series (or legend item) linked: hovering or focusing it emphasises
 * the analysis in every chart; Enter/Space toggles the emphasis. When no
 * callback is given (static export) nothing interactive is added.
 */
export function linkSeries(node: Sel, id: AnalysisId, opts: RenderOptions, focusable: boolean): void {
  const cb = opts.onHighlight;
  if (!cb) return;
  node.attr('cursor', 'pointer').attr('data-analysis', id);
  node.on('mouseenter', () => cb(id)).on('mouseleave', () => cb(null));
  if (focusable) {
    node
      .attr('tabindex', 0)
      .attr('role', 'button')
      .attr('aria-pressed', opts.highlight === id ? 'true' : 'false')
      .attr('aria-label', `Emphasise ${ANALYSIS_STYLES[id].shortLabel} in all charts`)
      .on('focus', () => cb(id))
      .on('blur', () => cb(null))
      .on('keydown', (event: KeyboardEvent) => {
        if (event.key === 'Enter' || event.key === ' ') {
          event.preventDefault();
          cb(opts.highlight === id ? null : id);
        }
      });
  }
}

/**
 * A horizontal legend of analyses (line sample with dash + marker + label).
 * Items wrap onto a new row when they would overflow `maxWidth`.
 * Returns the height used.
 */
export function analysisLegend(
  g: Sel,
  ids: readonly AnalysisId[],
  x: number,
  y: number,
  maxWidth: number,
  opts: RenderOptions,
  labels?: Partial<Record<AnalysisId, string>>,
): number {
  let cx = x;
  let cy = y;
  const rowH = 18;
  for (const id of ids) {
    const st = ANALYSIS_STYLES[id];
    const label = labels?.[id] ?? st.shortLabel;
    const w = 40 + label.length * FONT.tick * 0.64 + 16;
    if (cx + w > x + maxWidth && cx > x) {
      cx = x;
      cy += rowH;
    }
    const item = add(g, 'g', { opacity: opacityFor(id, opts.highlight) });
    item.attr('data-legend', id);
    add(item, 'rect', { x: cx - 3, y: cy - 9, width: w - 8, height: 16, fill: '#ffffff', 'fill-opacity': 0 });
    add(item, 'line', {
      x1: cx,
      x2: cx + 28,
      y1: cy,
      y2: cy,
      stroke: st.colour,
      'stroke-width': strokeFor(id, opts.highlight),
      'stroke-dasharray': st.dash || 'none',
    });
    add(item, 'path', { d: markerPath(st.marker, cx + 14, cy, 4), fill: st.colour, stroke: '#ffffff', 'stroke-width': 0.8 });
    text(item, cx + 34, cy + 4, label, { 'font-weight': opts.highlight === id ? 'bold' : 'normal' });
    linkSeries(item, id, opts, true);
    cx += w;
  }
  return cy - y + rowH;
}

/**
 * Format a number for chart labels and text alternatives: fixed decimals,
 * ASCII minus (the PDF's standard fonts are Latin-1), never "-0.00".
 */
export function fmt(v: number, digits = 2): string {
  const s = v.toFixed(digits);
  return s === `-${(0).toFixed(digits)}` ? (0).toFixed(digits) : s;
}

/** Charts narrower than this (CSS px) stack their row labels above the rows instead of beside them. */
export const COMPACT_WIDTH = 560;

/**
 * Estimated width of a label in px: characters × font size × 0.6 (0.65 bold),
 * a little wider than typical sans-serif advance widths, so layouts leave room.
 */
export function labelWidth(content: string, size: number = FONT.tick, bold = false): number {
  return content.length * size * (bold ? 0.65 : 0.6);
}

/** Split a label into lines at spaces so each fits `maxWidth` px (a single long word stays whole). */
export function wrapLabel(content: string, maxWidth: number, size: number = FONT.tick, bold = false): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of content.split(/\s+/).filter(Boolean)) {
    const next = line ? `${line} ${word}` : word;
    if (line && labelWidth(next, size, bold) > maxWidth) {
      lines.push(line);
      line = word;
    } else {
      line = next;
    }
  }
  if (line) lines.push(line);
  return lines.length > 0 ? lines : [''];
}

/** Line height in px for a font size. */
export function lineHeight(size: number = FONT.tick): number {
  return Math.round(size * 1.35);
}

/**
 * Draw a label wrapped to `maxWidth` px, first baseline at y, one text element
 * per line. Returns the number of lines drawn.
 */
export function wrappedText(parent: Sel, x: number, y: number, content: string, maxWidth: number, attrs: Record<string, string | number> = {}): number {
  const size = Number(attrs['font-size'] ?? FONT.tick);
  const lines = wrapLabel(content, maxWidth, size, attrs['font-weight'] === 'bold');
  lines.forEach((l, i) => text(parent, x, y + i * lineHeight(size), l, attrs));
  return lines.length;
}

/**
 * A label's x and anchor so it stays within [pad, width − pad]: preferably at
 * `x` with `anchor`, else flipped to the other side of x, else pushed inside.
 */
export function fitLabel(
  x: number,
  anchor: 'start' | 'end',
  content: string,
  width: number,
  { size = FONT.tick as number, bold = false, pad = 4, gap = 0 } = {},
): { x: number; anchor: 'start' | 'end' } {
  const w = labelWidth(content, size, bold);
  const fitsStart = x + gap + w <= width - pad;
  const fitsEnd = x - gap - w >= pad;
  if (anchor === 'start' ? fitsStart : !fitsEnd && fitsStart) return { x: x + gap, anchor: 'start' };
  if (fitsEnd) return { x: x - gap, anchor: 'end' };
  return { x: pad, anchor: 'start' };
}

/** How many ticks fit along `length` px when each label is about `chars` characters wide. */
export function tickCountFor(length: number, wanted: number, chars = 4): number {
  return Math.max(2, Math.min(wanted, Math.floor(length / (labelWidth('0'.repeat(chars)) + 14))));
}
