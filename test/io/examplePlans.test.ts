import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
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
    const byId = Object.fromEntries(EXAMPLE_PLANS.map((e) => [e.id, deriveModelParameters(e.plan)]));
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
