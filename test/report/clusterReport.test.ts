// @vitest-environment jsdom
// The PDF summary of a clustered plan (the invented schools example), read back
// with pdfjs-dist (an independent PDF reader), after a seeded simulation. The
// cluster inputs, λ and the cohort, the design effect, the clusters needed, the
// minimum detectable effect, the naive-vs-cluster-aware comparison and the
// remedies must appear as core and the engine state them. λ is also checked
// against ICC(2) = n·ICC / (1 + (n − 1)·ICC) worked by hand (Bliese 2000;
// common practice) and the design effect against Kish (1965), 1 + (n − 1)·ICC.
// Figures are compared as exact strings (the shared formatters; tolerance none).
// Set MEANWARD_WRITE_PDF=dir to keep the PDF for looking at.
import { clusterPowerCells } from '../../src/report/reportClusters';
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { presentAnalyses } from '../../src/core/presentAnalyses';
import { SCHOOLS_MATCHED_ON_MEANS } from '../../src/io/examplePlans';
import { buildReportPdf } from '../../src/report/buildReportPdf';
import { formatCount, formatPoints, formatProbability, formatReliability, formatSignedPoints } from '../../src/report/format';
import { planInputRows } from '../../src/report/planInputRows';
import { reportCharts } from '../../src/report/reportCharts';
import { CAUTION_LINE } from '../../src/report/reportText';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { isFeasible } from '../../src/sim/types';
import { TEST_FONTS } from './fontsFromDisk';
import { readPdfText } from './readPdfText';

const squash = (s: string) => s.replace(/\s+/g, ' ');

describe('PDF summary: schools matched on their means (invented example), simulated', () => {
  const plan = structuredClone(SCHOOLS_MATCHED_ON_MEANS);
  const analytic = analysePlan(plan);
  // 120 replications, seeded: enough for every figure to exist; the figures themselves are tested in test/sim/clusters.test.ts.
  const sim = simulatePlan(plan, { replications: 120, seed: 99 });
  let flat = '';
  beforeAll(async () => {
    const bytes = await buildReportPdf({
      plan,
      analytic,
      simulation: sim,
      charts: reportCharts(plan, analytic, sim),
      appVersion: '0.1.0',
      generatedAt: new Date('2026-12-04T10:00:00Z'),
      fonts: TEST_FONTS,
    });
    const dir = process.env.MEANWARD_WRITE_PDF;
    if (dir) {
      mkdirSync(dir, { recursive: true });
      writeFileSync(path.join(dir, 'schools-matched-on-means.pdf'), bytes);
    }
    flat = (await readPdfText(bytes)).body.join(' ').replace(/\s+/g, ' ');
  }, 60_000);

  it('λ is ICC(2) by hand and the design effect is Kish’s, and the PDF prints both', () => {
    const c = analytic.clusters!;
    // Bliese (2000): ICC(2) = 25 × .2 / (1 + 24 × .2) = 5 / 5.8 = .862 (worked by hand, common practice).
    expect(c.clusterMeanReliability.comparison).toBeCloseTo(5 / 5.8, 12);
    // Kish (1965): 1 + (25 − 1) × .25 = 7.0 for the posttest, 1 + 24 × .2 = 5.8 for the pretest.
    expect(c.designEffect.posttest).toBeCloseTo(7, 12);
    expect(c.designEffect.pretest).toBeCloseTo(5.8, 12);
    expect(flat).toContain(`λ = ${formatReliability(c.clusterMeanReliability.comparison)}`);
    expect(flat).toContain('a new cohort, not the people tested, sits the posttest');
    expect(flat).toContain(`The design effect is ${formatPoints(c.designEffect.posttest)} for the posttest`);
    expect(flat).toContain(`${formatPoints(c.designEffect.pretest)} / ${formatPoints(c.designEffect.posttest)}`);
  });

  it('lists the cluster inputs as entered', () => {
    const rows = planInputRows(plan);
    const labels = rows.map((r) => r.label);
    expect(labels).toEqual(expect.arrayContaining(['People tested per cluster', 'Pretest ICC (within a group)', 'Posttest ICC (comparison group)', 'Who sits the posttest', 'What is matched']));
    // Table cells wrap in the PDF: check the rows' values through planInputRows and short phrases in the text.
    expect(rows.find((r) => r.path === 'clusters.cohort')?.value).toBe('a new cohort of the same clusters');
    expect(rows.find((r) => r.path === 'matching.level')?.value).toBe('clusters, on their observed pretest means');
    expect(rows.find((r) => r.path === 'matching.caliper')?.unit).toBe('SDs of the cluster means');
    expect(flat).toContain('People tested per cluster 25 people');
    expect(flat).toContain('Posttest ICC (comparison group) 0.25');
    expect(flat).toContain('within a caliper of 0.2 SDs of the cluster means, and the study hopes to detect');
  });

  it('gives the clusters needed and the minimum detectable effect per analysis, as core computes them', () => {
    const md = analytic.analyses.matchedDifference!;
    // The row label wraps in its cell: the first line, then every analysis' figure in display order.
    // A biased analysis gets core's note instead of a number of clusters (its cell wraps in the PDF,
    // so the cells are checked through clusterPowerCells and the row label and unbiased counts in the text).
    const cells = clusterPowerCells(analytic)!;
    for (const [id, a] of presentAnalyses(analytic.analyses)) {
      expect(cells.needed(id)).toBe(!a.feasible ? 'not feasible' : a.requiredNNote ?? formatCount(a.clustersPerGroupNeeded));
    }
    expect(md.requiredNNote).toBe('biased: more people do not help');
    expect(flat).toContain('Clusters per group for');
    expect(flat).toContain('biased: more');
    expect(flat).toContain('Minimum detectable');
    expect(flat).toContain(formatSignedPoints(md.minimumDetectableEffect));
  });

  it('sets the naive person-level SE and its coverage beside the cluster-aware ones', () => {
    const naive = sim.naivePersonLevel!.personLevelAncova;
    const aware = sim.analyses.personLevelAncova!;
    expect(isFeasible(naive) && isFeasible(aware)).toBe(true);
    if (!isFeasible(naive) || !isFeasible(aware)) return;
    expect(flat).toContain('What ignoring the clustering costs (simulated)');
    expect(flat).toContain(`${formatPoints(naive.meanModelSE)} ${formatProbability(naive.coverage)}`);
    expect(flat).toContain(formatProbability(aware.coverage));
    // The naive SE is the smaller one: it ignores a design effect of 7 (Kish 1965).
    expect(naive.meanModelSE).toBeLessThan(analytic.analyses.personLevelAncova!.se!);
  });

  it('lists the cluster remedies, the cluster references and keeps the caution', () => {
    for (const r of analytic.remedies) expect(flat).toContain(squash(r.title));
    expect(flat).toContain('Bliese, P. D. (2000)');
    expect(flat).toContain('Kish, L. (1965)');
    expect(flat).toContain('Programme clusters matched (mean per study)');
    expect(flat).toContain(squash(CAUTION_LINE));
    // The model counts the clustering: the cautions no longer list it as left out.
    expect(flat).not.toContain('clustering (classes, clinics, areas)');
  });
});
