import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { VARIANTS_KEY } from '../../src/state/variantsSlice';
import { makeStore, memoryStorage } from './helpers';

/*
 * Demo plan (invented): within-group reliability .75, beta 0.8, observed gap
 * −10: matched-difference artefact beta(1 − rho)Delta = −2.0 (Cochran & Rubin
 * 1973, from memory); gain score (beta − 1)Delta = +2.0 (Lord 1967).
 */
describe('plan variants in the session', () => {
  it('keeps, duplicates, renames and deletes variants, autosaving them all', () => {
    const storage = memoryStorage();
    const store = makeStore({ storage });
    const s = () => store.getState();
    s().keepAsVariant('As planned');
    const first = s().variants[0]!;
    expect(s().activeVariantId).toBe(first.id);
    s().duplicateVariant(first.id);
    expect(s().variants.map((v) => v.name)).toEqual(['As planned', 'Copy of As planned']);
    const copy = s().variants[1]!;
    expect(s().renameVariant(copy.id, '  ')).toContain('needs a name');
    expect(s().renameVariant(copy.id, 'As planned')).toContain('already called');
    expect(s().renameVariant(copy.id, 'Wider caliper')).toBeNull();
    // The form edits the active variant: a valid edit follows into it, not into the copy.
    s().setField('matching.caliper', '0.4');
    s().commitDraft();
    expect(s().variants[0]!.plan.matching.caliper).toBe(0.4);
    expect(s().variants[1]!.plan.matching.caliper).toBe(0.2);
    // Reload: every variant comes back from storage.
    const again = makeStore({ storage });
    expect(again.getState().variants.map((v) => v.name)).toEqual(['As planned', 'Wider caliper']);
    expect(again.getState().variants[0]!.plan.matching.caliper).toBe(0.4);
    s().deleteVariant(first.id);
    expect(s().activeVariantId).toBeNull();
    expect(JSON.parse(storage.data.get(VARIANTS_KEY)!).variants).toHaveLength(1);
  });

  it('"try this" adds the variant with the remedy applied and puts it in the comparison beside the plan', () => {
    const store = makeStore();
    const s = () => store.getState();
    s().tryRemedy('gain-score');
    expect(s().variants.map((v) => v.name)).toEqual(['As planned', 'Try: Compare gain scores (post-test minus pretest)']);
    expect(s().compareIds).toHaveLength(2);
    const v = s().variants[1]!;
    expect(v.analysisId).toBe('gainScore');
    expect(analysePlan(v.plan).analyses.gainScore!.bias).toBeCloseTo((0.8 - 1) * -10, 9);
    s().tryRemedy('comparison-group');
    expect(s().variantMessage).toContain('comparison-group');
  });

  it('opening a variant puts it in the form with Undo, and at most six are compared', () => {
    const store = makeStore();
    const s = () => store.getState();
    s().tryRemedy('tighter-caliper');
    const tight = s().variants[1]!;
    s().openVariant(tight.id);
    expect(s().validPlan.matching.caliper).toBeCloseTo(0.1, 12);
    expect(s().activeVariantId).toBe(tight.id);
    expect(s().notice?.action).toBe('undo');
    for (let i = 0; i < 6; i++) s().duplicateVariant(tight.id);
    for (const v of s().variants) if (!s().compareIds.includes(v.id)) s().toggleCompare(v.id);
    expect(s().compareIds).toHaveLength(6);
    expect(s().variantMessage).toContain('At most 6');
  });
});
