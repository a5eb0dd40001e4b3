import type { AnalysisId } from '../plan';
import type { DesignAtN } from '../requiredNPerGroup';
import { adjustedDifferenceStandardError, type GroupMoments } from '../adjustedDifferenceStandardError';
import { formatNumber, requireReliability } from '../inputChecks';
import { welchSatterthwaiteDf } from '../welchSatterthwaiteDf';
import { globalLinearDiscontinuity, type RegressionDiscontinuityEstimator } from './selectionEstimates';
import { SEL_OUTCOME, SEL_PRETEST, type SelectedGroup, type SelectionModel } from './selectionModel';
import type { SelectionMatchedFigures } from './selectionMatching';

/** An analysis' precision in a selection design: SE and df as planned, and at other sizes for the required n. */
export interface SelectionPrecision {
  se: number;
  df: number;
  /**
   * SE and df when the programme group has n people: the population is
   * scaled so that the rule keeps its split (comparison n·n_C/n_P; each group
   * at least 2); for a matched difference, n matched programme members.
   */
  design: DesignAtN;
  nProgramme: number;
  nComparison: number;
  /** Regression discontinuity only (Goldberger 1972). */
  varianceInflation?: number;
}

/** Variance of Y0 − X within a group (the gain's variance; the effect is a constant). */
function gainVariance(g: SelectedGroup): number {
  const c = g.cov;
  return (
    ((c[SEL_OUTCOME] as number[])[SEL_OUTCOME] as number) +
    ((c[SEL_PRETEST] as number[])[SEL_PRETEST] as number) -
    2 * ((c[SEL_PRETEST] as number[])[SEL_OUTCOME] as number)
  );
}

/** One group's moments of (X, Y0) for the adjusted-difference SE. */
function pretestMoments(g: SelectedGroup, n: number): GroupMoments {
  return {
    n,
    varY: (g.cov[SEL_OUTCOME] as number[])[SEL_OUTCOME] as number,
    covXY: [(g.cov[SEL_PRETEST] as number[])[SEL_OUTCOME] as number],
    covX: [[(g.cov[SEL_PRETEST] as number[])[SEL_PRETEST] as number]],
  };
}

/**
 * Approximate SE and df of each analysis in a selection design, with the
 * expected group sizes n_g (population × share, not rounded):
 * - gainScore: Welch (1947), each group's own Var(Y − X) over n_g, Welch–Satterthwaite df;
 * - ancova, correctedAncova: the delta-method SE of adjustedDifferenceStandardError with the groups'
 *   moments of (X, Y0), M = 1 or 1/ρ′ (Porter 1967);
 * - regressionDiscontinuity: the estimator's OLS variance (globalLinearDiscontinuity), df N − 3;
 * - matchedDifference: an APPROXIMATION from the conditional variances at exact matching with
 *   k partners per matched programme member (no reuse, no caliper slack):
 *   SE² = (E_P[Var(Y0|X, P)] + E_P[Var(Y0|X, C)]/k + Var_P(D(X))) / n_matched, df n_matched − 1;
 *   the quick simulation of the planned procedure replaces it;
 * - prePostChange: sd(Y − X | selected) / sqrt(n_P), df n_P − 1 (the one-sample t; common practice).
 *
 * @param id analysis. @param m selection model. @param options ρ′, ratio k, expected matched programme members,
 *   the matched difference's figures (matchedDifference only) and the RD estimator.
 * @returns the precision; throws for a matched difference without overlap (callers report it infeasible first).
 * @throws Error when a size is below 2 or the SE is zero (the outcome fully predicted).
 * @example one group, Var(Y − X | selected) 86.6, 4,000 selected → SE 0.147, df 3999
 */
export function selectionStandardError(
  id: AnalysisId,
  m: SelectionModel,
  options: {
    assumedReliability: number;
    ratio: number;
    matchedProgramme: number;
    matched?: SelectionMatchedFigures;
    rd?: RegressionDiscontinuityEstimator;
  },
): SelectionPrecision {
  const nP = m.programme.n;
  const nC = m.comparison.n;
  const split = nC / nP;
  // Sizes at a programme size n with the rule's split kept, each at least 2 (the required-n search starts small).
  const sizesAt = (n: number): [number, number] => [Math.max(2, n), Math.max(2, n * split)];
  let out: SelectionPrecision;
  switch (id) {
    case 'gainScore': {
      const vP = gainVariance(m.programme);
      const vC = gainVariance(m.comparison);
      const at = (n: number) => {
        const [np, nc] = sizesAt(n);
        const a = vP / np;
        const b = vC / nc;
        const df = welchSatterthwaiteDf([
          { variance: a, df: np - 1 },
          { variance: b, df: nc - 1 },
        ]);
        return { se: Math.sqrt(a + b), df };
      };
      out = { ...at(nP), design: at, nProgramme: nP, nComparison: nC };
      break;
    }
    case 'ancova':
    case 'correctedAncova': {
      const c = id === 'ancova' ? 1 : 1 / requireReliability(options.assumedReliability, 'The assumed reliability for the corrected ANCOVA');
      const gap = (m.programme.mean[SEL_PRETEST] as number) - (m.comparison.mean[SEL_PRETEST] as number);
      const at = (n: number) => {
        const [np, nc] = sizesAt(n);
        return adjustedDifferenceStandardError(pretestMoments(m.programme, np), pretestMoments(m.comparison, nc), [gap], [[c]]);
      };
      out = { ...at(nP), design: at, nProgramme: nP, nComparison: nC };
      break;
    }
    case 'regressionDiscontinuity': {
      const rd = options.rd ?? globalLinearDiscontinuity;
      const p = m.programme.share;
      const at = (n: number) => {
        const r = rd.precision(m, Math.max(n / p, 4));
        return { se: r.se, df: r.df };
      };
      const now = rd.precision(m, nP + nC);
      out = { se: now.se, df: now.df, design: at, nProgramme: nP, nComparison: nC, varianceInflation: now.varianceInflation };
      break;
    }
    case 'matchedDifference': {
      const f = options.matched;
      if (!f || !f.overlap) throw new Error('The matched difference has no standard error here: the rule leaves no overlap on the pretest.');
      const k = options.ratio;
      if (!(k >= 1)) throw new Error(`The matching ratio must be at least 1; got ${formatNumber(k)}.`);
      const perMember = f.programmeVariance + f.comparisonVariance / k + f.differenceSpread;
      const at = (n: number) => ({ se: Math.sqrt(perMember / Math.max(2, n)), df: Math.max(1, n - 1) });
      const n = Math.max(2, options.matchedProgramme);
      out = { ...at(n), design: at, nProgramme: n, nComparison: n * k };
      break;
    }
    case 'personLevelAncova':
      throw new Error('The person-level ANCOVA belongs to clustered designs, not to a selection rule.');
    case 'prePostChange': {
      const v = gainVariance(m.programme);
      const at = (n: number) => ({ se: Math.sqrt(v / Math.max(2, n)), df: Math.max(1, n - 1) });
      out = { ...at(nP), design: at, nProgramme: nP, nComparison: 0 };
      break;
    }
  }
  if (!(out.se > 0) || !Number.isFinite(out.se)) {
    throw new Error(
      'The standard error of this analysis is zero or undefined: the outcome would be predicted perfectly. ' +
        'Check the pre–post correlation and the reliability.',
    );
  }
  return out;
}
