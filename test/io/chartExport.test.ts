// @vitest-environment jsdom
// Chart files: the SVG download must be a well-formed standalone SVG document
// (W3C SVG 1.1: root <svg> in the SVG namespace; XML 1.0 well-formedness,
// checked by jsdom's XML parser, an independent implementation).
import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { downloadFileName, standaloneSvg } from '../../src/io/chartExport';
import { reportCharts } from '../../src/report/reportCharts';
import { simulatePlan } from '../../src/sim/simulatePlan';

const SVG_NS = 'http://www.w3.org/2000/svg';

function parseXml(text: string): Document {
  return new DOMParser().parseFromString(text, 'image/svg+xml');
}

describe('standaloneSvg', () => {
  it('turns each of the planner’s charts into a well-formed SVG file', () => {
    const plan = demoPlan();
    const charts = reportCharts(plan, analysePlan(plan), simulatePlan(plan, { replications: 60, seed: 3 }));
    // pretest, estimates, sensitivity, balance
    expect(charts.map((c) => c.id)).toEqual(['pretest', 'estimates', 'sensitivity', 'balance']);
    for (const c of charts) {
      expect(c.svg).not.toBe('');
      const file = standaloneSvg(c.svg);
      expect(file.startsWith('<?xml version="1.0" encoding="UTF-8"?>\n<svg')).toBe(true);
      const doc = parseXml(file);
      expect(doc.getElementsByTagName('parsererror')).toHaveLength(0);
      expect(doc.documentElement.namespaceURI).toBe(SVG_NS);
      expect(Number(doc.documentElement.getAttribute('width'))).toBeGreaterThan(0);
      expect(Number(doc.documentElement.getAttribute('height'))).toBeGreaterThan(0);
    }
  });

  it('keeps user text as text, and removes scripts and event handlers', () => {
    const file = standaloneSvg(
      '<svg viewBox="0 0 300 100"><text x="5" y="20" onclick="steal()">&lt;script&gt;alert(1)&lt;/script&gt; &amp; co</text>' +
        '<script>alert(2)</script><foreignObject><div>x</div></foreignObject></svg>',
    );
    const doc = parseXml(file);
    expect(doc.getElementsByTagName('parsererror')).toHaveLength(0);
    expect(doc.getElementsByTagName('script')).toHaveLength(0);
    expect(doc.getElementsByTagName('foreignObject')).toHaveLength(0);
    const text = doc.getElementsByTagName('text')[0]!;
    expect(text.textContent).toBe('<script>alert(1)</script> & co');
    expect(text.hasAttribute('onclick')).toBe(false);
    // Size taken from the viewBox when width/height are missing.
    expect(doc.documentElement.getAttribute('width')).toBe('300');
    expect(doc.documentElement.getAttribute('height')).toBe('100');
  });

  it('refuses markup that is not well-formed SVG with a plain message', () => {
    expect(() => standaloneSvg('<svg><g></svg>')).toThrow('not well-formed SVG');
    expect(() => standaloneSvg('<div>not a chart</div>')).toThrow('not well-formed SVG');
  });
});

describe('downloadFileName', () => {
  it('makes a safe file name from user text', () => {
    expect(downloadFileName('Falls <pilot> 2026', 'chart-pretest', 'svg')).toBe('falls-pilot-2026-chart-pretest.svg');
    expect(downloadFileName('../../etc/passwd', 'plan', 'json')).toBe('etc-passwd-plan.json');
    expect(downloadFileName('   ', 'summary', 'pdf')).toBe('meanward-plan-summary.pdf');
    expect(downloadFileName('Évaluation café', 'summary', 'pdf')).toBe('evaluation-cafe-summary.pdf');
  });
});
