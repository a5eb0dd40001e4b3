import type { StateCreator } from 'zustand';
import { applyRemedy, type RemedyId } from '../core/applyRemedy';
import { COMPARE_MAX_PLANS } from '../core/comparePlans';
import { ANALYSIS_IDS, type AnalysisId, type Plan } from '../core/plan';
import { MissingEngineError } from '../core/engineRegistry';
import type { DraftStorage, MeanwardDeps } from './deps';
import type { MeanwardState } from './store';

/** localStorage key of the session's named variants (autosaved after every change). */
export const VARIANTS_KEY = 'meanward.variants.v1';

/** Longest variant name accepted. */
export const VARIANT_NAME_MAX = 80;

/** One named candidate plan kept in the session. */
export interface PlanVariant {
  id: string;
  name: string;
  plan: Plan;
  /** The analysis this variant relies on (default: the design's headline analysis). */
  analysisId?: AnalysisId;
  /** What was changed, when a remedy made it. */
  note?: string;
}

export interface VariantsSlice {
  variants: PlanVariant[];
  /** The variant the form edits (its plan follows every valid edit); null: the form's plan is not kept as a variant yet. */
  activeVariantId: string | null;
  /** Variants chosen for the comparison, in the order chosen (at most six). */
  compareIds: string[];
  /** A message about the last variant action (shown and announced beside the list). */
  variantMessage: string | null;
  /** Keep the form's current valid plan as a new variant and make it the one the form edits. */
  keepAsVariant: (name?: string) => void;
  duplicateVariant: (id: string) => void;
  /** @returns a plain message when the name is refused (the list is unchanged), else null. */
  renameVariant: (id: string, name: string) => string | null;
  deleteVariant: (id: string) => void;
  /** Load a variant into the form (Undo offered) and edit it from now on. */
  openVariant: (id: string) => void;
  toggleCompare: (id: string) => void;
  /** Add a variant with one remedy applied (applyRemedy) and put it beside the current plan in the comparison. */
  tryRemedy: (remedyId: RemedyId) => void;
  /**
   * Add a candidate plan made elsewhere (e.g. a cell of the design explorer) and put it in the
   * comparison, keeping the form's plan as "As planned" first when it is not a variant yet.
   * The name is made unique; returns the variant added.
   */
  addCandidatePlan: (candidate: Omit<PlanVariant, 'id'>) => PlanVariant;
  /** Called when the valid plan changes: the active variant follows it. */
  followValidPlan: (plan: Plan) => void;
}

/**
 * The stored variants, or nothing when absent or unreadable. Throws only MissingEngineError, when
 * checking a stored variant needs an engine not loaded yet (the slice reads them again once it is).
 */
export function readStoredVariants(storage: DraftStorage | null | undefined, validate: MeanwardDeps['validatePlan']): Pick<VariantsSlice, 'variants' | 'activeVariantId' | 'compareIds'> {
  const empty = { variants: [], activeVariantId: null, compareIds: [] };
  try {
    const raw = storage?.getItem(VARIANTS_KEY);
    if (!raw) return empty;
    const data = JSON.parse(raw) as { variants?: unknown; activeVariantId?: unknown; compareIds?: unknown };
    if (!Array.isArray(data.variants)) return empty;
    const variants: PlanVariant[] = [];
    for (const v of data.variants as Record<string, unknown>[]) {
      if (typeof v?.id !== 'string' || typeof v.name !== 'string') continue;
      const check = validate(v.plan);
      if (!check.ok) continue;
      const analysisId = (ANALYSIS_IDS as readonly string[]).includes(v.analysisId as string) ? (v.analysisId as AnalysisId) : undefined;
      variants.push({ id: v.id, name: v.name, plan: check.plan, ...(analysisId ? { analysisId } : {}), ...(typeof v.note === 'string' ? { note: v.note } : {}) });
    }
    const ids = new Set(variants.map((v) => v.id));
    const active = typeof data.activeVariantId === 'string' && ids.has(data.activeVariantId) ? data.activeVariantId : null;
    const compare = Array.isArray(data.compareIds) ? (data.compareIds as unknown[]).filter((x): x is string => typeof x === 'string' && ids.has(x)) : [];
    return { variants, activeVariantId: active, compareIds: compare.slice(0, COMPARE_MAX_PLANS) };
  } catch (e) {
    if (e instanceof MissingEngineError) throw e;
    return empty;
  }
}

export const createVariantsSlice =
  (deps: MeanwardDeps): StateCreator<MeanwardState, [], [], VariantsSlice> =>
  (set, get) => {
    const highestId = (vs: readonly PlanVariant[], from: number) => vs.reduce((n, v) => Math.max(n, Number(v.id.replace(/\D/g, '')) || 0), from);
    let counter = 0;
    // True while stored variants wait for an engine: nothing is saved over them meanwhile.
    let storedUnread = false;
    let restored: ReturnType<typeof readStoredVariants>;
    try {
      restored = readStoredVariants(deps.storage, deps.validatePlan);
    } catch (e) {
      if (!(e instanceof MissingEngineError) || !deps.loadEngines) throw e;
      // A stored variant of a design whose checks are still loading: the variants are read once
      // they arrive (the page waits for them before its first render, so nothing is saved over them).
      restored = { variants: [], activeVariantId: null, compareIds: [] };
      storedUnread = true;
      void deps.loadEngines([e.engine]).then(
        () => {
          let later: ReturnType<typeof readStoredVariants>;
          try {
            later = readStoredVariants(deps.storage, deps.validatePlan);
          } catch {
            return; // still not checkable: they stay stored, untouched
          }
          // Variants kept meanwhile (the page renders only after this, so none in practice) win for
          // this visit, and the stored ones stay stored, untouched.
          if (get().variants.length > 0) return;
          storedUnread = false;
          counter = highestId(later.variants, counter);
          set(later);
        },
        () => undefined, // the engines could not be fetched: the stored variants stay stored, untouched
      );
    }
    counter = highestId(restored.variants, counter);
    const newId = () => `v${++counter}`;
    const save = () => {
      if (storedUnread) return;
      const { variants, activeVariantId, compareIds } = get();
      try {
        deps.storage?.setItem(VARIANTS_KEY, JSON.stringify({ variants, activeVariantId, compareIds }));
      } catch {
        // Storage full or blocked: the variants stay for this page.
      }
    };
    const update = (partial: Partial<VariantsSlice>) => {
      set(partial);
      save();
    };
    const uniqueName = (base: string) => {
      const taken = new Set(get().variants.map((v) => v.name));
      if (!taken.has(base)) return base;
      for (let i = 2; ; i++) if (!taken.has(`${base} (${i})`)) return `${base} (${i})`;
    };
    const addToCompare = (ids: string[], id: string) => (ids.includes(id) || ids.length >= COMPARE_MAX_PLANS ? ids : [...ids, id]);
    return {
      ...restored,
      variantMessage: null,
      keepAsVariant: (name) => {
        const v: PlanVariant = { id: newId(), name: uniqueName(name?.trim() || `Variant ${get().variants.length + 1}`), plan: structuredClone(get().validPlan) };
        update({ variants: [...get().variants, v], activeVariantId: v.id, compareIds: addToCompare(get().compareIds, v.id), variantMessage: `Kept the plan as "${v.name}"; the form now edits it.` });
      },
      duplicateVariant: (id) => {
        const src = get().variants.find((v) => v.id === id);
        if (!src) return;
        const v: PlanVariant = { ...structuredClone(src), id: newId(), name: uniqueName(`Copy of ${src.name}`) };
        const list = [...get().variants];
        list.splice(list.indexOf(src) + 1, 0, v);
        update({ variants: list, variantMessage: `Made "${v.name}".` });
      },
      renameVariant: (id, name) => {
        const clean = name.trim();
        if (clean === '') return 'A variant needs a name; the old name is kept.';
        if (clean.length > VARIANT_NAME_MAX) return `A variant name can be at most ${VARIANT_NAME_MAX} characters; this one has ${clean.length}.`;
        if (get().variants.some((v) => v.id !== id && v.name === clean)) return `Another variant is already called "${clean}"; pick a different name.`;
        update({ variants: get().variants.map((v) => (v.id === id ? { ...v, name: clean } : v)), variantMessage: null });
        return null;
      },
      deleteVariant: (id) => {
        const gone = get().variants.find((v) => v.id === id);
        if (!gone) return;
        update({
          variants: get().variants.filter((v) => v.id !== id),
          activeVariantId: get().activeVariantId === id ? null : get().activeVariantId,
          compareIds: get().compareIds.filter((x) => x !== id),
          variantMessage: `Deleted "${gone.name}". The form keeps its plan.`,
        });
      },
      openVariant: (id) => {
        const v = get().variants.find((x) => x.id === id);
        if (!v) return;
        const before = get().draft;
        // Set the active id after the replace, so the old active variant keeps its plan.
        set({ activeVariantId: null });
        get().replacePlan(structuredClone(v.plan));
        get().offerUndo(before, 'variant', `Opened the variant "${v.name}" in the form.`);
        update({ activeVariantId: id, variantMessage: `The form now edits "${v.name}".` });
      },
      toggleCompare: (id) => {
        const ids = get().compareIds;
        if (ids.includes(id)) update({ compareIds: ids.filter((x) => x !== id), variantMessage: null });
        else if (ids.length >= COMPARE_MAX_PLANS) set({ variantMessage: `At most ${COMPARE_MAX_PLANS} variants fit in one comparison; untick one first.` });
        else update({ compareIds: [...ids, id], variantMessage: null });
      },
      tryRemedy: (remedyId) => {
        const plan = get().validPlan;
        let r: ReturnType<typeof applyRemedy>;
        try {
          r = applyRemedy(plan, remedyId);
        } catch (err) {
          set({ variantMessage: `This remedy could not be applied: ${err instanceof Error ? err.message : String(err)}` });
          return;
        }
        if (!r.ok) {
          set({ variantMessage: r.reason });
          return;
        }
        if (get().activeVariantId === null) get().keepAsVariant('As planned');
        const v: PlanVariant = { id: newId(), name: uniqueName(r.variantName), plan: r.plan, analysisId: r.analysisId, note: r.changes.join(' ') };
        update({
          variants: [...get().variants, v],
          compareIds: addToCompare(get().compareIds, v.id),
          variantMessage: `Added the variant "${v.name}" to the comparison. ${v.note}`,
        });
      },
      addCandidatePlan: (candidate) => {
        if (get().activeVariantId === null) get().keepAsVariant('As planned');
        const v: PlanVariant = { ...candidate, id: newId(), name: uniqueName(candidate.name) };
        update({
          variants: [...get().variants, v],
          compareIds: addToCompare(get().compareIds, v.id),
          variantMessage: `Added the variant "${v.name}" to the comparison.${v.note ? ` ${v.note}` : ''}`,
        });
        return v;
      },
      followValidPlan: (plan) => {
        const id = get().activeVariantId;
        if (id === null) return;
        update({ variants: get().variants.map((v) => (v.id === id ? { ...v, plan: structuredClone(plan) } : v)) });
      },
    };
  };
