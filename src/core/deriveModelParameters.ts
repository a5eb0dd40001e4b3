import type { Plan } from './plan';
import type { ModelParameters } from './modelParameters';
import { formatNumber } from './inputChecks';
import { outcomeSlope } from './outcomeSlope';
import { reliabilityToSem } from './reliabilityToSem';
import { trueScoreSD } from './trueScoreSD';

/**
 * Derive the generating model's parameters from a plan's researcher-facing inputs.
 *
 * Classical test theory (Lord & Novick 1968, ch. 3): the SEM is a property of
 * the instrument, so sem = referenceSD * sqrt(1 - reliability) when the
 * reliability was estimated in a population with SD referenceSD. Each group's
 * true-score SD is sqrt(SD_g^2 - sem^2) and its within-group reliability
 * trueSD_g^2 / SD_g^2. The outcome slope on the true score follows from the
 * within-group pre-post correlation r (comparison group):
 * cov(X, Y) = beta * trueVar_C, so beta = r * posttestSD / (SD_C * rho_C), and
 * residual variance = posttestSD^2 * (1 - r^2 / rho_C). A correlation with
 * r^2 > rho_C is impossible: an observed correlation cannot exceed the square
 * root of the reliability (Spearman 1904, attenuation).
 *
 * @param plan a plan whose fields have passed range validation.
 * @returns model parameters (points; reliabilities in (0, 1]).
 * @throws Error with a researcher-readable message when the inputs contradict
 *   each other (SEM not smaller than a group's SD; r^2 > reliability).
 * @example
 *   // SDs 15, reliability .8 in a population with SD 15 → sem = 6.708,
 *   // within-group reliability .8; r = .7, posttest SD 15 → beta = 0.875.
 */
export function deriveModelParameters(plan: Plan): ModelParameters {
  const { programme, comparison } = plan.groups;
  const sem = standardErrorOfMeasurement(plan);
  const trueVar = (sd: number, who: string): number => {
    if (!(sd > sem)) {
      throw new Error(
        `The pretest's SEM (${fmt(sem)} points) is not smaller than the ${who} group's pretest SD (${fmt(sd)}): ` +
          'the pretest would measure nothing but error in that group. Use a smaller SEM, a higher reliability, or check the SD.',
      );
    }
    return trueScoreSD(sd, sem) ** 2;
  };
  const tvP = trueVar(programme.pretestSD, 'programme');
  const tvC = trueVar(comparison.pretestSD, 'comparison');
  const rhoP = tvP / programme.pretestSD ** 2;
  const rhoC = tvC / comparison.pretestSD ** 2;
  const nP = programme.poolSize;
  const nC = comparison.poolSize;
  const pooled = (nP * tvP + nC * tvC) / (nP * programme.pretestSD ** 2 + nC * comparison.pretestSD ** 2);

  const { posttestSD, prePostCorrelation: r } = plan.outcome;
  // Throws the explanatory message when r^2 > rho_C.
  const { beta, residualSD } = outcomeSlope(comparison.pretestSD, rhoC, posttestSD, r);
  const residualVar = residualSD * residualSD;
  const effect =
    plan.outcome.effectScale === 'points' ? plan.outcome.hypothesisedEffect : plan.outcome.hypothesisedEffect * posttestSD;

  return {
    mean: { programme: programme.pretestMean, comparison: comparison.pretestMean },
    pretestGap: programme.pretestMean - comparison.pretestMean,
    observedSD: { programme: programme.pretestSD, comparison: comparison.pretestSD },
    trueSD: { programme: Math.sqrt(tvP), comparison: Math.sqrt(tvC) },
    sem,
    reliability: { programme: rhoP, comparison: rhoC, pooled },
    beta,
    residualSD: Math.sqrt(residualVar),
    posttestSD: { programme: Math.sqrt(beta * beta * tvP + residualVar), comparison: posttestSD },
    growthGap: plan.outcome.growthGap,
    effect,
    n: { programme: nP, comparison: nC },
  };
}

/**
 * The pretest's standard error of measurement in test points: the plan's `sem`
 * when given, else referenceSD * sqrt(1 - reliability) (Lord & Novick 1968,
 * eq. 3.8.4, from memory). referenceSD defaults to the comparison pretest SD.
 * @throws Error when neither reliability nor SEM is given.
 */
export function standardErrorOfMeasurement(plan: Plan): number {
  const { reliability, referenceSD, sem } = plan.pretest;
  if (sem !== undefined) return sem;
  if (reliability === undefined) {
    throw new Error('Give the pretest either a reliability or an SEM.');
  }
  const ref = referenceSD ?? plan.groups.comparison.pretestSD;
  return reliabilityToSem(reliability, ref);
}

const fmt = formatNumber;
