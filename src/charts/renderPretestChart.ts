import * as d3 from 'd3';
import type { RenderOptions } from './chartTypes';
import type { GroupKey, PretestChartData } from './pretestChartData';
import { pretestChartText } from './pretestChartText';
import { DIMMED_OPACITY, GROUP_COLOURS } from './palette';
import { FONT, add, axisBottom, axisLeft, fmt, prepareSvg, text, type Sel } from './svgHelpers';

const GROUP_DASH: Record<GroupKey, string> = { programme: 'none', comparison: '6 3' };

/** Shorten user-typed labels so legends never overflow. */
function short(label: string, max = 30): string {
  return label.length > max ? `${label.slice(0, max - 1)}…` : label;
}

/**
 * Draw the pretest-distributions chart into `svg`: the two groups' observed
 * pretest densities, the matched region, and a lower panel with matched
 * members' observed and (Kelley) true-score means, plus the example study's
 * matched members when a simulation exists.
 */
export function renderPretestChart(svg: SVGSVGElement, data: PretestChartData, opts: RenderOptions): void {
  const alt = pretestChartText(data);
  const root = prepareSvg(svg, opts, data.title, alt.sentences.join(' '));
  const { width, height } = opts;
  const left = 172;
  const right = 24;
  const bottom = 52;
  const gap = 26;

  text(root, 12, 18, data.title, { 'font-size': FONT.title, 'font-weight': 'bold' });

  // Legend: group lines and the matched region; wraps onto a second row when narrow.
  const legend = add(root, 'g');
  const items: { w: number; draw: (lx: number, ly: number) => void }[] = [];
  for (const g of ['programme', 'comparison'] as GroupKey[]) {
    const label = `${g === 'programme' ? 'Programme' : 'Comparison'}: ${short(data.groups[g].label)}`;
    items.push({
      w: 44 + label.length * FONT.tick * 0.64,
      draw: (lx, ly) => {
        add(legend, 'line', { x1: lx, x2: lx + 26, y1: ly, y2: ly, stroke: GROUP_COLOURS[g], 'stroke-width': 2.5, 'stroke-dasharray': GROUP_DASH[g] });
        text(legend, lx + 32, ly + 4, label);
      },
    });
  }
  if (data.region) {
    const label = data.region.source === 'example' ? 'Scores matched in the example study' : 'Scores where partners are expected';
    items.push({
      w: 30 + label.length * FONT.tick * 0.64,
      draw: (lx, ly) => {
        add(legend, 'rect', { x: lx, y: ly - 6, width: 18, height: 12, fill: GROUP_COLOURS.region, stroke: '#bbbbbb' });
        text(legend, lx + 24, ly + 4, label);
      },
    });
  }
  let lx = 12;
  let ly = 36;
  for (const it of items) {
    if (lx + it.w > width - 8 && lx > 12) {
      lx = 12;
      ly += 18;
    }
    it.draw(lx, ly);
    lx += it.w;
  }
  const top = ly + 40;
  const densityH = Math.max(80, (height - top - bottom - gap) * 0.5);
  const rowsTop = top + densityH + gap;
  const rowsH = height - bottom - rowsTop;
  const x = d3.scaleLinear().domain(data.xDomain).range([left, width - right]).nice();
  const y = d3.scaleLinear().domain([0, data.yMax * 1.08]).range([top + densityH, top]);

  const plot = add(root, 'g');
  if (data.region) {
    const x0 = Math.max(x(data.region.lower), left);
    const x1 = Math.min(x(data.region.upper), width - right);
    add(plot, 'rect', { x: x0, y: top, width: Math.max(0, x1 - x0), height: height - bottom - top, fill: GROUP_COLOURS.region });
  }
  axisLeft(plot, y, left, 'Density', 4, (v) => fmt(v, 3), 52);
  add(plot, 'line', { x1: left, x2: width - right, y1: top + densityH, y2: top + densityH, stroke: '#444444' });

  const line = d3
    .line<{ x: number; density: number }>()
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
    text(plot, x(c.mean) + (c.mean <= data.groups[g === 'programme' ? 'comparison' : 'programme'].mean ? -3 : 3), top - 6, `${g === 'programme' ? 'Programme' : 'Comparison'} mean ${fmt(c.mean, 1)}`, {
      // The lower group's label runs left of its line, the higher group's right, so they never collide.
      'text-anchor': c.mean <= data.groups[g === 'programme' ? 'comparison' : 'programme'].mean ? 'end' : 'start',
      fill: GROUP_COLOURS[g],
    });
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
  const rowY = (i: number) => rowsTop + 14 + ((rowsH - 28) * i) / (rows.length - 1);
  text(panel, 12, rowsTop - 6, 'Matched members', { 'font-size': FONT.label, 'font-weight': 'bold' });
  rows.forEach((r, i) => {
    const yy = rowY(i);
    text(panel, 12, yy + 4, r.label, { fill: GROUP_COLOURS[r.g] });
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
      // Labels run rightwards unless they would leave the chart.
      const fits = xv + 9 + label.length * FONT.tick * 0.6 < width - 4;
      text(panel, fits ? xv + 9 : xv - 9, yy - 5, label, { fill: GROUP_COLOURS[g], 'font-weight': 'bold', 'text-anchor': fits ? 'start' : 'end' });
    }
  }
  const note = `Hidden true-score gap after matching: ${fmt(k.hiddenGap, 2)} points`;
  text(panel, width - right, rowsTop - 6, note, { 'text-anchor': 'end', 'font-weight': 'bold' });
  axisBottom(root, x, height - bottom + 4, data.xLabel, 8, (v) => fmt(v, 0));
}
