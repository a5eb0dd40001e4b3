// The CLI's text table for plans whose groups a rule forms: it states the
// design and the rule in core's words, and every analysis of the design.
import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { CLINIC_HIGH_READINGS, SCREENED_READING_SUPPORT } from '../../src/io/examplePlans';
import { fmtPoints, formatResultsTable } from '../../src/cli/formatResultsTable';

describe('formatResultsTable with a selection rule', () => {
  it('a cut-off on a screener: design, rule, meaning, five analyses and regression discontinuity\u2019s cost', () => {
    const plan = structuredClone(SCREENED_READING_SUPPORT);
    const a = analysePlan(plan);
    const text = formatResultsTable(plan, a);
    expect(text).toContain('Design: two groups formed by a rule.');
    expect(text).toContain(`Rule: ${a.design.rule}`);
    expect(text).toContain(`What it means: ${a.design.meaning}`);
    for (const name of ['Matched post-test difference', 'ANCOVA on the observed pretest', 'Gain score', 'Reliability-corrected ANCOVA', 'Regression discontinuity']) {
      expect(text).toContain(name);
    }
    expect(text).toContain(`its variance is ${fmtPoints(a.analyses.regressionDiscontinuity!.varianceInflation!)} times a randomised study's`);
    // Goldberger 1972 (from memory; REFERENCES computed 2.7519).
    expect(text).toContain('(about 2.75 at a cut-off in the middle of the scores)');
    expect(text).toContain('Reliability in the population:        0.850');
  });

  it('one group: the design says there is no comparison group and gives the change expected with no programme', () => {
    const plan = structuredClone(CLINIC_HIGH_READINGS);
    const a = analysePlan(plan);
    const text = formatResultsTable(plan, a);
    expect(text).toContain('Design: one group, measured before and after (no comparison group).');
    expect(text).toContain(`Change expected with no programme: ${fmtPoints(a.design.noProgrammeChange!)} points.`);
    expect(text).not.toContain('Regression discontinuity');
  });
});
