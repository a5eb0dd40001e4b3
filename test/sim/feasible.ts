import { isFeasible, type SimAnalysisResult, type SimAnalysisSummary } from '../../src/sim/types';

/** The summary of a simulated analysis the test expects to be computable; fails the test with its reason otherwise. */
export function feasible(s: SimAnalysisResult): SimAnalysisSummary {
  if (!isFeasible(s)) throw new Error(`expected a simulated summary, got: ${s.reason}`);
  return s;
}
