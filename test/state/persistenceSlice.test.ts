import { describe, expect, it } from 'vitest';
import { EXAMPLE_PLANS } from '../../src/io/examplePlans';
import { AUTOSAVE_KEY } from '../../src/state/persistenceSlice';
import { makeStore, memoryStorage } from './helpers';

describe('persistence slice: autosave, examples, files, links', () => {
  it('autosaves the draft as typed and restores it, invalid text included', () => {
    const storage = memoryStorage();
    const a = makeStore({ storage });
    a.getState().setField('groups.programme.label', 'Evening class');
    a.getState().setField('pretest.reliability', '1.4');
    expect(storage.data.has(AUTOSAVE_KEY)).toBe(true);
    const b = makeStore({ storage });
    expect(b.getState().draft.groups.programme.label).toBe('Evening class');
    expect(b.getState().draft.pretest.reliability).toBe('1.4');
    expect(b.getState().problems.map((p) => p.field)).toContain('pretest.reliability');
    // Results underneath are the demo's, marked stale, never missing.
    expect(b.getState().analytic).not.toBeNull();
    expect(b.getState().analyticStale).toBe(true);
  });

  it('ignores an unreadable autosave and starts from the demo', () => {
    const storage = memoryStorage();
    storage.setItem(AUTOSAVE_KEY, '{"version":1,"draft":{"title":3}}');
    const s = makeStore({ storage }).getState();
    expect(s.problems).toEqual([]);
    expect(s.validPlan.groups.programme.poolSize).toBe(180);
  });

  it('resets to the demo', () => {
    const store = makeStore();
    store.getState().setField('pretest.reliability', 'abc');
    store.getState().resetToDemo();
    expect(store.getState().draft.pretest.reliability).toBe('0.75');
    expect(store.getState().problems).toEqual([]);
    expect(store.getState().notice?.kind).toBe('info');
  });

  it('loads every built-in example as a valid plan', () => {
    const store = makeStore();
    for (const ex of EXAMPLE_PLANS) {
      store.getState().loadExample(ex.id);
      expect(store.getState().problems).toEqual([]);
      expect(store.getState().validPlan.title).toBe(ex.plan.title);
    }
    store.getState().loadExample('no-such-example');
    expect(store.getState().notice).toEqual({ kind: 'error', text: 'There is no example called "no-such-example".' });
  });

  it('round-trips a plan file and keeps the plan when a file is bad', () => {
    const store = makeStore();
    store.getState().setField('matching.caliper', '0.35');
    const text = store.getState().planFileText();
    const other = makeStore();
    expect(other.getState().openPlanText(text, 'mine.json')).toBe(true);
    expect(other.getState().validPlan.matching.caliper).toBe(0.35);

    const before = other.getState().draft;
    expect(other.getState().openPlanText('{"format": "meanward-plan", "version": 1, ', 'broken.json')).toBe(false);
    expect(other.getState().draft).toBe(before);
    const notice = other.getState().notice!;
    expect(notice.kind).toBe('error');
    expect(notice.text).toMatch(/^The file "broken.json" could not be opened; your current plan is unchanged\./);
  });

  it('round-trips a share link and explains a bad one without touching the plan', () => {
    const store = makeStore();
    store.getState().setField('outcome.hypothesisedEffect', '4');
    const fragment = store.getState().shareFragment();
    expect(fragment.startsWith('#plan=')).toBe(true);
    const other = makeStore();
    expect(other.getState().openShareFragment(fragment)).toBe(true);
    expect(other.getState().validPlan.outcome.hypothesisedEffect).toBe(4);

    const before = other.getState().draft;
    expect(other.getState().openShareFragment('#plan=eyJmb3Jt')).toBe(false);
    expect(other.getState().draft).toBe(before);
    expect(other.getState().notice?.text).toMatch(/^The shared link could not be read, so your current plan is unchanged\. ./);
    // A fragment that carries no plan is not a share link at all: nothing happens.
    expect(other.getState().openShareFragment('#results')).toBe(false);
  });
});
