import type { ModelParameters } from './modelParameters';
import { matchedTrueScoreMeans } from './matchedTrueScoreMeans';

/** Standardised mean differences (programme minus comparison, pooled SD) before and after matching. */
export interface ExpectedBalance {
  observedSMDBefore: number;
  observedSMDAfter: number;
  trueSMDBefore: number;
  trueSMDAfter: number;
}

/**
 * Closed-form balance on the observed pretest and on the true score, before
 * and after exact matching on the observed pretest from an unlimited
 * comparison pool. Before: SMD = Delta / pooled SD (observed SDs for the
 * observed pretest, true-score SDs for the true score; pooled SD =
 * sqrt((s_P^2 + s_C^2) / 2), Cochran & Rubin 1973's unit). After: the
 * observed SMD is 0 by construction, but the true-score gap is
 * (1 - rho_C) Delta (Kelley 1947 regression within the comparison group;
 * Thorndike 1942), so the true SMD after matching is (1 - rho_C) Delta / pooled true SD:
 * matched groups look balanced and are not.
 *
 * @param model model parameters (deriveModelParameters); SDs > 0, reliabilities in (0, 1].
 * @returns the four SMDs (unitless).
 * @throws Error when the model's reliabilities are outside (0, 1] (via kelleyTrueScore).
 * @example
 *   // means 44 vs 54, observed SDs 10, reliabilities .75 (true SD 8.660):
 *   // observed SMD -1.0 → 0; true SMD -1.155 → -0.289.
 */
export function expectedBalance(model: ModelParameters): ExpectedBalance {
  const pooledObserved = Math.sqrt((model.observedSD.programme ** 2 + model.observedSD.comparison ** 2) / 2);
  const pooledTrue = Math.sqrt((model.trueSD.programme ** 2 + model.trueSD.comparison ** 2) / 2);
  const after = matchedTrueScoreMeans(model);
  const result = {
    observedSMDBefore: model.pretestGap / pooledObserved,
    observedSMDAfter: 0,
    trueSMDBefore: model.pretestGap / pooledTrue,
    trueSMDAfter: after.hiddenGap / pooledTrue,
  };
  for (const [k, v] of Object.entries(result)) {
    if (!Number.isFinite(v)) throw new Error(`The expected balance (${k}) could not be computed: check the pretest SDs and reliability.`);
  }
  return result;
}
