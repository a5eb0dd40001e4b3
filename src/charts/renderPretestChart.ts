import { scaleLinear } from 'd3-scale';
import { line as lineShape } from 'd3-shape';
import type { RenderOptions } from './chartTypes';
import type { GroupKey, GroupsPretestChartData, PretestChartData } from './pretestChartData';
import { pretestChartText } from './pretestChartText';
import { drawSelectionPretest, selectionPretestMinHeight } from './renderSelectionPretestChart';
import { DIMMED_OPACITY, GROUP_COLOURS } from './palette';
import {
  COMPACT_WIDTH,
  FONT,
  add,
  axisBottom,
  axisLabelLines,
  axisLeft,
  fitLabel,
  fmt,
  labelWidth,
  lineHeight,
  prepareSvg,
  text,
  wrapLabel,
} from './svgHelpers';

const GROUP_DASH: Record<GroupKey, string> = { programme: 'none', comparison: '6 3' };

/** Shorten user-typed labels so legends never overflow. */
function short(label: string, max = 30): string {
  return label.length > max ? `${label.slice(0, max - 1)}…` : label;
}

/** Where the pretest chart's parts go at a width: computed once, used for the height and the drawing. */
interface PretestLayout {
  compact: boolean;
  left: number;
  right: number;
  bottom: number;
  gap: number;
  titleLines: string[];
  legend: { x: number; y: number; item: number }[];
  meanLabels: Record<GroupKey, { x: number; y: number; anchor: 'start' | 'end'; label: string }>;
  top: number;
  noteLines: string[];
  noteOnHeadingLine: boolean;
  rowStep: number;
  minHeight: number;
}

const HEADING = { people: 'Matched members', clusters: 'Matched clusters (one mark each)' } as const;
const MIN_DENSITY_H = 100;
const NOTE_ROOM = 1.15;

function legendLabels(data: GroupsPretestChartData): { label: string; w: number }[] {
  const items = (['programme', 'comparison'] as GroupKey[]).map((g) => {
    const label = `${g === 'programme' ? 'Programme' : 'Comparison'}: ${short(data.groups[g].label)}`;
    return { label, w: 44 + label.length * FONT.tick * 0.64 };
  });
  if (data.region) {
    const clusters = data.units === 'clusters';
    const label =
      data.region.source === 'example'
        ? clusters
          ? 'Means matched in the example study'
          : 'Scores matched in the example study'
        : clusters
          ? 'Means where partner clusters are expected'
          : 'Scores where partners are expected';
    items.push({ label, w: 30 + label.length * FONT.tick * 0.64 });
  }
  return items;
}

function hiddenGapNote(data: GroupsPretestChartData): string {
  return `Hidden true-score gap after matching: ${fmt(data.kelley.hiddenGap, 2)} points`;
}

function layoutPretest(data: GroupsPretestChartData, width: number): PretestLayout {
  const compact = width < COMPACT_WIDTH;
  const left = compact ? 60 : 172;
  const right = 24;
  const titleLines = wrapLabel(data.title, width - 24, FONT.title, true);
  const lhTitle = lineHeight(FONT.title);
  // Legend: group lines and the matched region; wraps onto more rows when narrow.
  const legend: PretestLayout['legend'] = [];
  let lx = 12;
  let ly = 18 + (titleLines.length - 1) * lhTitle + 18;
  legendLabels(data).forEach((it, item) => {
    if (lx + it.w > width - 8 && lx > 12) {
      lx = 12;
      ly += 18;
    }
    legend.push({ x: lx, y: ly, item });
    lx += it.w;
  });
  // Group means, labelled beside their lines: the lower group's label to the left, the higher's to
  // the right, each kept inside the chart; a second row when they would still collide.
  const x = scaleLinear().domain(data.xDomain).range([left, width - right]).nice();
  const placed = (['programme', 'comparison'] as GroupKey[]).map((g) => {
    const other = data.groups[g === 'programme' ? 'comparison' : 'programme'].mean;
    const label = `${g === 'programme' ? 'Programme' : 'Comparison'} mean ${fmt(data.groups[g].mean, 1)}`;
    const fit = fitLabel(x(data.groups[g].mean), data.groups[g].mean <= other ? 'end' : 'start', label, width, { gap: 3 });
    const w = labelWidth(label);
    const x0 = fit.anchor === 'start' ? fit.x : fit.x - w;
    return { g, label, ...fit, x0, x1: x0 + w };
  });
  const [a, b] = placed as [(typeof placed)[number], (typeof placed)[number]];
  const collide = Math.min(a.x1, b.x1) + 6 > Math.max(a.x0, b.x0);
  const meanRows = collide ? 2 : 1;
  const top = ly + 26 + 14 * meanRows;
  const meanLabels = {} as PretestLayout['meanLabels'];
  placed.forEach((p, i) => {
    meanLabels[p.g] = { x: p.x, anchor: p.anchor, label: p.label, y: top - 6 - (collide && i === 1 ? 14 : 0) };
  });
  // The matched-members panel: its heading and the hidden-gap note share a line when they fit.
  const note = hiddenGapNote(data);
  // Room for the note is judged generously (+15%): the PDF's bold font runs wider than the estimate.
  const noteOnHeadingLine = labelWidth(HEADING[data.units], FONT.label, true) + 24 + NOTE_ROOM * labelWidth(note, FONT.note, true) <= width - 12 - right;
  const noteLines = noteOnHeadingLine ? [note] : wrapLabel(note, width - 24, FONT.note, true);
  const gap = 26 + (noteOnHeadingLine ? 0 : noteLines.length * lineHeight(FONT.note));
  const rowStep = compact ? 40 : 24;
  const bottom = 52 + (axisLabelLines(data.xLabel, width).length - 1) * lineHeight(FONT.label);
  const minHeight = Math.ceil(top + MIN_DENSITY_H + gap + 28 + 3 * rowStep + bottom);
  return { compact, left, right, bottom, gap, titleLines, legend, meanLabels, top, noteLines, noteOnHeadingLine, rowStep, minHeight };
}

/** The least height (px) the pretest chart needs at a width so its rows and labels never overlap. */
export function pretestChartMinHeight(data: PretestChartData, width: number): number {
  if (data.selection) return selectionPretestMinHeight(data.selection, data.title, data.xLabel, width);
  return layoutPretest(data, width).minHeight;
}

/**
 * Draw the pretest-distributions chart into `svg`: the two groups' observed
 * pretest densities, the matched region, and a lower panel with matched
 * members' observed and (Kelley) true-score means, plus the example study's
 * matched members when a simulation exists. Drawn taller than asked when the
 * width needs it (see pretestChartMinHeight); narrow charts put row labels
 * above their rows.
 */
export function renderPretestChart(svg: SVGSVGElement, data: PretestChartData, opts: RenderOptions): void {
  const alt = pretestChartText(data);
  const { width } = opts;
  if (data.selection) {
    const height = Math.max(opts.height, pretestChartMinHeight(data, width));
    const root = prepareSvg(svg, { ...opts, height }, data.title, alt.sentences.join(' '));
    drawSelectionPretest(root, data.selection, data.title, data.xLabel, width, height);
    return;
  }
  const L = layoutPretest(data, width);
  const height = Math.max(opts.height, L.minHeight);
  const root = prepareSvg(svg, { ...opts, height }, data.title, alt.sentences.join(' '));
  const { left, right, bottom, gap, top } = L;

  L.titleLines.forEach((line, i) => text(root, 12, 18 + i * lineHeight(FONT.title), line, { 'font-size': FONT.title, 'font-weight': 'bold' }));

  const legend = add(root, 'g');
  const items = legendLabels(data);
  for (const { x: lx, y: ly, item } of L.legend) {
    const it = items[item]!;
    if (item < 2) {
      const g: GroupKey = item === 0 ? 'programme' : 'comparison';
      add(legend, 'line', { x1: lx, x2: lx + 26, y1: ly, y2: ly, stroke: GROUP_COLOURS[g], 'stroke-width': 2.5, 'stroke-dasharray': GROUP_DASH[g] });
      text(legend, lx + 32, ly + 4, it.label);
    } else {
      add(legend, 'rect', { x: lx, y: ly - 6, width: 18, height: 12, fill: GROUP_COLOURS.region, stroke: '#bbbbbb' });
      text(legend, lx + 24, ly + 4, it.label);
    }
  }
  const rowsH = 28 + 3 * L.rowStep;
  const densityH = height - top - bottom - gap - rowsH;
  const rowsTop = top + densityH + gap;
  const x = scaleLinear().domain(data.xDomain).range([left, width - right]).nice();
  const y = scaleLinear().domain([0, data.yMax * 1.08]).range([top + densityH, top]);

  const plot = add(root, 'g');
  if (data.region) {
    const x0 = Math.max(x(data.region.lower), left);
    const x1 = Math.min(x(data.region.upper), width - right);
    add(plot, 'rect', { x: x0, y: top, width: Math.max(0, x1 - x0), height: height - bottom - top, fill: GROUP_COLOURS.region });
  }
  axisLeft(plot, y, left, 'Density', 4, (v) => fmt(v, 3), L.compact ? 44 : 52);
  add(plot, 'line', { x1: left, x2: width - right, y1: top + densityH, y2: top + densityH, stroke: '#444444' });

  const line = lineShape<{ x: number; density: number }>()
    .x((p) => x(p.x))
    .y((p) => y(p.density))
    .digits(2);
  for (const g of ['comparison', 'programme'] as GroupKey[]) {
    const c = data.groups[g];
    add(plot, 'path', {
      d: line(c.points) ?? '',
      fill: 'none',
      stroke: GROUP_COLOURS[g],
      'stroke-width': 2.5,
      'stroke-dasharray': GROUP_DASH[g],
    });
    add(plot, 'line', {
      x1: x(c.mean), x2: x(c.mean), y1: top, y2: height - bottom,
      stroke: GROUP_COLOURS[g], 'stroke-width': 1, 'stroke-dasharray': '2 3',
    });
    const m = L.meanLabels[g];
    text(plot, m.x, m.y, m.label, { 'text-anchor': m.anchor, fill: GROUP_COLOURS[g] });
  }

  // Lower panel: matched members, observed vs true score.
  const emphasise = opts.highlight === null || opts.highlight === 'matchedDifference' || opts.highlight === 'ancova';
  const panel = add(root, 'g', { opacity: emphasise ? 1 : DIMMED_OPACITY + 0.3 });
  const rows: { g: GroupKey; kind: 'observed' | 'trueScore'; label: string }[] = [
    { g: 'programme', kind: 'observed', label: 'Programme, observed' },
    { g: 'programme', kind: 'trueScore', label: 'Programme, true score' },
    { g: 'comparison', kind: 'observed', label: 'Comparison, observed' },
    { g: 'comparison', kind: 'trueScore', label: 'Comparison, true score' },
  ];
  const rowY = (i: number) => rowsTop + 14 + L.rowStep * i;
  const headingY = rowsTop - 6 - (L.noteOnHeadingLine ? 0 : L.noteLines.length * lineHeight(FONT.note));
  text(panel, 12, headingY, HEADING[data.units], { 'font-size': FONT.label, 'font-weight': 'bold' });
  if (L.noteOnHeadingLine) {
    // Start-anchored at a point left of the right edge: svg2pdf places end-anchored bold text with the
    // regular font's widths, which pushed this label past the chart's right edge in the PDF.
    const note = L.noteLines[0]!;
    text(panel, width - right - NOTE_ROOM * labelWidth(note, FONT.note, true), headingY, note, { 'font-weight': 'bold' });
  } else {
    L.noteLines.forEach((l, i) => text(panel, 12, headingY + (i + 1) * lineHeight(FONT.note), l, { 'font-weight': 'bold' }));
  }
  rows.forEach((r, i) => {
    const yy = rowY(i);
    // Narrow: the row's name sits above its line; wide: in the margin beside it.
    text(panel, 12, L.compact ? yy - 8 : yy + 4, r.label, { fill: GROUP_COLOURS[r.g] });
    add(panel, 'line', { x1: left, x2: width - right, y1: yy, y2: yy, stroke: '#dddddd' });
    const marks = data.example?.[r.g] ?? [];
    for (const mk of marks) {
      const xv = x(mk[r.kind]);
      if (xv < left || xv > width - right) continue;
      add(panel, 'line', { x1: xv, x2: xv, y1: yy - 6, y2: yy + 6, stroke: GROUP_COLOURS[r.g], 'stroke-opacity': 0.3, 'stroke-width': 1 });
    }
  });
  // Kelley: same observed mean, true means pulled back toward each group's own mean.
  const k = data.kelley;
  for (const [g, iObs, iTrue] of [['programme', 0, 1], ['comparison', 2, 3]] as [GroupKey, number, number][]) {
    const xo = x(k.observed[g]);
    const xt = x(k.trueScore[g]);
    add(panel, 'line', { x1: xo, y1: rowY(iObs) + 7, x2: xt, y2: rowY(iTrue) - 8, stroke: GROUP_COLOURS[g], 'stroke-width': 1.8 });
    add(panel, 'path', { d: `M${xt - 4},${rowY(iTrue) - 14}L${xt},${rowY(iTrue) - 7}L${xt + 4},${rowY(iTrue) - 14}`, fill: 'none', stroke: GROUP_COLOURS[g], 'stroke-width': 1.8 });
    const pulled = Math.abs(k.trueScore[g] - k.observed[g]) >= 0.05;
    for (const [xv, yy, v, isTrue] of [[xo, rowY(iObs), k.observed[g], false], [xt, rowY(iTrue), k.trueScore[g], true]] as [number, number, number, boolean][]) {
      add(panel, 'path', { d: `M${xv},${yy - 6}L${xv + 6},${yy}L${xv},${yy + 6}L${xv - 6},${yy}Z`, fill: GROUP_COLOURS[g], stroke: '#ffffff', 'stroke-width': 1 });
      const label = isTrue && pulled ? `${fmt(v, 1)}, pulled toward ${fmt(data.groups[g].mean, 1)}` : fmt(v, 1);
      // Labels run rightwards unless they would leave the chart (narrow: below the row, away from the arrow).
      const preferred = !L.compact || isTrue || xt <= xo ? 'start' : 'end';
      const fit = fitLabel(xv, preferred, label, width, { bold: true, gap: 9 });
      text(panel, fit.x, L.compact ? yy + 17 : yy - 5, label, { fill: GROUP_COLOURS[g], 'font-weight': 'bold', 'text-anchor': fit.anchor });
    }
  }
  axisBottom(root, x, height - bottom + 4, data.xLabel, 8, (v) => fmt(v, 0));
}
