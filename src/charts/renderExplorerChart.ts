import { interpolateRgb, scaleLinear } from 'd3';
import { select } from 'd3-selection';
import type { ChartSize } from './chartTypes';
import type { ExplorerChartCell, ExplorerChartData } from './explorerChartData';
import { explorerChartText, formatCount, shareWithSE, sharePct, cellStateWords } from './explorerChartText';
import { ANALYSIS_STYLES, EXPLORER_COLOURS, GROUP_COLOURS } from './palette';
import { COMPACT_WIDTH, FONT, type Sel, add, axisBottom, axisLabelLines, axisLeft, fmt, labelWidth, lineHeight, markerPath, prepareSvg, round, text, wrapLabel } from './svgHelpers';

/** Options of the explorer chart: size, and (on screen) the hooks the page uses for hover, keyboard and click. */
export interface ExplorerRenderOptions extends ChartSize {
  /** Make every cell focusable (tabindex 0, role button, aria-label) and call the hooks below. Default false (PDF, exports). */
  interactive?: boolean;
  /** The cell drawn as chosen (a thick dark outline or ring); null/undefined = none. */
  selectedIndex?: number | null;
  /** Hover or keyboard focus on a cell (its index), or leaving it (null). */
  onCellFocus?: (index: number | null) => void;
  /** Click, Enter or Space on a cell (e.g. make it a candidate plan). */
  onCellActivate?: (index: number) => void;
}

const PAD = 12;
const KEY_ROW = 18;

/** The legend's items as [kind, label]; each drawn with its own swatch. */
type KeyItem = ['tolerable' | 'pending' | 'impossible' | 'band' | 'simTolerable' | 'simNot' | 'closed', string];

function keyItems(data: ExplorerChartData): KeyItem[] {
  const tol = `within ±${sharePct(data.tolerableShare)}`;
  const items: KeyItem[] =
    data.mode === 'heatmap'
      ? [['tolerable', `Tolerable (${tol})`]]
      : [
          ['band', `Tolerable band (${tol})`],
          ['simTolerable', 'Simulated ± 2 MC SE: tolerable'],
          ['simNot', 'Simulated: not tolerable'],
          ['closed', data.analysisId === 'matchedDifference' ? 'Closed form (unlimited pools)' : 'Closed form'],
        ];
  if (data.counts.pending > 0) items.push(['pending', 'Not simulated yet']);
  if (data.counts.impossible > 0 || data.counts.failed > 0) items.push(['impossible', 'Impossible plan or failed run']);
  return items;
}

const keyItemWidth = (label: string): number => 26 + labelWidth(label) + 14;

/** Rows the legend's items take at a width (they wrap). */
function keyRows(items: KeyItem[], maxWidth: number): number {
  let rows = 1;
  let x = 0;
  for (const [, label] of items) {
    const w = keyItemWidth(label);
    if (x + w > maxWidth && x > 0) {
      rows += 1;
      x = 0;
    }
    x += w;
  }
  return rows;
}

interface Layout {
  compact: boolean;
  titleLines: string[];
  rampTop: number;
  keyTop: number;
  top: number;
  left: number;
  right: number;
  cellW: number;
  cellH: number;
  plotBottom: number;
  noteLines: string[];
  height: number;
}

function notes(data: ExplorerChartData): string[] {
  const n = [`Each cell: ${formatCount(data.replications)} replications, the same seed in every cell; figures are the simulated artefact ± its Monte Carlo SE.`];
  const bad = data.cells.filter((c) => c.status === 'impossible' || c.status === 'failed');
  if (bad.length > 0) {
    const first = bad[0]!;
    n.push(`Crossed out: ${first.where}: ${shortNote(first.note)}${bad.length > 1 ? ` (and ${bad.length - 1} more; see the table)` : ''}`);
  }
  return n;
}

/** A note cut to about one sentence for the chart (the table has it whole). */
function shortNote(note: string | null): string {
  const s = note ?? '';
  const dot = s.indexOf('. ');
  const first = dot > 0 ? s.slice(0, dot + 1) : s;
  if (first.length <= 200) return first;
  const cut = first.lastIndexOf(' ', 196);
  return `${first.slice(0, cut > 100 ? cut : 196)}...`;
}

function layout(data: ExplorerChartData, width: number, minHeight: number): Layout {
  const compact = width < COMPACT_WIDTH;
  const titleLines = wrapLabel(data.title, width - 2 * PAD, FONT.title, true);
  const rampTop = 18 + (titleLines.length - 1) * lineHeight(FONT.title) + 22;
  const keyTop = data.mode === 'heatmap' ? rampTop + 44 : rampTop - 6;
  const keyH = keyRows(keyItems(data), width - 2 * PAD) * KEY_ROW;
  const top = keyTop + keyH + 10;
  const noteLines = notes(data).flatMap((n) => wrapLabel(n, width - 2 * PAD, FONT.note));
  const xLabelIndex = data.mode === 'heatmap' ? 1 : 0;
  const xLabelLines = axisLabelLines(data.axes[xLabelIndex]!.label, width).length;
  const bottomBlock = 40 + (xLabelLines - 1) * lineHeight(FONT.label) + 8 + noteLines.length * lineHeight(FONT.note);
  if (data.mode === 'heatmap') {
    const rowLabels = data.axes[0]!.valueLabels;
    const left = PAD + 20 + Math.max(...rowLabels.map((l) => labelWidth(l))) + 8;
    const right = PAD;
    const cols = data.axes[1]!.values.length;
    const rows = rowLabels.length;
    const cellW = (width - left - right) / cols;
    const cellH = Math.max(compact ? 30 : 34, Math.min(54, cellW * 0.6));
    // The plot is at least as tall as its rotated axis title.
    const plotH = Math.max(rows * cellH, Math.min(labelWidth(data.axes[0]!.label, FONT.label) + 10, rows * 54));
    const cellH2 = plotH / rows;
    const plotBottom = top + plotH;
    const height = Math.max(minHeight, Math.ceil(plotBottom + bottomBlock));
    return { compact, titleLines, rampTop, keyTop, top, left, right, cellW, cellH: cellH2, plotBottom, noteLines, height };
  }
  const plotMin = Math.max(170, labelWidth('Simulated artefact (% of effect)', FONT.label) + 20);
  const height = Math.max(minHeight, Math.ceil(top + plotMin + bottomBlock));
  const plotBottom = height - bottomBlock;
  return { compact, titleLines, rampTop, keyTop, top, left: compact ? 58 : 66, right: compact ? 14 : 24, cellW: 0, cellH: 0, plotBottom, noteLines, height };
}

/** The least height (px) the explorer chart needs at a width so nothing overlaps. */
export function explorerChartMinHeight(data: ExplorerChartData, width: number): number {
  return layout(data, width, 0).height;
}

/** The heat map's colour of a share: off-white at 0, rust below, blue above, full at ±extent. */
export function explorerColour(share: number, extent: number): string {
  const t = Math.max(-1, Math.min(1, share / extent));
  return t < 0 ? interpolateRgb(EXPLORER_COLOURS.zero, EXPLORER_COLOURS.below)(-t) : interpolateRgb(EXPLORER_COLOURS.zero, EXPLORER_COLOURS.above)(t);
}

/**
 * Diagonal hatching inside a rectangle: one path of plain line segments (no SVG
 * pattern, so the PDF draws it too; one element, not one per stroke, so a grid
 * of pending cells is quick to draw).
 */
function hatch(g: Sel, x0: number, y0: number, w: number, h: number, colour: string): void {
  let d = '';
  for (let t = 6; t < w + h; t += 7) {
    d += `M${round(x0 + Math.min(t, w))},${round(y0 + Math.max(0, t - w))}L${round(x0 + Math.max(0, t - h))},${round(y0 + Math.min(t, h))}`;
  }
  add(g, 'path', { d, fill: 'none', stroke: colour, 'stroke-width': 1 }).attr('data-hatch', 'true');
}

function cross(g: Sel, x0: number, y0: number, w: number, h: number): void {
  add(g, 'line', { x1: x0 + 3, y1: y0 + 3, x2: x0 + w - 3, y2: y0 + h - 3, stroke: EXPLORER_COLOURS.impossible, 'stroke-width': 1.5 });
  add(g, 'line', { x1: x0 + w - 3, y1: y0 + 3, x2: x0 + 3, y2: y0 + h - 3, stroke: EXPLORER_COLOURS.impossible, 'stroke-width': 1.5 });
}

/** What a cell's aria-label and hover say. */
function cellLabel(c: ExplorerChartCell): string {
  if (c.status !== 'done' || c.share === null) return `${c.where}: ${cellStateWords(c)}`;
  const extra = [
    c.discardedShare === null ? '' : `, ${sharePct(c.discardedShare)} of the programme pool discarded`,
    c.power === null ? '' : `, power ${sharePct(c.power)}`,
  ].join('');
  return `${c.where}: artefact ${shareWithSE(c)} of the effect, ${cellStateWords(c)}${extra}`;
}

/** Give a cell's mark data-cell-index and, when interactive, focus, hover and activation. */
function hookCell(node: Sel, c: ExplorerChartCell, opts: ExplorerRenderOptions): void {
  node.attr('data-cell-index', c.index);
  if (!opts.interactive) return;
  node
    .attr('tabindex', 0)
    .attr('role', 'button')
    .attr('aria-label', cellLabel(c))
    .attr('cursor', 'pointer')
    .attr('aria-pressed', opts.selectedIndex === c.index ? 'true' : 'false');
  const focus = opts.onCellFocus;
  const activate = opts.onCellActivate;
  if (focus) {
    node.on('mouseenter', () => focus(c.index)).on('mouseleave', () => focus(null));
    node.on('focus', () => focus(c.index)).on('blur', () => focus(null));
  }
  if (activate) {
    node.on('click', () => activate(c.index));
    node.on('keydown', (event: KeyboardEvent) => {
      if (event.key === 'Enter' || event.key === ' ') {
        event.preventDefault();
        activate(c.index);
      }
    });
  }
}

function drawKey(root: Sel, data: ExplorerChartData, L: Layout, width: number): void {
  let x = PAD;
  let y = L.keyTop + 8;
  for (const [kind, label] of keyItems(data)) {
    const w = keyItemWidth(label);
    if (x + w > width - PAD && x > PAD) {
      x = PAD;
      y += KEY_ROW;
    }
    const g = add(root, 'g');
    g.attr('data-key', kind);
    const sx = x;
    const sy = y - 7;
    switch (kind) {
      case 'tolerable':
        add(g, 'rect', { x: sx, y: sy, width: 18, height: 14, fill: EXPLORER_COLOURS.zero, stroke: EXPLORER_COLOURS.tolerable, 'stroke-width': 2.5 });
        break;
      case 'pending':
        add(g, 'rect', { x: sx, y: sy, width: 18, height: 14, fill: '#ffffff', stroke: EXPLORER_COLOURS.pending });
        hatch(g, sx, sy, 18, 14, EXPLORER_COLOURS.pending);
        break;
      case 'impossible':
        add(g, 'rect', { x: sx, y: sy, width: 18, height: 14, fill: '#ffffff', stroke: EXPLORER_COLOURS.impossible });
        cross(g, sx, sy, 18, 14);
        break;
      case 'band':
        add(g, 'rect', { x: sx, y: sy, width: 18, height: 14, fill: GROUP_COLOURS.band });
        break;
      case 'simTolerable':
      case 'simNot': {
        const colour = ANALYSIS_STYLES[data.analysisId].colour;
        add(g, 'line', { x1: sx + 9, x2: sx + 9, y1: sy - 1, y2: sy + 15, stroke: colour, 'stroke-width': 1.5 });
        add(g, 'path', { d: markerPath('circle', sx + 9, sy + 7, 4.5), fill: kind === 'simTolerable' ? colour : '#ffffff', stroke: colour, 'stroke-width': 1.5 });
        break;
      }
      case 'closed':
        add(g, 'line', { x1: sx, x2: sx + 18, y1: sy + 7, y2: sy + 7, stroke: EXPLORER_COLOURS.closedForm, 'stroke-width': 1.8, 'stroke-dasharray': '5 3' });
        break;
    }
    text(g, sx + 24, y + 4, label);
    x += w;
  }
}

function drawRamp(root: Sel, data: ExplorerChartData, L: Layout, width: number): void {
  const rampW = Math.min(240, width - 2 * PAD - 80);
  const x0 = PAD;
  const y0 = L.rampTop + 6;
  text(root, x0, L.rampTop, 'Simulated artefact, % of the hoped-for effect', { 'font-size': FONT.label });
  const steps = 24;
  for (let i = 0; i < steps; i++) {
    const share = -data.colourExtent + ((2 * data.colourExtent) * (i + 0.5)) / steps;
    add(root, 'rect', { x: x0 + (rampW * i) / steps, y: y0, width: rampW / steps + 0.5, height: 12, fill: explorerColour(share, data.colourExtent) });
  }
  add(root, 'rect', { x: x0, y: y0, width: rampW, height: 12, fill: 'none', stroke: '#888888', 'stroke-width': 0.6 });
  const tickY = y0 + 12 + 13;
  text(root, x0, tickY, sharePct(-data.colourExtent), { 'text-anchor': 'start' });
  text(root, x0 + rampW / 2, tickY, '0', { 'text-anchor': 'middle' });
  text(root, x0 + rampW, tickY, `+${sharePct(data.colourExtent)}`, { 'text-anchor': 'end' });
}

function drawNotes(root: Sel, L: Layout, startY: number): void {
  L.noteLines.forEach((line, i) => text(root, PAD, startY + i * lineHeight(FONT.note), line, { fill: GROUP_COLOURS.muted, 'font-size': FONT.note }));
}

function drawHeatmap(root: Sel, data: ExplorerChartData, L: Layout, width: number, opts: ExplorerRenderOptions): Map<number, Sel> {
  const [rowAxis, colAxis] = data.axes as [ExplorerChartData['axes'][0], ExplorerChartData['axes'][0]];
  const { left, top, cellW, cellH } = L;
  // Row labels (axis 0) and its rotated title.
  rowAxis.valueLabels.forEach((label, r) => text(root, left - 6, top + (r + 0.5) * cellH + 4, label, { 'text-anchor': 'end' }));
  const midY = (top + L.plotBottom) / 2;
  text(root, 0, 0, rowAxis.label.length * FONT.label * 0.6 > L.plotBottom - top + 40 ? rowAxis.shortLabel : rowAxis.label, {
    'text-anchor': 'middle', 'font-size': FONT.label, transform: `translate(${round(PAD + 8)},${round(midY)}) rotate(-90)`,
  });
  // Column labels (axis 1): every k-th when they would not fit side by side.
  const widest = Math.max(...colAxis.valueLabels.map((l) => labelWidth(l)));
  const every = Math.max(1, Math.ceil((widest + 6) / cellW));
  colAxis.valueLabels.forEach((label, c) => {
    if (c % every === 0 || c === colAxis.valueLabels.length - 1) {
      if (c !== colAxis.valueLabels.length - 1 && c + every > colAxis.valueLabels.length - 1 && (colAxis.valueLabels.length - 1 - c) * cellW < widest + 6) return;
      text(root, left + (c + 0.5) * cellW, L.plotBottom + 16, label, { 'text-anchor': 'middle' });
    }
  });
  axisLabelLines(colAxis.label, width).forEach((line, i) => {
    const w = labelWidth(line, FONT.label);
    const cx = Math.min(Math.max((left + width - L.right) / 2, 4 + w / 2), width - 4 - w / 2);
    text(root, cx, L.plotBottom + 34 + i * lineHeight(FONT.label), line, { 'text-anchor': 'middle', 'font-size': FONT.label });
  });
  const cellNodes = new Map<number, Sel>();
  for (const c of data.cells) cellNodes.set(c.index, drawHeatmapCell(root, c, data, L, opts));
  return cellNodes;
}

/** One heat-map cell: its group (fill, hatching or cross, share and ± MC SE, outlines), appended to `root`. */
function drawHeatmapCell(root: Sel, c: ExplorerChartCell, data: ExplorerChartData, L: Layout, opts: ExplorerRenderOptions): Sel {
  const { left, top, cellW, cellH } = L;
  const twoLines = cellW >= 58 && cellH >= 34;
  const oneLine = cellW >= 36;
  const x0 = left + c.col * cellW;
  const y0 = top + c.row * cellH;
  const g = add(root, 'g');
  g.attr('data-status', c.status);
  const fill = c.share !== null ? explorerColour(c.share, data.colourExtent) : '#ffffff';
  const rect = add(g, 'rect', { x: x0 + 1, y: y0 + 1, width: cellW - 2, height: cellH - 2, fill, stroke: '#ffffff', 'stroke-width': 1 });
  if (c.status === 'pending') hatch(g, x0 + 1, y0 + 1, cellW - 2, cellH - 2, EXPLORER_COLOURS.pending);
  if (c.status === 'impossible' || c.status === 'failed') cross(g, x0 + 1, y0 + 1, cellW - 2, cellH - 2);
  if (c.share !== null && oneLine) {
    const t = Math.abs(c.share) / data.colourExtent;
    const ink = t > 0.55 ? '#ffffff' : '#1a1a1a';
    const cx = x0 + cellW / 2;
    const cy = y0 + cellH / 2;
    text(g, cx, twoLines ? cy - 2 : cy + 4, sharePct(c.share), { 'text-anchor': 'middle', fill: ink, 'font-weight': 'bold' });
    if (twoLines && c.shareMCSE !== null) text(g, cx, cy + 12, `± ${fmt(c.shareMCSE * 100, 1)}%`, { 'text-anchor': 'middle', fill: ink });
  }
  if (c.tolerable === true) {
    add(g, 'rect', { x: x0 + 2.5, y: y0 + 2.5, width: cellW - 5, height: cellH - 5, fill: 'none', stroke: EXPLORER_COLOURS.tolerable, 'stroke-width': 3 });
  }
  if (opts.selectedIndex === c.index) {
    add(g, 'rect', { x: x0 - 0.5, y: y0 - 0.5, width: cellW + 1, height: cellH + 1, fill: 'none', stroke: EXPLORER_COLOURS.selected, 'stroke-width': 2.5, 'stroke-dasharray': '6 3' });
  }
  hookCell(rect, c, opts);
  return g;
}

function drawCurves(root: Sel, data: ExplorerChartData, L: Layout, width: number, opts: ExplorerRenderOptions): void {
  const axis = data.axes[0]!;
  const { left, top } = L;
  const right = width - L.right;
  const lo = Math.min(...axis.values);
  const hi = Math.max(...axis.values);
  const span = hi - lo || 1;
  const x = scaleLinear().domain([lo - span * 0.04, hi + span * 0.04]).range([left, right]);
  const y = scaleLinear().domain(data.yDomain).range([L.plotBottom, top]);
  const band = [data.tolerableShare, -data.tolerableShare] as const;
  add(root, 'rect', { x: left, y: y(band[0]), width: right - left, height: Math.max(0, y(band[1]) - y(band[0])), fill: GROUP_COLOURS.band });
  add(root, 'line', { x1: left, x2: right, y1: y(0), y2: y(0), stroke: '#999999' });
  axisLeft(root, y, left, 'Artefact (% of effect)', 6, (v) => `${fmt(v * 100, 0)}%`, L.compact ? 44 : 50);
  axisBottom(root, x, L.plotBottom + 4, axis.label, 8);
  // Closed form: a dashed line through the cells that have one.
  const closed = data.cells.filter((c) => c.closedFormShare !== null).sort((a, b) => a.values[0]! - b.values[0]!);
  if (closed.length > 0) {
    const d = closed.map((c, i) => `${i === 0 ? 'M' : 'L'}${round(x(c.values[0]!))},${round(y(c.closedFormShare!))}`).join('');
    const path = add(root, 'path', { d, fill: 'none', stroke: EXPLORER_COLOURS.closedForm, 'stroke-width': 1.8, 'stroke-dasharray': '5 3' });
    path.attr('data-series', 'closed-form');
  }
  const colour = ANALYSIS_STYLES[data.analysisId].colour;
  const slot = (right - left) / Math.max(1, data.cells.length);
  for (const c of data.cells) {
    const cx = x(c.values[0]!);
    const g = add(root, 'g');
    g.attr('data-status', c.status);
    if (c.share !== null) {
      const se2 = 2 * (c.shareMCSE ?? 0);
      add(g, 'line', { x1: cx, x2: cx, y1: y(c.share - se2), y2: y(c.share + se2), stroke: colour, 'stroke-width': 1.5 });
      for (const v of [c.share - se2, c.share + se2]) add(g, 'line', { x1: cx - 4, x2: cx + 4, y1: y(v), y2: y(v), stroke: colour, 'stroke-width': 1.5 });
      add(g, 'path', { d: markerPath('circle', cx, y(c.share), 4.5), fill: c.tolerable ? colour : '#ffffff', stroke: colour, 'stroke-width': 1.8 });
    } else if (c.status === 'pending') {
      add(g, 'rect', { x: cx - 6, y: L.plotBottom - 14, width: 12, height: 12, fill: '#ffffff', stroke: EXPLORER_COLOURS.pending });
      hatch(g, cx - 6, L.plotBottom - 14, 12, 12, EXPLORER_COLOURS.pending);
    } else {
      cross(g, cx - 8, L.plotBottom - 16, 16, 16);
    }
    if (opts.selectedIndex === c.index) {
      add(g, 'rect', { x: cx - slot / 2 + 1, y: top, width: slot - 2, height: L.plotBottom - top, fill: 'none', stroke: EXPLORER_COLOURS.selected, 'stroke-width': 1.5, 'stroke-dasharray': '6 3' });
    }
    // A transparent column over the cell: the mark hover, focus and click use.
    const hit = add(g, 'rect', { x: cx - Math.min(slot, 40) / 2, y: top, width: Math.min(slot, 40), height: L.plotBottom - top, fill: '#ffffff', 'fill-opacity': 0 });
    hookCell(hit, c, opts);
  }
}

/**
 * Draw the explorer chart into `svg`. Two inputs: a heat map of the
 * simulated artefact share (diverging colours centred on 0; each cell's share
 * and ± MC SE when there is room; tolerable cells outlined; cells not
 * simulated yet hatched; impossible or failed cells crossed out with a short
 * note below). One input: the simulated share with ±2 MC SE bars, the closed
 * form as a dashed line and the tolerable band shaded. Every cell's mark
 * carries data-cell-index; with `interactive` it is focusable and calls
 * onCellFocus / onCellActivate. The height grows to fit (explorerChartMinHeight).
 */
export function renderExplorerChart(svg: SVGSVGElement, data: ExplorerChartData, opts: ExplorerRenderOptions): void {
  const { width } = opts;
  const L = layout(data, width, opts.height);
  const alt = explorerChartText(data);
  const desc = alt.sentences.join(' ');
  const drawn = drawnHeatmaps.get(svg);
  drawnHeatmaps.delete(svg);
  if (data.mode === 'heatmap') {
    const frame = heatmapFrameKey(data, L, opts);
    if (drawn && drawn.frame === frame && drawn.onCellFocus === opts.onCellFocus && drawn.onCellActivate === opts.onCellActivate && updateHeatmapCells(svg, drawn, data, L, opts, desc)) {
      drawnHeatmaps.set(svg, drawn);
      return;
    }
    const root = drawFrame(svg, data, L, width, desc);
    drawRamp(root, data, L, width);
    drawKey(root, data, L, width);
    const nodes = drawHeatmap(root, data, L, width, opts);
    drawNotes(root, L, notesTop(data, L, width));
    drawnHeatmaps.set(svg, {
      frame,
      cells: new Map(data.cells.map((c) => [c.index, { key: JSON.stringify(c), node: nodes.get(c.index)! }])),
      onCellFocus: opts.onCellFocus,
      onCellActivate: opts.onCellActivate,
    });
    return;
  }
  const root = drawFrame(svg, data, L, width, desc);
  drawKey(root, data, L, width);
  drawCurves(root, data, L, width, opts);
  drawNotes(root, L, notesTop(data, L, width));
}

/** A fresh chart: the SVG emptied, sized, titled and described, with the title lines drawn. */
function drawFrame(svg: SVGSVGElement, data: ExplorerChartData, L: Layout, width: number, desc: string): Sel {
  const root = prepareSvg(svg, { width, height: L.height, highlight: null }, data.title, desc);
  L.titleLines.forEach((l, i) => text(root, PAD, 18 + i * lineHeight(FONT.title), l, { 'font-size': FONT.title, 'font-weight': 'bold' }));
  return root;
}

function notesTop(data: ExplorerChartData, L: Layout, width: number): number {
  const xLabel = data.axes[data.mode === 'heatmap' ? 1 : 0]!.label;
  return L.plotBottom + 40 + (axisLabelLines(xLabel, width).length - 1) * lineHeight(FONT.label) + 8 + 4;
}

/**
 * What a heat map drawn into an SVG element looks like apart from its cells:
 * while a grid fills in, a redraw whose frame is unchanged (same size, title,
 * colour scale, key, notes, axes and chosen cell) replaces only the cells that
 * changed (updateHeatmapCells), which gives the same SVG as drawing it whole.
 */
interface DrawnHeatmap {
  frame: string;
  cells: Map<number, { key: string; node: Sel }>;
  onCellFocus: ExplorerRenderOptions['onCellFocus'];
  onCellActivate: ExplorerRenderOptions['onCellActivate'];
}
const drawnHeatmaps = new WeakMap<SVGSVGElement, DrawnHeatmap>();

/** Everything outside the cells that a heat map's drawing depends on. */
function heatmapFrameKey(data: ExplorerChartData, L: Layout, opts: ExplorerRenderOptions): string {
  return JSON.stringify([
    opts.width, L, data.title, data.colourExtent, data.tolerableShare, data.axes, keyItems(data), data.replications,
    opts.interactive ?? false, opts.selectedIndex ?? null, data.cells.map((c) => c.index),
  ]);
}

/**
 * Redraw only the heat-map cells whose figures changed, in place (document
 * order kept), and the description. False when the SVG no longer holds the
 * drawn cells (e.g. emptied elsewhere): then the caller draws it whole.
 */
function updateHeatmapCells(svg: SVGSVGElement, drawn: DrawnHeatmap, data: ExplorerChartData, L: Layout, opts: ExplorerRenderOptions, desc: string): boolean {
  const descNode = Array.from(svg.children).find((e) => e.tagName.toLowerCase() === 'desc');
  if (!descNode) return false;
  for (const { node } of drawn.cells.values()) if (node.node()?.parentNode !== svg) return false;
  const root = select(svg as SVGElement) as unknown as Sel;
  for (const c of data.cells) {
    const old = drawn.cells.get(c.index)!;
    const key = JSON.stringify(c);
    if (old.key === key) continue;
    const node = drawHeatmapCell(root, c, data, L, opts);
    const oldNode = old.node.node()!;
    svg.insertBefore(node.node()!, oldNode);
    oldNode.remove();
    drawn.cells.set(c.index, { key, node });
  }
  if (descNode.textContent !== desc) descNode.textContent = desc;
  return true;
}
