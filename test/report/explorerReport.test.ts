// @vitest-environment jsdom
// The PDF's "Design explorer" section, read back with pdfjs-dist (an independent PDF reader).
import { beforeAll, describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { buildReportPdf } from '../../src/report/buildReportPdf';
import { EXPLORER_CAUTION } from '../../src/report/reportExplorer';
import { exploreCells, exploreResult, pendingCellSummary, summariseExploreCell, type ExploreResult, type ExploreSpec } from '../../src/core/explore';
import { createPlanSimulation } from '../../src/sim/multivariate/createPlanSimulation';
import { TEST_FONTS } from './fontsFromDisk';
import { readPdfText, type PdfText } from './readPdfText';

// Invented demo plan: pre–post r .6, SDs 10, effect 2.5 points. ANCOVA's artefact β(1 − ρ)Δ with β = r·SD/(ρ·SD)
// (Lord 1960): ρ .9, Δ −4 → (0.6/0.9)(0.1)(−4) = −0.267 points = −10.7% of the effect; ρ .65, Δ −12 → −155.1%.
const SPEC: ExploreSpec = {
  axes: [{ input: 'reliability', from: 0.65, to: 0.9, steps: 2 }, { input: 'groupGap', from: -12, to: -4, steps: 2 }],
  analysisId: 'ancova', replications: 200, seed: 3,
};

function explore(): ExploreResult {
  const plan = demoPlan();
  const cells = exploreCells(plan, SPEC).map((c, i) => {
    if (i === 3) return pendingCellSummary(c); // one cell still running
    const run = createPlanSimulation(c.plan!, { replications: SPEC.replications, seed: SPEC.seed });
    run.runChunk(0, SPEC.replications);
    return summariseExploreCell(c, run.finish(), SPEC);
  });
  return exploreResult(plan, SPEC, cells);
}

let text: string;
let other: PdfText;
let result: ExploreResult;
beforeAll(async () => {
  const plan = demoPlan();
  result = explore();
  const base = { plan, analytic: analysePlan(plan), simulation: null, charts: [], appVersion: 'test', generatedAt: new Date(Date.UTC(2026, 0, 2)), fonts: TEST_FONTS };
  text = (await readPdfText(await buildReportPdf({ ...base, explorer: result }))).all.replace(/\s+/g, ' ');
  const changed = demoPlan();
  changed.matching.caliper = 0.3;
  other = await readPdfText(await buildReportPdf({ ...base, explorer: { ...result, plan: changed } }));
}, 60_000);

describe('PDF: design explorer', () => {
  it('prints what was varied, the table with the closed forms and the simulated figures, and the cautions', () => {
    expect(text).toContain('Design explorer');
    expect(text).toContain('Pretest reliability (0.65, 0.90) and Pretest gap, programme minus comparison (points) (-12, -4)');
    // Closed forms by hand (Lord 1960, above).
    expect(text).toContain('-155.1%');
    expect(text).toContain('-10.7%');
    // Simulated shares as the core summarised them (one decimal in the table).
    for (const c of result.cells.filter((x) => x.status === 'done')) expect(text).toContain(`${(c.artefactShare! * 100).toFixed(1)}%`);
    expect(text).toContain('pending');
    expect(text).toContain('Judged on the simulated artefact only');
    expect(text).toContain(EXPLORER_CAUTION.replace(/\s+/g, ' ').slice(0, 80));
    expect(text).toContain('does not replace a statistician');
  });
  it('leaves out a grid explored from another version of the plan, and says so', () => {
    const all = other.all.replace(/\s+/g, ' ');
    expect(all).toContain('run on another version of this plan, so it is left out');
    expect(all).not.toContain('Closed form (% of effect)');
  });
});
