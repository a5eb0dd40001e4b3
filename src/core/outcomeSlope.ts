import { formatNumber, requireFinite, requirePositive, requireReliability } from './inputChecks';

/** The outcome model's slope on the true pretest and its residual SD. */
export interface OutcomeModel {
  /** Slope of the outcome on the true pretest score (posttest points per pretest point). */
  beta: number;
  /** SD of the outcome's residual around beta·T, posttest points (≥ 0). */
  residualSD: number;
}

/**
 * The outcome's slope on the true pretest, and its residual SD, from the
 * observed within-group figures a researcher knows. Since cov(X, Y) =
 * β·var(T) = β·ρ·SD_X², β = r·SD_Y / (SD_X·ρ); the residual variance is
 * SD_Y²(1 − r²/ρ) (r²/ρ is the squared correlation with the true score,
 * Spearman's correction for attenuation).
 *
 * Reference: Spearman, C. (1904). The proof and measurement of association
 * between two things (correction for attenuation); Lord & Novick (1968, ch. 3), from memory.
 *
 * @param pretestSD within-group observed pretest SD, test points (> 0).
 * @param reliability within-group pretest reliability, in (0, 1].
 * @param posttestSD within-group posttest SD, posttest points (> 0).
 * @param prePostCorrelation within-group observed pre–post correlation r, in [−1, 1], with r² ≤ ρ.
 * @returns { beta, residualSD }.
 * @throws Error when r² > ρ: a correlation with a fallible pretest cannot
 *   exceed the square root of its reliability; or when inputs are out of range.
 * @example outcomeSlope(10, 0.75, 10, 0.6) // { beta: 0.8, residualSD: sqrt(52) ≈ 7.211 }
 */
export function outcomeSlope(
  pretestSD: number,
  reliability: number,
  posttestSD: number,
  prePostCorrelation: number,
): OutcomeModel {
  requirePositive(pretestSD, 'The pretest SD');
  requireReliability(reliability, 'The within-group pretest reliability');
  requirePositive(posttestSD, 'The posttest SD');
  const r = requireFinite(prePostCorrelation, 'The pre–post correlation');
  if (r < -1 || r > 1) {
    throw new Error(`The pre–post correlation must be between −1 and 1; got ${formatNumber(r)}.`);
  }
  if (r * r > reliability + 1e-12) {
    throw new Error(
      `A pre–post correlation of ${formatNumber(r)} is impossible with a within-group pretest reliability of ` +
        `${formatNumber(reliability)}: a correlation with a fallible pretest cannot exceed the square root of its ` +
        `reliability (${formatNumber(Math.sqrt(reliability))}).`,
    );
  }
  const beta = (r * posttestSD) / (pretestSD * reliability);
  const residualVar = Math.max(0, posttestSD * posttestSD * (1 - (r * r) / reliability));
  return { beta, residualSD: Math.sqrt(residualVar) };
}
