import type { StateCreator } from 'zustand';
import { addCovariate, moveCovariate, removeCovariate, setCorrelationText } from './covariateDraft';
import type { MeanwardState } from './store';

/**
 * Editing the list of covariates and their correlation matrix. Each action
 * builds the next draft (list and matrix resized or permuted together, typed
 * text kept) and hands it to the draft slice, which validates and analyses
 * it as for any other edit. Single covariate fields ("covariates.1.sd",
 * "covariates.0.measured") are set with the draft slice's setField.
 */
export interface CovariateSlice {
  /** Add a neutral covariate at the end (no group gap, uncorrelated): results stay as they were. */
  addCovariate(): void;
  /** Remove covariate `index` (0-based) with its matrix row and column. */
  removeCovariate(index: number): void;
  /** Move covariate `index` one place up (-1) or down (+1); its correlations move with it. */
  moveCovariate(index: number, step: -1 | 1): void;
  /**
   * Set matrix cell (i, j) (0 = pretest); the mirror cell (j, i) gets the same text.
   * how = 'typing' for a keystroke: a valid result waits for a commit or a pause (see typeField).
   */
  setCorrelation(i: number, j: number, text: string, how?: 'commit' | 'typing'): void;
}

export const createCovariateSlice: StateCreator<MeanwardState, [], [], CovariateSlice> = (_set, get) => ({
  addCovariate: () => get().replaceDraft(addCovariate(get().draft)),
  removeCovariate: (index) => get().replaceDraft(removeCovariate(get().draft, index)),
  moveCovariate: (index, step) => {
    const d = get().draft;
    const next = moveCovariate(d, index, step);
    if (next !== d) get().replaceDraft(next);
  },
  setCorrelation: (i, j, text, how = 'commit') => get().replaceDraft(setCorrelationText(get().draft, i, j, text), how),
});
