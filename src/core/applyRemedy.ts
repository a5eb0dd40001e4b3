import type { Remedy } from './analyticResults';
import type { AnalysisId, Plan } from './plan';
import { analysePlan } from './analysePlan';
import { modelWithPoolSizes, modelWithSem } from './adjustModel';
import { deriveModelParameters } from './deriveModelParameters';
import { studyDesign } from './design/studyDesign';
import { formatNumber } from './inputChecks';

/** The identifier of a remedy (see Remedy['id']). */
export type RemedyId = Remedy['id'];

/** A plan with one remedy applied: what a "try this" action turns into a new variant. */
export interface AppliedRemedy {
  ok: true;
  remedy: Remedy;
  /** The changed plan (a new object; the input plan is not changed). */
  plan: Plan;
  /** The analysis the changed plan relies on: the one whose artefact the remedy's remainingBias describes. */
  analysisId: AnalysisId;
  /** Plain-English list of what was changed, for the variant's note. */
  changes: string[];
  /** A short name for the new variant. */
  variantName: string;
}

export type ApplyRemedyResult = AppliedRemedy | { ok: false; reason: string };

/** The remedies applyRemedy can express as a changed plan (two existing groups, with or without covariates). */
export const APPLICABLE_REMEDY_IDS: readonly RemedyId[] = [
  'more-reliable-pretest',
  'corrected-ancova',
  'gain-score',
  'tighter-caliper',
  'looser-caliper',
  'larger-pools',
  'match-all-measured',
  'measure-confounders',
];

/**
 * The plan with one remedy of `rankRemedies` applied, so that the changed
 * plan's own closed-form results (analysePlan) give the artefact the remedy
 * promised (its remainingBias) for the analysis returned with it:
 * - 'more-reliable-pretest': the SEM divided by √k for k averaged parallel
 *   forms (Spearman 1910; Brown 1910), true scores and the outcome model kept:
 *   each group's observed SD becomes √(trueSD² + SEM²/k) (classical test
 *   theory, Lord & Novick 1968, ch. 3, from memory) and the observed pre–post
 *   correlation r·SD/SD′ (the covariance with the true score is unchanged);
 *   with covariates, the pretest's observed correlations are rescaled likewise;
 * - 'corrected-ancova': the same plan relying on the reliability-corrected
 *   ANCOVA at the researcher's own assumed reliability (Porter 1967), which is
 *   what the remedy's remaining artefact is computed at;
 * - 'gain-score': the same plan, relying on the gain score (Lord 1967);
 * - 'tighter-caliper' / 'looser-caliper': caliper × 0.5 / × 2;
 * - 'larger-pools': the comparison pool doubled;
 * - 'match-all-measured': Mahalanobis matching on all measured covariates;
 * - 'measure-confounders': every unmeasured covariate measured (and matched on).
 * Other remedies (selection rules, one-group studies, clusters) change how the
 * study is run in ways a plan cannot state yet; they return ok: false with a reason.
 * @param plan a validated plan. @param remedyId one of the plan's remedies.
 * @returns the changed plan, the analysis it relies on and a list of changes; or a plain reason.
 * @example applyRemedy(demoPlan(), 'gain-score').analysisId // 'gainScore'
 */
export function applyRemedy(plan: Plan, remedyId: RemedyId): ApplyRemedyResult {
  const analytic = analysePlan(plan);
  const remedy = analytic.remedies.find((r) => r.id === remedyId);
  if (remedy === undefined) return { ok: false, reason: `This plan has no remedy "${remedyId}".` };
  if (studyDesign(plan).kind !== 'existing-groups' || !APPLICABLE_REMEDY_IDS.includes(remedyId)) {
    return {
      ok: false,
      reason: `"${remedy.title}" changes how the study is run in a way a plan cannot state yet; change the plan by hand and keep this remedy's note.`,
    };
  }
  const next = structuredClone(plan);
  const changes: string[] = [];
  let analysisId: AnalysisId = 'matchedDifference';
  const m = deriveModelParameters(plan);
  switch (remedyId) {
    case 'more-reliable-pretest': {
      const be = analytic.breakEven;
      const k = be.alreadyMet ? 1 : (be.parallelForms ?? 2);
      if (k > 1) {
        const mk = modelWithSem(m, m.sem / Math.sqrt(k));
        const oldC = plan.groups.comparison.pretestSD;
        next.pretest = { sem: mk.sem };
        next.groups.programme.pretestSD = mk.observedSD.programme;
        next.groups.comparison.pretestSD = mk.observedSD.comparison;
        const scale = oldC / mk.observedSD.comparison;
        next.outcome.prePostCorrelation = plan.outcome.prePostCorrelation * scale;
        if (next.covariateCorrelations !== undefined) {
          next.covariateCorrelations = next.covariateCorrelations.map((row, i) =>
            row.map((v, j) => (i === j ? v : i === 0 || j === 0 ? v * scale : v)),
          );
        }
        changes.push(
          `The pretest is the average of ${k} parallel forms: SEM ${formatNumber(m.sem)} → ${formatNumber(mk.sem)} points; ` +
            `observed pretest SDs and the pre–post correlation follow (true scores unchanged).`,
        );
      } else {
        changes.push('The pretest is kept: it is already reliable enough.');
      }
      break;
    }
    case 'corrected-ancova':
      // The researcher's own assumed reliability is kept: the remedy promises what is left at that figure.
      analysisId = 'correctedAncova';
      changes.push(
        `Relies on the reliability-corrected ANCOVA at the reliability you assumed (${formatNumber(plan.analysis.assumedReliability)}); ` +
          `it leaves no artefact only if that equals the pooled within-group reliability of these groups, ${formatNumber(m.reliability.pooled)}.`,
      );
      break;
    case 'gain-score':
      analysisId = 'gainScore';
      changes.push('Relies on the gain score (posttest minus pretest) instead of matching.');
      break;
    case 'tighter-caliper':
    case 'looser-caliper': {
      const factor = remedyId === 'tighter-caliper' ? 0.5 : 2;
      next.matching.caliper = plan.matching.caliper * factor;
      changes.push(`Caliper ${formatNumber(plan.matching.caliper)} → ${formatNumber(next.matching.caliper)}.`);
      break;
    }
    case 'larger-pools': {
      const mPool = modelWithPoolSizes(m, m.n.programme, m.n.comparison * 2);
      next.groups.comparison.poolSize = mPool.n.comparison;
      changes.push(`Comparison pool ${plan.groups.comparison.poolSize} → ${next.groups.comparison.poolSize} people.`);
      break;
    }
    case 'match-all-measured':
      next.matching.distance = 'mahalanobis';
      changes.push(
        `Matches on all measured covariates by Mahalanobis distance. The caliper keeps its number ` +
          `(${formatNumber(plan.matching.caliper)}), which now counts Mahalanobis-distance units: check it.`,
      );
      break;
    case 'measure-confounders': {
      const names: string[] = [];
      next.covariates = (next.covariates ?? []).map((c) => {
        if (!c.measured) names.push(c.name);
        return { ...c, measured: true };
      });
      if ((plan.matching.distance ?? 'pretest') === 'pretest') {
        next.matching.distance = 'mahalanobis';
        changes.push(
          `Matches by Mahalanobis distance on every covariate; the caliper keeps its number (${formatNumber(plan.matching.caliper)}), ` +
            'which now counts Mahalanobis-distance units: check it.',
        );
      }
      changes.unshift(`${names.join(', ')} measured before the programme starts and matched on.`);
      break;
    }
    default:
      return { ok: false, reason: `"${remedy.title}" cannot be applied automatically.` };
  }
  dropStaleProvenance(next, plan);
  return { ok: true, remedy, plan: next, analysisId, changes, variantName: `Try: ${remedy.title}` };
}

/** Provenance notes of fields the remedy changed no longer describe them: drop those (by dotted path). */
function dropStaleProvenance(next: Plan, before: Plan): void {
  if (next.provenance === undefined) return;
  const valueAt = (p: Plan, path: string): unknown => path.split('.').reduce<unknown>((o, k) => (o as Record<string, unknown> | undefined)?.[k], p);
  const kept = Object.entries(next.provenance).filter(([path]) => JSON.stringify(valueAt(next, path)) === JSON.stringify(valueAt(before, path)));
  next.provenance = Object.fromEntries(kept);
}
