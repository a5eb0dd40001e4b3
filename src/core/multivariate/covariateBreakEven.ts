import type { BreakEven } from '../analyticResults';
import type { ModelParameters } from '../modelParameters';
import type { MatchingDistance } from '../plan';
import { breakEvenFromTarget, breakEvenReliability } from '../breakEvenReliability';
import { formatPointsText, requireNonNegative } from '../inputChecks';
import type { CovariateModel } from './covariateModel';
import { covariateModelWithSem } from './adjustCovariateModel';
import { expectedTrueGapAfterMatching } from './covariateMatchedEstimate';
import { dot } from './linearAlgebra';

/**
 * The comparison group's within-group pretest reliability at which the
 * matched-difference artefact (beta' × true-score gap after matching, growth
 * gap excluded) shrinks to the tolerable share of the hoped-for effect, under
 * the covariate model, and the parallel pretests (Spearman–Brown) that would
 * take the pretest there. The pretest's SEM is varied with true scores held
 * fixed (covariateModelWithSem); the other covariates' measurement error and
 * the unmeasured covariates leave an artefact that no pretest removes: when
 * even a perfect pretest leaves more than the tolerance, the reliability is
 * null and the note says how much remains. The artefact need not shrink
 * monotonically with reliability when covariates pull in different
 * directions, so the answer is the lowest reliability above which it stays
 * tolerable: found on a grid of 200 reliabilities, then refined by bisection
 * (to 1e-10).
 *
 * Reference: as breakEvenReliability (Thorndike 1942; Spearman 1910, Brown 1910),
 * with the several-covariate closed form of covariateMatchedEstimate (computed).
 *
 * @param cm the covariate model. @param m the one-pretest model.
 * @param distance the matching distance. @param tolerableShare share of |tau| (≥ 0).
 * @returns a BreakEven record (as breakEvenReliability; with one variable the same figures).
 * @throws Error when tolerableShare is negative.
 * @example pretest only → breakEvenReliability(m, share).reliability to 1e-9
 */
export function covariateBreakEven(
  cm: CovariateModel,
  m: ModelParameters,
  distance: MatchingDistance,
  tolerableShare: number,
): BreakEven {
  requireNonNegative(tolerableShare, 'The tolerable share of the effect');
  const tau = cm.effect;
  if (tau === 0) return breakEvenReliability(m, tolerableShare);
  const tol = tolerableShare * Math.abs(tau);
  const tvC = cm.sigmaT.comparison[0]![0] as number;
  const rho = cm.reliability.comparison[0] as number;
  const artefactAt = (r: number): number => {
    const sem = Math.sqrt((tvC * (1 - r)) / r);
    return dot(cm.beta, expectedTrueGapAfterMatching(covariateModelWithSem(cm, 0, sem), distance));
  };
  const ok = (r: number): boolean => Math.abs(artefactAt(r)) <= tol * (1 + 1e-12);
  const atOne = artefactAt(1);
  if (!ok(1)) {
    return {
      reliability: null,
      alreadyMet: false,
      parallelForms: null,
      note:
        `Even a perfectly reliable pretest would leave a matched-difference artefact of ${formatPointsText(atOne)} points ` +
        `(from the other covariates' measurement error and the unmeasured covariates), more than the tolerable ` +
        `${formatPointsText(tol)}: see the other remedies.`,
    };
  }
  // Lowest grid reliability above which every grid point is tolerable.
  const steps = 200;
  let lo = 0;
  let hi = 1;
  for (let i = steps - 1; i >= 1; i--) {
    const r = i / steps;
    if (!ok(r)) {
      lo = r;
      hi = (i + 1) / steps;
      break;
    }
    hi = r;
    lo = 0;
  }
  if (lo === 0) {
    return {
      reliability: null,
      alreadyMet: true,
      parallelForms: 1,
      note: 'The artefact stays within the tolerable share of the effect at any pretest reliability.',
    };
  }
  for (let i = 0; i < 60 && hi - lo > 1e-10; i++) {
    const mid = (lo + hi) / 2;
    if (ok(mid)) hi = mid;
    else lo = mid;
  }
  const target = hi;
  return breakEvenFromTarget(
    rho,
    target,
    rho >= target && ok(rho),
    'Only a perfectly reliable pretest would keep the artefact tolerable: no number of parallel pretests reaches it.',
  );
}
