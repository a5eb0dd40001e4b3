// @vitest-environment jsdom
import { describe, expect, it, vi } from 'vitest';
import { TWO_GROUP_ANALYSIS_IDS } from '../../src/core/plan';
import { pretestChartData } from '../../src/charts/pretestChartData';
import { estimatesChartData } from '../../src/charts/estimatesChartData';
import { sensitivityChartData } from '../../src/charts/sensitivityChartData';
import { balanceChartData } from '../../src/charts/balanceChartData';
import { renderChart, renderChartToSvgString, type ChartData } from '../../src/charts/renderChartToSvgString';
import type { ChartId, ChartInput } from '../../src/charts/chartTypes';
import { ANALYSIS_STYLES, DIMMED_OPACITY } from '../../src/charts/palette';
import { closedFormInput, simulatedInput } from './fixtures';

const SIZE = { width: 760, height: 440 };

function build(chart: ChartId, input: ChartInput): ChartData {
  switch (chart) {
    case 'pretest':
      return pretestChartData(input);
    case 'estimates':
      return estimatesChartData(input);
    case 'sensitivity':
      return sensitivityChartData(input, 'reliability');
    case 'balance':
      return balanceChartData(input);
  }
}

const CHARTS: ChartId[] = ['pretest', 'estimates', 'sensitivity', 'balance'];
const CASES = [
  ['closed-form', closedFormInput],
  ['simulation', simulatedInput],
] as const;

function parse(svgText: string): SVGSVGElement {
  const doc = new DOMParser().parseFromString(svgText, 'image/svg+xml');
  return doc.documentElement as unknown as SVGSVGElement;
}

describe('rendered charts (standalone SVG strings)', () => {
  for (const chart of CHARTS) {
    for (const [label, make] of CASES) {
      it(`${chart}, ${label}: deterministic snapshot`, async () => {
        const data = build(chart, make());
        const svg = renderChartToSvgString(chart, data as never, SIZE);
        // Same input, same picture (pure transform + deterministic render).
        expect(renderChartToSvgString(chart, build(chart, make()) as never, SIZE)).toBe(svg);
        await expect(svg).toMatchFileSnapshot(`./__snapshots__/${chart}-${label}.svg`);
      });

      it(`${chart}, ${label}: accessible, self-contained and PDF-safe`, () => {
        const svgText = renderChartToSvgString(chart, build(chart, make()) as never, SIZE);
        const svg = parse(svgText);
        // Standalone: explicit size and viewBox, SVG namespace.
        expect(svg.getAttribute('xmlns')).toBe('http://www.w3.org/2000/svg');
        expect(svg.getAttribute('width')).toBe('760');
        expect(svg.getAttribute('viewBox')).toBe('0 0 760 440');
        // Accessible name and description (WAI-ARIA graphics practice: role img + title + desc).
        expect(svg.getAttribute('role')).toBe('img');
        expect(svg.querySelector('title')!.textContent!.length).toBeGreaterThan(10);
        expect(svg.querySelector('desc')!.textContent!.length).toBeGreaterThan(40);
        // Text at least 11 px, in the one standard font family svg2pdf.js knows.
        const texts = Array.from(svg.querySelectorAll('text'));
        expect(texts.length).toBeGreaterThan(5);
        for (const t of texts) {
          expect(Number(t.getAttribute('font-size'))).toBeGreaterThanOrEqual(11);
          expect(t.getAttribute('font-family')).toBe('sans-serif');
        }
        // No invalid numbers, no Greek letters or U+2212 (outside the PDF's Latin-1 fonts), no CSS classes.
        expect(svgText).not.toMatch(/NaN|Infinity|undefined/);
        expect(svgText).not.toMatch(/[\u0370-\u03ff\u2212]/);
        expect(svgText).not.toMatch(/class=/);
        // Static export has no interactive attributes.
        expect(svgText).not.toMatch(/tabindex/);
      });
    }
  }

  it('rejects a zero width with a readable message', () => {
    expect(() => renderChartToSvgString('balance', balanceChartData(closedFormInput()), { width: 0, height: 300 })).toThrow(
      'Chart width must be a positive number of pixels; got 0.',
    );
  });
});

describe('linked highlighting', () => {
  for (const chart of ['estimates', 'sensitivity'] as const) {
    it(`${chart}: highlight dims the other analyses`, () => {
      const svg = document.createElementNS('http://www.w3.org/2000/svg', 'svg');
      renderChart(chart, svg, build(chart, closedFormInput()) as never, { ...SIZE, highlight: 'gainScore' });
      for (const id of TWO_GROUP_ANALYSIS_IDS) {
        const g = svg.querySelector(`[data-series="${id}"]`)!;
        expect(Number(g.getAttribute('opacity'))).toBe(id === 'gainScore' ? 1 : DIMMED_OPACITY);
      }
    });
  }

  it('sensitivity legend items are focusable and call onHighlight on focus, Enter, Space and hover', () => {
    const svg = document.createElementNS('http://www.w3.org/2000/svg', 'svg');
    document.body.appendChild(svg);
    const onHighlight = vi.fn();
    renderChart('sensitivity', svg, build('sensitivity', closedFormInput()) as never, { ...SIZE, highlight: null, onHighlight });
    const items = Array.from(svg.querySelectorAll('[data-legend]'));
    expect(items.map((n) => n.getAttribute('data-legend'))).toEqual([...TWO_GROUP_ANALYSIS_IDS]);
    const ancova = items[1] as unknown as SVGGElement;
    expect(ancova.getAttribute('tabindex')).toBe('0');
    expect(ancova.getAttribute('role')).toBe('button');
    expect(ancova.getAttribute('aria-label')).toBe(`Emphasise ${ANALYSIS_STYLES.ancova.shortLabel} in all charts`);
    ancova.dispatchEvent(new FocusEvent('focus'));
    expect(onHighlight).toHaveBeenLastCalledWith('ancova');
    ancova.dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter', bubbles: true }));
    expect(onHighlight).toHaveBeenLastCalledWith('ancova');
    ancova.dispatchEvent(new KeyboardEvent('keydown', { key: ' ', bubbles: true }));
    expect(onHighlight).toHaveBeenCalledTimes(3);
    ancova.dispatchEvent(new FocusEvent('blur'));
    expect(onHighlight).toHaveBeenLastCalledWith(null);
    const series = svg.querySelector('[data-series="gainScore"]')!;
    series.dispatchEvent(new MouseEvent('mouseenter'));
    expect(onHighlight).toHaveBeenLastCalledWith('gainScore');
    svg.remove();
  });

  it('Enter on the highlighted analysis clears the highlight (toggle)', () => {
    const svg = document.createElementNS('http://www.w3.org/2000/svg', 'svg');
    const onHighlight = vi.fn();
    renderChart('estimates', svg, build('estimates', closedFormInput()) as never, { ...SIZE, highlight: 'ancova', onHighlight });
    const label = svg.querySelector('[data-series="ancova"] [role="button"]')!;
    expect(label.getAttribute('aria-pressed')).toBe('true');
    label.dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter' }));
    expect(onHighlight).toHaveBeenLastCalledWith(null);
  });
});
