import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { estimatePilot } from '../../src/pilot/estimatePilot';
import { parseDelimitedText } from '../../src/pilot/parseDelimitedText';
import { pilotPlanUpdate } from '../../src/pilot/pilotPlanUpdate';
import { PilotDataError, type PilotEstimates } from '../../src/pilot/types';
import { pilotCase } from './pilotFiles';
import { firstNonFinite, PROGRAM_TEXT, RAW_CONTROL } from './planMutations';

// Seeded fuzz (fast-check, seed fixed, 2,000 files, a few seconds): each
// generated pilot file is either estimated with all-finite figures, whose
// "Use these values" update leaves a valid plan, or refused with a plain
// PilotDataError. Rule: docs/pilot-data.md; tolerance: none.

describe('fuzz: 2,000 pilot files through the pilot estimator and "Use these values"', () => {
  it('each ends with finite estimates and a valid updated plan, or a plain message', () => {
    let estimated = 0;
    let refused = 0;
    fc.assert(
      fc.property(pilotCase, ({ text, mapping, describe: what }) => {
        let est: PilotEstimates;
        try {
          est = estimatePilot(parseDelimitedText(text, { delimiter: ',', header: 'auto' }), mapping, 'invented.csv');
        } catch (err) {
          if (!(err instanceof PilotDataError)) throw new Error(`not a plain pilot message (${what}): ${String(err)}`);
          expect(err.message, what).not.toMatch(PROGRAM_TEXT);
          expect(err.message, what).not.toMatch(RAW_CONTROL);
          expect(err.message, what).not.toMatch(/as the item and as the item/);
          refused++;
          return;
        }
        estimated++;
        expect(firstNonFinite(est), what).toBeNull();
        const { plan, skipped } = pilotPlanUpdate(demoPlan(), est);
        expect(validatePlan(plan).ok, what).toBe(true);
        for (const s of skipped) expect(s.reason, what).not.toMatch(PROGRAM_TEXT);
      }),
      { seed: 1204, numRuns: 2000 },
    );
    expect(estimated).toBeGreaterThan(200);
    expect(refused).toBeGreaterThan(500);
  });
});
