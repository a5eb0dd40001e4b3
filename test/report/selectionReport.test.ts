// @vitest-environment jsdom
// The PDF summary of plans whose groups a rule forms, read back with pdfjs-dist
// (an independent PDF reader). The rule, its meaning, the design's analyses and
// regression discontinuity's cost must appear as analysePlan states them, and
// the assumptions table must list the rule and the population as entered.
// Figures are compared as exact strings (the shared formatters; tolerance none).
// Set MEANWARD_WRITE_PDF=dir to keep the PDFs for looking at.
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import type { AnalyticResults } from '../../src/core/analyticResults';
import { centralCutOffVarianceInflation } from '../../src/core/design/centralCutOffVarianceInflation';
import { presentAnalyses } from '../../src/core/presentAnalyses';
import type { Plan } from '../../src/core/plan';
import { CLINIC_HIGH_READINGS, SCREENED_READING_SUPPORT } from '../../src/io/examplePlans';
import { buildReportPdf } from '../../src/report/buildReportPdf';
import { formatPoints, formatSignedPoints } from '../../src/report/format';
import { planInputRows } from '../../src/report/planInputRows';
import { reportCharts } from '../../src/report/reportCharts';
import { CAUTION_LINE } from '../../src/report/reportText';
import { TEST_FONTS } from './fontsFromDisk';
import { readPdfText } from './readPdfText';

const GENERATED = new Date('2026-12-04T10:00:00Z');

async function pdfText(plan: Plan, analytic: AnalyticResults, name: string): Promise<string> {
  const bytes = await buildReportPdf({
    plan,
    analytic,
    simulation: null,
    charts: reportCharts(plan, analytic, null),
    appVersion: '0.1.0',
    generatedAt: GENERATED,
    fonts: TEST_FONTS,
  });
  const dir = process.env.MEANWARD_WRITE_PDF;
  if (dir) {
    mkdirSync(dir, { recursive: true });
    writeFileSync(path.join(dir, `${name}.pdf`), bytes);
  }
  const text = await readPdfText(bytes);
  return text.body.join(' ').replace(/\s+/g, ' ');
}

/** A sentence from core, as the PDF wraps it (line breaks become spaces). */
const squash = (s: string) => s.replace(/\s+/g, ' ');

describe('PDF summary: a cut-off on a screener (invented example)', () => {
  const plan = structuredClone(SCREENED_READING_SUPPORT);
  const analytic = analysePlan(plan);
  let flat = '';
  beforeAll(async () => {
    flat = await pdfText(plan, analytic, 'screened-reading-support');
  }, 60_000);

  it('names the rule and what it means, as core states them, and keeps the caution', () => {
    expect(analytic.design.kind).toBe('selection');
    expect(flat).toContain(squash(analytic.design.rule));
    expect(flat).toContain(squash(analytic.design.meaning));
    expect(flat).toContain(squash(CAUTION_LINE));
  });

  it('shows the five analyses of the design, regression discontinuity with its variance inflation', () => {
    const present = presentAnalyses(analytic.analyses);
    expect(present.map(([id]) => id)).toEqual(['matchedDifference', 'ancova', 'gainScore', 'correctedAncova', 'regressionDiscontinuity']);
    for (const [, a] of present) expect(flat).toContain(formatSignedPoints(a.bias));
    const rd = analytic.analyses.regressionDiscontinuity!;
    expect(rd.varianceInflation).toBeDefined();
    expect(flat).toContain(`${formatPoints(rd.varianceInflation!)} times`);
    // Goldberger 1972 (from memory; REFERENCES, computed 1/(1 − 2/π) = 2.7519): the figure beside it.
    expect(formatPoints(centralCutOffVarianceInflation())).toBe('2.75');
    expect(flat).toContain('about 2.75 times at a cut-off in the middle of the scores');
  });

  it('lists the design, rule, basis, cut-off, side, screener reliability and population among the inputs', () => {
    const rows = planInputRows(plan);
    const byPath = Object.fromEntries(rows.map((r) => [r.path, r]));
    expect(byPath['assignment.rule']!.value).toBe('a sharp cut-off');
    expect(byPath['assignment.basis']!.value).toBe('a separate screening test');
    expect(byPath['assignment.cutOff']!.value).toBe('85');
    expect(byPath['assignment.side']!.value).toBe('those below the cut-off');
    expect(byPath['assignment.screenerReliability']!.value).toBe('0.7');
    expect(byPath['population.poolSize']!.value).toBe('3000');
    // The groups' sizes follow from the rule: they are not inputs.
    expect(byPath['groups.programme.poolSize']).toBeUndefined();
    for (const label of ['How people got into the programme', 'What the rule looked at', 'Screener reliability', 'Population: people']) {
      expect(flat).toContain(label);
    }
    expect(flat).toContain('Year 2 pupils in the district');
  });

  it('cites the sources of the selection model', () => {
    expect(flat).toContain('Barnett, A. G., van der Pols, J. C., & Dobson, A. J. (2005)');
    expect(flat).toContain('Goldberger, A. S. (1972)');
  });
});

describe('PDF summary: one group picked for high readings (invented example)', () => {
  const plan = structuredClone(CLINIC_HIGH_READINGS);
  const analytic = analysePlan(plan);
  let flat = '';
  beforeAll(async () => {
    flat = await pdfText(plan, analytic, 'clinic-high-readings');
  }, 60_000);

  it('leads with the pre–post change and the change expected with no programme', () => {
    expect(Object.keys(analytic.analyses)).toEqual(['prePostChange']);
    expect(flat).toContain(squash(analytic.design.rule));
    expect(flat).toContain('Change expected with no programme');
    expect(flat).toContain(formatSignedPoints(analytic.design.noProgrammeChange!));
    expect(flat).toContain('Under the model, the pre–post change of the selected group is expected to be');
    // No matching in a one-group study: no matching sentence, no matching inputs, no balance chart.
    expect(flat).not.toContain('Each programme member is to be matched');
    expect(flat).not.toContain('Who picks first');
    expect(flat).not.toMatch(/Balance: /);
  });
});
