import type { StateCreator } from 'zustand';
import type { AnalysisId } from '../core/plan';
import type { MeanwardState } from './store';

/** Which analysis is pointed at; shared by every chart and table so they light up together. */
export interface HighlightSlice {
  highlight: AnalysisId | null;
  setHighlight(id: AnalysisId | null): void;
}

export const createHighlightSlice: StateCreator<MeanwardState, [], [], HighlightSlice> = (set, get) => ({
  highlight: null,
  setHighlight: (id) => {
    if (get().highlight !== id) set({ highlight: id });
  },
});
