import { scaleLinear } from 'd3-scale';
import { area as areaShape, line as lineShape } from 'd3-shape';
import type { RenderOptions } from './chartTypes';
import { GROUP_COLOURS } from './palette';
import type { SelectionPretestView } from './selectionPretestView';
import { FONT, add, axisBottom, axisLabelLines, axisLeft, fitLabel, fmt, labelWidth, lineHeight, text, wrapLabel, type Sel } from './svgHelpers';

/** Shorten user-typed labels so legends never overflow. */
function short(label: string, max = 26): string {
  return label.length > max ? `${label.slice(0, max - 1)}…` : label;
}

type LegendKind = 'population' | 'selected' | 'remeasured' | 'cut' | 'chance';

/** The legend's entries, in order. */
export function selectionLegendLabels(v: SelectionPretestView, width: number): { kind: LegendKind; label: string }[] {
  const items: { kind: LegendKind; label: string }[] = [
    { kind: 'population', label: `Population: ${short(v.populationLabel, width < 560 ? 26 : 40)}` },
    { kind: 'selected', label: `Selected, at the pretest (${fmt(v.share * 100, 0)}% of people)` },
    { kind: 'remeasured', label: 'Selected, measured again, no programme' },
    { kind: 'cut', label: `Cut-off on the ${v.basisWords}: ${v.side} ${fmt(v.cutOff, 1)}` },
  ];
  if (v.probability) items.push({ kind: 'chance', label: 'Chance of selection (right scale)' });
  return items;
}

/** The sentence above the plot: the selected group's mean at the pretest and measured again. */
export function selectionMeanLabel(v: SelectionPretestView): string {
  return `Selected mean ${fmt(v.means.selectedPretest, 1)}, measured again ${fmt(v.means.selectedRemeasured, 1)}`;
}

interface SelectionLayout {
  left: number;
  right: number;
  top: number;
  bottom: number;
  titleLines: string[];
  legend: { x: number; y: number; item: number }[];
  minHeight: number;
}

const MIN_PLOT_H = 150;
const SWATCH = 26;

function layout(v: SelectionPretestView, title: string, xLabel: string, width: number): SelectionLayout {
  const left = 60;
  const right = v.probability ? 58 : 24;
  const titleLines = wrapLabel(title, width - 24, FONT.title, true);
  const items = selectionLegendLabels(v, width);
  const legend: SelectionLayout['legend'] = [];
  let lx = 12;
  let ly = 18 + (titleLines.length - 1) * lineHeight(FONT.title) + 20;
  items.forEach((it, item) => {
    const w = SWATCH + 8 + labelWidth(it.label) + 18;
    if (lx + w > width - 8 && lx > 12) {
      lx = 12;
      ly += 18;
    }
    legend.push({ x: lx, y: ly, item });
    lx += w;
  });
  // Three rows above the plot: the population mean's label, the selected group's means, the arrow between them.
  const top = ly + 18 + 2 * 15 + 14;
  const bottom = 52 + (axisLabelLines(xLabel, width).length - 1) * lineHeight(FONT.label);
  return { left, right, top, bottom, titleLines, legend, minHeight: Math.ceil(top + MIN_PLOT_H + bottom) };
}

/** The least height (px) the selection view needs at a width. */
export function selectionPretestMinHeight(v: SelectionPretestView, title: string, xLabel: string, width: number): number {
  return layout(v, title, xLabel, width).minHeight;
}

/**
 * Draw the selection view: the population's observed pretest (grey), the
 * selected people's part of it (filled), the same people measured again with
 * no programme (dashed), the cut-off, and, when selection was not a sharp cut
 * on the pretest itself, the chance of selection at each pretest score on a
 * right-hand scale. `root` is a prepared svg (see prepareSvg).
 */
export function drawSelectionPretest(root: Sel, v: SelectionPretestView, title: string, xLabel: string, width: number, height: number): void {
  const L = layout(v, title, xLabel, width);
  const { left, right, top, bottom } = L;
  const teal = GROUP_COLOURS.programme;
  const grey = GROUP_COLOURS.comparison;
  L.titleLines.forEach((line, i) => text(root, 12, 18 + i * lineHeight(FONT.title), line, { 'font-size': FONT.title, 'font-weight': 'bold' }));

  const items = selectionLegendLabels(v, width);
  const legend = add(root, 'g');
  for (const { x: lx, y: ly, item } of L.legend) {
    const it = items[item]!;
    if (it.kind === 'population') add(legend, 'line', { x1: lx, x2: lx + SWATCH, y1: ly, y2: ly, stroke: grey, 'stroke-width': 2 });
    else if (it.kind === 'selected') add(legend, 'rect', { x: lx, y: ly - 6, width: SWATCH, height: 12, fill: teal, 'fill-opacity': 0.35, stroke: teal });
    else if (it.kind === 'remeasured') add(legend, 'line', { x1: lx, x2: lx + SWATCH, y1: ly, y2: ly, stroke: teal, 'stroke-width': 2.5, 'stroke-dasharray': '6 3' });
    else if (it.kind === 'cut') add(legend, 'line', { x1: lx + SWATCH / 2, x2: lx + SWATCH / 2, y1: ly - 7, y2: ly + 7, stroke: GROUP_COLOURS.reference, 'stroke-width': 2, 'stroke-dasharray': '3 2' });
    else add(legend, 'line', { x1: lx, x2: lx + SWATCH, y1: ly, y2: ly, stroke: '#8a3b12', 'stroke-width': 2 });
    text(legend, lx + SWATCH + 6, ly + 4, it.label);
  }

  const x = scaleLinear().domain(v.xDomain).range([left, width - right]);
  const y = scaleLinear().domain([0, v.yMax * 1.08]).range([height - bottom, top]);
  const plot = add(root, 'g');
  axisLeft(plot, y, left, 'Density (population area = 1)', 4, (t) => fmt(t, 3), 48);
  add(plot, 'line', { x1: left, x2: width - right, y1: height - bottom, y2: height - bottom, stroke: '#444444' });

  const line = lineShape<{ x: number; density: number }>()
    .x((p) => x(p.x))
    .y((p) => y(p.density))
    .digits(2);
  const area = areaShape<{ x: number; density: number }>()
    .x((p) => x(p.x))
    .y0(height - bottom)
    .y1((p) => y(p.density))
    .digits(2);
  add(plot, 'path', { d: area(v.selectedPretest) ?? '', fill: teal, 'fill-opacity': 0.35, stroke: teal, 'stroke-width': 1.5 });
  add(plot, 'path', { d: line(v.population) ?? '', fill: 'none', stroke: grey, 'stroke-width': 2 });
  add(plot, 'path', { d: line(v.selectedRemeasured) ?? '', fill: 'none', stroke: teal, 'stroke-width': 2.5, 'stroke-dasharray': '6 3' });

  if (v.probability) {
    const yp = scaleLinear().domain([0, 1]).range([height - bottom, top]);
    const pl = lineShape<{ x: number; p: number }>()
      .x((p) => x(p.x))
      .y((p) => yp(p.p))
      .digits(2);
    add(plot, 'path', { d: pl(v.probability) ?? '', fill: 'none', stroke: '#8a3b12', 'stroke-width': 2 });
    const ax = width - right;
    add(plot, 'line', { x1: ax, x2: ax, y1: top, y2: height - bottom, stroke: '#444444' });
    for (const t of [0, 0.5, 1]) {
      add(plot, 'line', { x1: ax, x2: ax + 4, y1: yp(t), y2: yp(t), stroke: '#444444' });
      text(plot, ax + 6, yp(t) + 4, `${fmt(t * 100, 0)}%`);
    }
    text(plot, 0, 0, 'Chance of selection', {
      'text-anchor': 'middle',
      'font-size': FONT.label,
      transform: `translate(${ax + 48},${(top + height - bottom) / 2}) rotate(-90)`,
    });
  }

  // The cut-off, and the means: the population's, then the selected group's at the pretest and measured again.
  const xc = x(v.cutOff);
  if (xc >= left && xc <= width - right) {
    add(plot, 'line', { x1: xc, x2: xc, y1: top, y2: height - bottom, stroke: GROUP_COLOURS.reference, 'stroke-width': 2, 'stroke-dasharray': '3 2' });
  }
  const rowPop = top - 36;
  const rowSel = top - 20;
  const rowArrow = top - 8;
  const xm = x(v.means.population);
  add(plot, 'line', { x1: xm, x2: xm, y1: rowPop + 3, y2: height - bottom, stroke: grey, 'stroke-width': 1, 'stroke-dasharray': '1 3' });
  const popLabel = `Population mean ${fmt(v.means.population, 1)}`;
  const popFit = fitLabel(xm, 'start', popLabel, width, { gap: 4 });
  text(plot, popFit.x, rowPop, popLabel, { 'text-anchor': popFit.anchor, fill: grey });
  const x0 = x(v.means.selectedPretest);
  const x1 = x(v.means.selectedRemeasured);
  for (const xv of [x0, x1]) add(plot, 'line', { x1: xv, x2: xv, y1: rowArrow, y2: height - bottom, stroke: teal, 'stroke-width': 1, 'stroke-dasharray': '2 3' });
  // The drift back toward the population mean, as an arrow just above the plot.
  const dir = x1 >= x0 ? 1 : -1;
  if (Math.abs(x1 - x0) >= 6) {
    add(plot, 'line', { x1: x0, x2: x1, y1: rowArrow, y2: rowArrow, stroke: teal, 'stroke-width': 2 });
    add(plot, 'path', { d: `M${x1 - dir * 6},${rowArrow - 4}L${x1},${rowArrow}L${x1 - dir * 6},${rowArrow + 4}`, fill: 'none', stroke: teal, 'stroke-width': 2 });
  }
  // The means' label is centred over the arrow and kept inside the chart.
  const selLabel = selectionMeanLabel(v);
  const half = labelWidth(selLabel, FONT.tick, true) / 2;
  const cx = Math.min(Math.max((x0 + x1) / 2, 4 + half), width - 4 - half);
  text(plot, cx, rowSel, selLabel, { 'text-anchor': 'middle', fill: teal, 'font-weight': 'bold' });
  axisBottom(root, x, height - bottom + 4, xLabel, 8, (t) => fmt(t, 0));
}
