// @vitest-environment jsdom
// The design explorer's chart: the data copy the core's cell summaries (nothing recomputed), the heat
// map and the curves draw one hookable mark per cell in each state, labels stay inside the chart and
// apart at a phone's width, the PDF's and the widest (estimated text boxes, test/charts/textExtent.ts),
// and the text alternative has one table row per cell with the planning caution.
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { demoPlan } from '../../src/io/demoPlan';
import { exploreCells, exploreResult, pendingCellSummary, summariseExploreCell, type ExploreResult, type ExploreSpec } from '../../src/core/explore';
import { createPlanSimulation } from '../../src/sim/multivariate/createPlanSimulation';
import { explorerChartData } from '../../src/charts/explorerChartData';
import { explorerChartText, formatCount } from '../../src/charts/explorerChartText';
import { renderExplorerChart } from '../../src/charts/renderExplorerChart';
import { renderChartToSvgString } from '../../src/charts/renderChartToSvgString';
import { chartSize } from '../../src/charts/chartSize';
import { EXPLORER_COLOURS } from '../../src/charts/palette';
import { PLANNING_CAUTION } from '../../src/core/planningCaution';
import { clippedLabels, overlappingLabels } from './textExtent';

/** A seeded exploration of the demo plan with every cell state: cells from `pendingFrom` on are left pending. */
function explore(spec: ExploreSpec, pendingFrom: number): ExploreResult {
  const plan = demoPlan();
  const cells = exploreCells(plan, spec).map((c, i) => {
    if (c.plan === null || i >= pendingFrom) return pendingCellSummary(c);
    const run = createPlanSimulation(c.plan, { replications: spec.replications, seed: spec.seed });
    run.runChunk(0, spec.replications);
    return summariseExploreCell(c, run.finish(), spec);
  });
  return exploreResult(plan, spec, cells);
}

// Reliability .3 is impossible with the demo's pre–post r of .6 (r² = .36 > .3), .95 leaves a small artefact.
const TWO: ExploreSpec = {
  axes: [{ input: 'reliability', from: 0.3, to: 0.95, steps: 3 }, { input: 'groupGap', from: -10, to: -2, steps: 3 }],
  analysisId: 'ancova', replications: 200, seed: 11,
};
const ONE: ExploreSpec = { axes: [{ input: 'reliability', from: 0.3, to: 0.95, steps: 4 }], analysisId: 'ancova', replications: 200, seed: 11 };

let two: ExploreResult;
let one: ExploreResult;
beforeAll(() => {
  two = explore(TWO, 8); // the last cell pending
  one = explore(ONE, 3);
});

const parse = (s: string) => new DOMParser().parseFromString(s, 'image/svg+xml').documentElement;

describe('explorerChartData', () => {
  it('copies every figure from the core’s cell summaries and counts the states', () => {
    const d = explorerChartData(two);
    expect(d.mode).toBe('heatmap');
    expect(d.counts).toEqual({ done: 5, pending: 1, impossible: 3, failed: 0, total: 9 });
    for (const c of d.cells) {
      const s = two.cells[c.index]!;
      expect(c.share).toBe(s.status === 'done' ? s.artefactShare : null);
      expect(c.shareMCSE).toBe(s.status === 'done' ? s.artefactShareMCSE : null);
      expect(c.closedFormShare).toBe(s.closedFormShare ?? null);
      expect(c.tolerable).toBe(s.status === 'done' ? s.tolerable : null);
      expect([c.row, c.col]).toEqual([Math.floor(c.index / 3), c.index % 3]);
    }
    expect(d.colourExtent).toBeGreaterThanOrEqual(Math.max(...d.cells.map((c) => Math.abs(c.share ?? 0))));
    expect(explorerChartData(one).mode).toBe('curves');
  });
});

describe('formatCount', () => {
  it('writes counts exactly as Number.prototype.toLocaleString("en-GB") does (ECMA-402: the same as a new Intl.NumberFormat)', () => {
    for (const n of [0, 7, 200, 1000, 2000, 12345, 1_000_000]) expect(formatCount(n)).toBe(n.toLocaleString('en-GB'));
    expect(formatCount(2000)).toBe('2,000'); // en-GB groups thousands with a comma (common practice)
  });
});

describe('renderExplorerChart', () => {
  it('heat map: one hookable rect per cell; tolerable cells outlined, pending hatched, impossible crossed out', () => {
    const d = explorerChartData(two);
    const svg = parse(renderChartToSvgString('explorer', d, chartSize('explorer', d, 720)));
    const marks = svg.querySelectorAll('[data-cell-index]');
    expect([...marks].map((m) => Number(m.getAttribute('data-cell-index'))).sort((a, b) => a - b)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8]);
    // Static drawing (PDF, exports): nothing focusable.
    expect(svg.querySelectorAll('[tabindex]').length).toBe(0);
    const groups = [...svg.querySelectorAll('g[data-status]')];
    const outlined = groups.filter((g) => g.querySelector(`rect[stroke="${EXPLORER_COLOURS.tolerable}"]`) !== null).length;
    expect(outlined).toBe(d.cells.filter((c) => c.tolerable === true).length);
    expect(outlined).toBeGreaterThan(0); // reliability .95 with a gap of −2: (0.6/.95)(.05)(−2)/2.5 ≈ −2.5% (Lord 1960)
    // Hatching: one path of several diagonal strokes (one 'M' per stroke).
    const hatching = groups.filter((g) => g.getAttribute('data-status') === 'pending')[0]!.querySelector('path[data-hatch]')!;
    expect(hatching.getAttribute('d')!.split('M').length - 1).toBeGreaterThan(3);
    for (const g of groups.filter((x) => x.getAttribute('data-status') === 'impossible')) expect(g.querySelectorAll('line').length).toBe(2);
    expect(svg.textContent).toContain('Crossed out: reliability 0.30');
  });
  it('curves: points with ±2 MC SE bars, the closed form as a line, a hit area per cell', () => {
    const d = explorerChartData(one);
    const svg = parse(renderChartToSvgString('explorer', d, chartSize('explorer', d, 720)));
    expect(svg.querySelector('path[data-series="closed-form"]')).not.toBeNull();
    expect(svg.querySelectorAll('[data-cell-index]').length).toBe(4);
    // Done cells: one bar and two caps each.
    for (const g of [...svg.querySelectorAll('g[data-status="done"]')]) expect(g.querySelectorAll('line').length).toBe(3);
  });
  it('interactive: focusable buttons that report focus and activation (click, Enter, Space)', () => {
    const d = explorerChartData(two);
    const svg = document.createElementNS('http://www.w3.org/2000/svg', 'svg');
    const onCellFocus = vi.fn();
    const onCellActivate = vi.fn();
    renderExplorerChart(svg, d, { width: 390, height: 300, interactive: true, selectedIndex: 4, onCellFocus, onCellActivate });
    const cell = svg.querySelector('[data-cell-index="4"]')!;
    expect(cell.getAttribute('tabindex')).toBe('0');
    expect(cell.getAttribute('role')).toBe('button');
    expect(cell.getAttribute('aria-pressed')).toBe('true');
    expect(cell.getAttribute('aria-label')).toMatch(/^reliability 0\.625, group gap -6: artefact -?\d+% ± \d+\.\d% of the effect/);
    cell.dispatchEvent(new Event('mouseenter'));
    cell.dispatchEvent(new Event('focus'));
    cell.dispatchEvent(new Event('blur'));
    expect(onCellFocus.mock.calls).toEqual([[4], [4], [null]]);
    cell.dispatchEvent(new MouseEvent('click'));
    cell.dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter' }));
    cell.dispatchEvent(new KeyboardEvent('keydown', { key: ' ' }));
    cell.dispatchEvent(new KeyboardEvent('keydown', { key: 'a' }));
    expect(onCellActivate.mock.calls).toEqual([[4], [4], [4]]);
  });
  it('redrawing as cells finish replaces only the changed cells and gives the same SVG as drawing it whole', () => {
    const full = explorerChartData(two);
    // The same grid one step earlier: a done cell that does not set the colour scale still pending.
    const extentCell = full.cells.reduce((a, c) => (Math.abs(c.share ?? 0) > Math.abs(a.share ?? 0) ? c : a));
    const later = full.cells.find((c) => c.status === 'done' && c.index !== extentCell.index)!;
    const earlierResult: ExploreResult = { ...two, cells: two.cells.map((c) => (c.index === later.index ? pendingCellSummary(c) : c)) };
    const earlier = explorerChartData(earlierResult);
    expect(earlier.colourExtent).toBe(full.colourExtent);
    const onCellFocus = vi.fn();
    const onCellActivate = vi.fn();
    const opts = { width: 720, height: 300, interactive: true, onCellFocus, onCellActivate };
    const live = document.createElementNS('http://www.w3.org/2000/svg', 'svg');
    renderExplorerChart(live, earlier, opts);
    const unchanged = live.querySelector(`[data-cell-index="${full.cells.find((c) => c.index !== later.index)!.index}"]`);
    const before = live.querySelector(`[data-cell-index="${later.index}"]`);
    renderExplorerChart(live, full, opts);
    const whole = document.createElementNS('http://www.w3.org/2000/svg', 'svg');
    renderExplorerChart(whole, full, opts);
    expect(live.outerHTML).toBe(whole.outerHTML);
    // Only the changed cell was drawn again: the others are the same elements, still hooked.
    expect(live.querySelector(`[data-cell-index="${full.cells.find((c) => c.index !== later.index)!.index}"]`)).toBe(unchanged);
    const redrawn = live.querySelector(`[data-cell-index="${later.index}"]`)!;
    expect(redrawn).not.toBe(before);
    redrawn.dispatchEvent(new Event('focus'));
    unchanged!.dispatchEvent(new MouseEvent('click'));
    expect(onCellFocus.mock.calls).toEqual([[later.index]]);
    expect(onCellActivate).toHaveBeenCalledTimes(1);
    // A change of frame (here the chosen cell) draws it whole: again the same SVG as a fresh drawing.
    renderExplorerChart(live, full, { ...opts, selectedIndex: 2 });
    renderExplorerChart(whole, full, { ...opts, selectedIndex: 2 });
    expect(live.outerHTML).toBe(whole.outerHTML);
    expect(live.querySelector(`[data-cell-index="${later.index}"]`)).not.toBe(redrawn);
  });
  it('labels stay inside the chart and apart at 320, 390, 720 and 900 px', () => {
    const found: string[] = [];
    for (const r of [two, one]) {
      const d = explorerChartData(r);
      for (const width of [320, 390, 720, 900]) {
        const size = chartSize('explorer', d, width);
        const svg = parse(renderChartToSvgString('explorer', d, size));
        expect(Number(svg.getAttribute('height'))).toBe(size.height);
        for (const p of clippedLabels(svg)) found.push(`${d.mode} @${width}: clipped ${p}`);
        for (const p of overlappingLabels(svg)) found.push(`${d.mode} @${width}: ${p}`);
      }
    }
    expect(found).toEqual([]);
  });
  it('a wide grid not yet simulated (12 columns × 5 rows) also keeps its labels apart at every width', () => {
    const plan = demoPlan();
    const spec: ExploreSpec = {
      axes: [{ input: 'comparisonPool', from: 400, to: 2400, steps: 5 }, { input: 'caliper', from: 0.05, to: 0.6, steps: 12 }],
      analysisId: 'matchedDifference', replications: 1000, seed: 1,
    };
    const d = explorerChartData(exploreResult(plan, spec, exploreCells(plan, spec).map(pendingCellSummary)));
    const found: string[] = [];
    for (const width of [320, 390, 720, 900]) {
      const svg = parse(renderChartToSvgString('explorer', d, chartSize('explorer', d, width)));
      expect(svg.querySelectorAll('[data-cell-index]').length).toBe(60);
      for (const p of clippedLabels(svg)) found.push(`@${width}: clipped ${p}`);
      for (const p of overlappingLabels(svg)) found.push(`@${width}: ${p}`);
    }
    expect(found).toEqual([]);
  });
});

describe('explorerChartText', () => {
  it('one table row per cell, the states in words, the judging rule and the caution', () => {
    const t = explorerChartText(explorerChartData(two));
    expect(t.table.rows.length).toBe(9);
    expect(t.table.columns).toEqual([
      'Pretest reliability', 'Pretest gap, programme minus comparison (points)',
      'Simulated artefact (% of effect)', 'MC SE', 'Closed form (% of effect)', 'Discarded (% of programme pool)', 'Power ± MC SE', 'Tolerable',
    ]);
    expect(t.table.rows[8]![2]).toBe('pending');
    expect(t.table.rows[0]![7]).toBe('impossible plan (see above)');
    // Each reason once, with every cell it concerns (the three cells at reliability .3).
    const impossible = t.sentences.filter((x) => x.includes('not valid plans'));
    expect(impossible).toHaveLength(1);
    expect(impossible[0]).toMatch(/^3 variants are not valid plans \(crossed out\): reliability 0\.30, group gap -10; reliability 0\.30, group gap -6; reliability 0\.30, group gap -2: .*correlation/);
    expect(t.sentences.join(' ')).toContain('5 of 9 variants have been simulated, 1 not yet, 3 impossible.');
    expect(t.sentences.join(' ')).toMatch(/judged on its simulated artefact alone; its false-positive rate/);
    expect(t.sentences).toContain(PLANNING_CAUTION);
  });
});
