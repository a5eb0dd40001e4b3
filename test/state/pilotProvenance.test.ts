// Provenance of plan values through the draft: a value filled from a pilot
// file keeps its note through validation and autosave, and loses it as soon
// as the researcher types over it (the plan must never credit a typed value
// to the pilot). No statistics here: only which notes the plan carries.
import { describe, expect, it } from 'vitest';
import type { FieldProvenance } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { draftProvenance } from '../../src/state/draftSlice';
import { makeStore, memoryStorage } from './helpers';

const RELIABILITY_NOTE: FieldProvenance = {
  source: 'pilot',
  note: 'from pilot file wave1.csv (invented), alpha = .81 (95% CI .76–.85), n = 212',
  interval: { lower: 0.76, upper: 0.85, level: 0.95 },
};
const SD_NOTE: FieldProvenance = { source: 'pilot', note: 'from pilot file wave1.csv (invented), SD 9.80, n = 106' };

function planWithNotes() {
  const plan = demoPlan();
  plan.pretest.reliability = 0.81;
  plan.groups.programme.pretestSD = 9.8;
  plan.provenance = { 'pretest.reliability': RELIABILITY_NOTE, 'groups.programme.pretestSD': SD_NOTE };
  return plan;
}

describe('provenance through the draft', () => {
  it('a plan with provenance keeps it: in the draft, in the valid plan, and with its interval', () => {
    const store = makeStore();
    store.getState().replacePlan(planWithNotes());
    const s = store.getState();
    expect(s.problems).toEqual([]);
    expect(s.validPlan.provenance).toEqual({ 'pretest.reliability': RELIABILITY_NOTE, 'groups.programme.pretestSD': SD_NOTE });
    expect(draftProvenance(s.draft)?.['pretest.reliability']?.interval).toEqual({ lower: 0.76, upper: 0.85, level: 0.95 });
  });

  it('typing into a field removes that field’s note and only that one', () => {
    const store = makeStore();
    store.getState().replacePlan(planWithNotes());
    store.getState().setField('pretest.reliability', '0.8');
    const s = store.getState();
    expect(s.validPlan.pretest.reliability).toBe(0.8);
    expect(s.validPlan.provenance?.['pretest.reliability']).toBeUndefined();
    expect(s.validPlan.provenance?.['groups.programme.pretestSD']).toEqual(SD_NOTE);
    // Typing the same number back does not bring the note back: the value is now the researcher's.
    store.getState().setField('pretest.reliability', '0.81');
    expect(store.getState().validPlan.provenance?.['pretest.reliability']).toBeUndefined();
  });

  it('an unfinished value typed over a pilot value also drops the note (and the text is kept)', () => {
    const store = makeStore();
    store.getState().replacePlan(planWithNotes());
    store.getState().setField('groups.programme.pretestSD', '9.');
    const s = store.getState();
    expect(s.draft.groups.programme.pretestSD).toBe('9.');
    expect(draftProvenance(s.draft)?.['groups.programme.pretestSD']).toBeUndefined();
    expect(draftProvenance(s.draft)?.['pretest.reliability']).toEqual(RELIABILITY_NOTE);
  });

  it('in SEM mode the plan does not credit a reliability it does not hold; switching back restores it', () => {
    const store = makeStore();
    store.getState().replacePlan(planWithNotes());
    store.getState().setPretestMode('sem');
    store.getState().setField('pretest.sem', '4');
    expect(store.getState().problems).toEqual([]);
    expect(store.getState().validPlan.provenance?.['pretest.reliability']).toBeUndefined();
    store.getState().setPretestMode('reliability');
    expect(store.getState().validPlan.provenance?.['pretest.reliability']).toEqual(RELIABILITY_NOTE);
  });

  it('autosave keeps the notes and a new session restores them', () => {
    const storage = memoryStorage();
    const first = makeStore({ storage });
    first.getState().replacePlan(planWithNotes());
    const second = makeStore({ storage });
    expect(second.getState().validPlan.provenance?.['pretest.reliability']).toEqual(RELIABILITY_NOTE);
  });

  it('a plan without provenance stays without it', () => {
    const store = makeStore();
    store.getState().replacePlan(demoPlan());
    store.getState().setField('pretest.reliability', '0.7');
    expect('provenance' in store.getState().validPlan).toBe(false);
  });
});
