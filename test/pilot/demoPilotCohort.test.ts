import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { DEMO_PILOT_MAPPING, DEMO_PILOT_PATH, demoPilotCohortCsv } from '../../src/pilot/demoPilotCohort';
import { estimatePilot } from '../../src/pilot/estimatePilot';
import { parseDelimitedText } from '../../src/pilot/parseDelimitedText';
import { pessimisticPlan } from '../../src/pilot/pessimisticPlan';
import { pilotPlanUpdate } from '../../src/pilot/pilotPlanUpdate';
import type { PilotMapping } from '../../src/pilot/types';

const committed = readFileSync(join(__dirname, '..', '..', 'public', DEMO_PILOT_PATH), 'utf8');

describe('the invented demo pilot file', () => {
  it('equals a fresh generation (run scripts/write-demo-pilot.ts after changing the generator)', () => {
    expect(committed).toBe(demoPilotCohortCsv());
  });
  it('says in its first line that it is invented, and the reader skips that line', () => {
    expect(committed.split('\n')[0]).toMatch(/^# Invented data .*no real pupils, school or programme/);
    const t = parseDelimitedText(committed);
    expect(t.commentLines).toBe(1);
    expect(t.rows).toHaveLength(240);
  });
  it('maps as documented, fills a valid plan with nothing skipped, and has a usable pessimistic plan', () => {
    const est = estimatePilot(parseDelimitedText(committed), DEMO_PILOT_MAPPING as unknown as PilotMapping, 'invented-pilot-cohort.csv');
    expect(est.groups.programme.n + est.groups.comparison.n).toBe(est.rowsUsed);
    expect(est.rowsDropped).toBeGreaterThan(0); // it shows listwise deletion at work
    expect(est.warnings).toEqual([]);
    const { plan, skipped } = pilotPlanUpdate(demoPlan(), est);
    expect(skipped).toEqual([]);
    expect(validatePlan(plan).ok).toBe(true);
    expect(validatePlan(pessimisticPlan(plan)).ok).toBe(true);
  });
});
