import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
import { analysePlan } from '../../src/core/analysePlan';
import { isSelectionDesign, studyDesign } from '../../src/core/design/studyDesign';
import { planJsonSchema } from '../../src/core/planSchema';
import { validatePlan } from '../../src/core/validatePlan';
import { DEMO_PLAN } from '../../src/io/demoPlan';
import { EXAMPLE_PLANS } from '../../src/io/examplePlans';
import { parsePlanText, serializePlan } from '../../src/io/planFile';

const root = join(__dirname, '..', '..');

describe('example plans', () => {
  it('the demo comes first, ids are unique and every title says it is invented', () => {
    expect(EXAMPLE_PLANS[0]!.plan).toBe(DEMO_PLAN);
    expect(new Set(EXAMPLE_PLANS.map((e) => e.id)).size).toBe(EXAMPLE_PLANS.length);
    expect(EXAMPLE_PLANS.length).toBeGreaterThanOrEqual(4);
    for (const e of EXAMPLE_PLANS) {
      expect(e.plan.title.startsWith('Invented example: ')).toBe(true);
      expect(e.description.startsWith('Invented.')).toBe(true);
    }
  });
  for (const e of EXAMPLE_PLANS) {
    it(`${e.id}: validates unchanged, and public/examples/${e.id}.json equals it`, () => {
      expect(validatePlan(e.plan)).toEqual({ ok: true, plan: e.plan });
      const text = readFileSync(join(root, 'public', 'examples', `${e.id}.json`), 'utf8');
      expect(text).toBe(serializePlan(e.plan));
      expect(parsePlanText(text)).toEqual({ ok: true, plan: e.plan });
    });
  }
  it('each example shows the situation it claims (sign of the pretest gap, true-score slope)', () => {
    // Existing-groups examples only: a rule's groups are not two normal populations (see the next test).
    const byId = Object.fromEntries(EXAMPLE_PLANS.filter((e) => !isSelectionDesign(e.plan)).map((e) => [e.id, deriveModelParameters(e.plan)]));
    // Volunteers start higher: positive gap, so beta(1 - rho)Delta > 0 inflates a positive effect
    // (Campbell & Erlebacher 1970; closed form in REFERENCES, computed).
    expect(byId['volunteer-mentoring']!.pretestGap).toBeGreaterThan(0);
    expect(byId['no-gap-back-care']!.pretestGap).toBe(0);
    // Gain score unbiased when beta = 1: E[gain] = tau + (beta - 1)Delta (computed, REFERENCES).
    // Tolerance 1e-12: beta = 0.72 * 22.5 / (20 * 0.81) is 1 up to rounding of doubles.
    expect(Math.abs(byId['gain-score-reading']!.beta - 1)).toBeLessThan(1e-12);
    expect(byId['demo-falls-prevention']!.pretestGap).toBeLessThan(0);
  });
});

describe('the selection examples show what their descriptions claim', () => {
  it('cut-off on a screener: ANCOVA on the pretest is biased beyond the tolerated share, regression discontinuity is not', () => {
    // Kenny 1975 (REFERENCES): ANCOVA is unbiased only on the variable assignment used; here that is the screener,
    // not the pretest. Regression discontinuity on the screener follows the rule (Goldberger 1972, from memory).
    const ex = EXAMPLE_PLANS.find((e) => e.id === 'screened-reading-support')!;
    expect(studyDesign(ex.plan)).toMatchObject({ kind: 'selection', shape: 'two-groups', basis: 'screener', side: 'below' });
    expect(ex.plan.assignment!.screenerReliability).toBe(0.7);
    expect(ex.plan.pretest.reliability).toBe(0.85);
    const a = analysePlan(ex.plan);
    const tolerated = ex.plan.analysis.tolerableBiasShare * Math.abs(a.tau);
    expect(Math.abs(a.analyses.ancova!.bias)).toBeGreaterThan(tolerated);
    // Tolerance 1e-9 points: the closed form is exact (floating-point rounding only).
    expect(Math.abs(a.analyses.regressionDiscontinuity!.bias)).toBeLessThan(1e-9);
    expect(a.design.rule).toMatch(/screener/);
  });

  it('one group picked for high readings: the change with no programme exceeds the 5 mmHg hoped for', () => {
    const ex = EXAMPLE_PLANS.find((e) => e.id === 'clinic-high-readings')!;
    expect(studyDesign(ex.plan)).toMatchObject({ kind: 'selection', shape: 'one-group', side: 'above' });
    const a = analysePlan(ex.plan);
    expect(Object.keys(a.analyses)).toEqual(['prePostChange']);
    expect(a.tau).toBe(-5);
    expect(a.design.noProgrammeChange!).toBeLessThan(-5);
  });

  it('the clinic example re-measured on the same instrument gives Barnett et al.’s expected change', () => {
    // Barnett, van der Pols & Dobson 2005, eq. 1 (mirror image for selection above c): with the re-measurement
    // on the same instrument (true-score slope 1: r = reliability, equal SDs), the expected change with no
    // programme is −(σ_w²/σ) φ(z)/(1 − Φ(z)), z = (c − μ)/σ. Computed: σ = 16, σ_w² = 16² × 0.3 = 76.8,
    // z = 1.25, φ(z)/(1 − Φ(z)) = 0.182649/0.105650 = 1.728826, change = −8.2984. Tolerance 1e-3 points
    // (the hand computation's rounding).
    const ex = EXAMPLE_PLANS.find((e) => e.id === 'clinic-high-readings')!;
    const plan = structuredClone(ex.plan);
    plan.outcome.prePostCorrelation = 0.7;
    const a = analysePlan(validated(plan));
    expect(a.design.noProgrammeChange!).toBeCloseTo(-8.2984, 3);
  });
});

function validated(plan: unknown) {
  const v = validatePlan(plan);
  if (!v.ok) throw new Error(v.problems.map((p) => p.message).join(' '));
  return v.plan;
}

describe('the committed JSON Schema', () => {
  it('equals a fresh generation from planSchema (run scripts/write-plan-schema.ts after changing the schema)', () => {
    const committed = readFileSync(join(root, 'public', 'meanward-plan.schema.json'), 'utf8');
    expect(committed).toBe(`${JSON.stringify(planJsonSchema(), null, 2)}\n`);
  });
  it('describes the ranges the validator enforces (spot checks)', () => {
    const s = planJsonSchema() as any;
    expect(s.properties.pretest.properties.reliability).toMatchObject({ exclusiveMinimum: 0, exclusiveMaximum: 1 });
    expect(s.properties.matching.properties.ratio).toMatchObject({ type: 'integer', minimum: 1, maximum: 5 });
    expect(s.properties.simulation.properties.seed).toMatchObject({ minimum: 0, maximum: 4294967295 });
    expect(s.properties.analysis.properties.tolerableBiasShare.default).toBe(0.25);
    expect(s.properties.analysis.required).toEqual(['alpha', 'assumedReliability']);
    expect(s.properties.pretest.oneOf).toHaveLength(2);
    expect(s.additionalProperties).toBeUndefined(); // unknown fields are allowed (forward compatibility)
  });
});
