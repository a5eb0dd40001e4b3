import { requireFinite, requireNonNegative, requireOpenInterval } from './inputChecks';
import { normalQuantile } from './distributions';

/** Range in which an analysis' estimate is expected to fall in repeated studies. */
export interface EstimateInterval {
  lower: number;
  upper: number;
  /** Normal quantile used (1.96 for 95%). */
  z: number;
}

/**
 * Where an analysis' estimate is expected to land in repeated studies before
 * any simulation: expected estimate ± z·SE, z the normal quantile for the
 * coverage (1.96 for 95%; common practice, large-sample normal approximation).
 *
 * @param expectedEstimate expected estimate, posttest points (finite).
 * @param se approximate standard error, posttest points (≥ 0).
 * @param coverage share of studies inside the range, in (0, 1); default 0.95.
 * @returns lower and upper ends, posttest points, and the z used.
 * @throws Error on non-finite input, negative SE or coverage outside (0, 1).
 * @example expectedEstimateInterval(4, 1) // { lower: 2.040, upper: 5.960, z: 1.960 }
 */
export function expectedEstimateInterval(expectedEstimate: number, se: number, coverage = 0.95): EstimateInterval {
  requireFinite(expectedEstimate, 'The expected estimate');
  requireNonNegative(se, 'The standard error');
  requireOpenInterval(coverage, 0, 1, 'The coverage');
  const z = normalQuantile(1 - (1 - coverage) / 2);
  return { lower: expectedEstimate - z * se, upper: expectedEstimate + z * se, z };
}
