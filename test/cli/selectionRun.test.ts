import { mkdtempSync, writeFileSync } from 'node:fs';
import { runCli } from './runCli';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { designAnalysisIds } from '../../src/core/design/studyDesign';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { isFeasible } from '../../src/sim/types';
import { selectionPlan } from '../sim/selectionFixtures';

const run = runCli;

/**
 * `meanward run plan.json --json` end to end for selection designs: the
 * simulation block carries meanEstimate and meanEstimateMCSE for every
 * analysis of the design, the same figures simulatePlan gives for the plan
 * and seed (the CLI formats, never recomputes).
 */
describe('meanward run --json with a selection rule or a one-group design', () => {
  const dir = mkdtempSync(join(tmpdir(), 'meanward-selection-'));
  const plans = {
    screener: selectionPlan({ assignment: { rule: 'cut-off', basis: 'screener', cutOff: 45, side: 'below', screenerReliability: 0.7 }, poolSize: 600, effect: 2, replications: 60, seed: 5 }),
    sharp: selectionPlan({ assignment: { rule: 'cut-off', basis: 'pretest', cutOff: 45, side: 'below' }, poolSize: 600, effect: 2, replications: 60, seed: 5 }),
    oneGroup: selectionPlan({ design: 'one-group', assignment: { rule: 'probability', basis: 'true-score', cutOff: 42, side: 'below', spread: 3 }, poolSize: 600, effect: 2, replications: 60, seed: 5 }),
  };
  for (const [name, plan] of Object.entries(plans)) {
    it(`${name}: every analysis of the design is reported with its mean estimate and MC SE`, async () => {
      const file = join(dir, `${name}.json`);
      writeFileSync(file, JSON.stringify(plan));
      const r = await run(['run', file, '--json']);
      expect(r.code, r.stderr).toBe(0);
      const out = JSON.parse(r.stdout) as { simulation: { analyses: Record<string, { feasible: boolean; meanEstimate?: number; meanEstimateMCSE?: number }> } };
      const direct = simulatePlan(plan);
      const ids = designAnalysisIds(plan);
      expect(Object.keys(out.simulation.analyses).sort()).toEqual([...ids].sort());
      for (const id of ids) {
        const got = out.simulation.analyses[id];
        const want = direct.analyses[id];
        if (!got || !want) throw new Error(`${id} missing`);
        if (!isFeasible(want)) {
          expect(got.feasible).toBe(false);
          continue;
        }
        expect(got.meanEstimate).toBe(want.meanEstimate);
        expect(got.meanEstimateMCSE).toBe(want.meanEstimateMCSE);
        expect(Number.isFinite(got.meanEstimateMCSE)).toBe(true);
      }
    });
  }
  it('the text table prints the design\u2019s analyses, and no matching summary for a one-group study', async () => {
    const file = join(dir, 'one.json');
    writeFileSync(file, JSON.stringify(plans.oneGroup));
    const r = await run(['run', file]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toContain('the planned population and rule');
    expect(r.stdout).not.toContain('Matching (simulated)');
  });
});
