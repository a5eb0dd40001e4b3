import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { validatePlan } from '../../src/core/validatePlan';
import { firstNonFinite, planMutation, PROGRAM_TEXT } from './planMutations';

// Seeded fuzz (fast-check, seed fixed, 5,000 runs, about 5 s): each mutated plan
// either passes validatePlan and analysePlan gives finite figures, or is refused
// with plain messages. Source of the rule: the plan file's documented ranges
// (docs/plan-file.md); tolerance: none (a single failure fails the suite).

describe('fuzz: 5,000 plan mutations through validatePlan and analysePlan', () => {
  it('each ends valid with all-finite results, or invalid with plain messages', () => {
    let valid = 0;
    let invalid = 0;
    fc.assert(
      fc.property(planMutation(), ({ plan, changes }) => {
        const check = validatePlan(plan);
        if (check.ok) {
          valid++;
          let results: unknown;
          try {
            results = analysePlan(check.plan);
          } catch (err) {
            throw new Error(`valid plan failed to analyse (${changes}): ${(err as Error).message}`);
          }
          expect(firstNonFinite(results), changes).toBeNull();

          return;
        }
        invalid++;
        expect(check.problems.length, changes).toBeGreaterThan(0);
        for (const p of check.problems) {
          expect(p.message, changes).toMatch(/^\S.*[.)]$/s);
          expect(p.message, changes).not.toMatch(PROGRAM_TEXT);
          expect(typeof p.field).toBe('string');
        }
      }),
      { seed: 20261204, numRuns: 5000 },
    );
    // Both outcomes are exercised (a generator that only made one kind would test half the rule).
    expect(valid).toBeGreaterThan(600);
    expect(invalid).toBeGreaterThan(2000);
  });
});
