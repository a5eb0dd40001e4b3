import type { Remedy } from '../analyticResults';
import { formatPointsText } from '../inputChecks';
import { shareOfEffect } from '../shareOfEffect';
import { clusterModelFor, type ClusterModel } from './clusterModel';
import { clusterArtefact } from './clusterEstimates';
import { clusterSizeForReliability } from './clusterSizeForReliability';

const pts = formatPointsText;
const rel = (x: number): string => x.toFixed(3);
/** Yearly means averaged by the "several years" remedy. */
export const YEARS_AVERAGED = 3;

/**
 * Design changes specific to clusters, each computed by re-running the
 * clusters model with the change (clusterModelFor), ranked by the expected
 * artefact left (|remaining bias|, growth gap included), then by the share
 * of the programme pool discarded:
 * - test more people per cluster: λ rises by Spearman–Brown (ICC(2) for a new
 *   cohort); the number of people that reaches the break-even λ is given;
 * - match on the average of several (3) years' cluster means (the clusters'
 *   true means assumed stable over the years);
 * - match on a cluster mean measured on the same people who sit the posttest
 *   (offered when the posttest cohort is new);
 * - adjust at person level with the people's own pretests (needs the same
 *   people; the artefact is then the one-level beta(1 − rho)Delta);
 * - use the people's own pretests within matched clusters: with clusters
 *   matched on their means the groups' pretest means already agree, so the
 *   adjustment mainly buys precision; its expected artefact is that of
 *   matching on the same people's cluster means.
 * Reference: Spearman (1910), Brown (1910); Bliese (2000); Thorndike (1942).
 * @param cm the plan's clusters model. @param tolerableShare the plan's tolerable bias share.
 * @param breakEvenSize people per cluster reaching the break-even λ (null when none is needed or possible).
 * @returns the remedies, best first.
 * @throws ClusterModelError only for inputs the plan's own model already accepted (never in practice).
 * @example gap −8, beta 1, n 25, ICC .2, reliability .8, new cohort → "same people" leaves −0.28 points
 */
export function clusterRemedies(cm: ClusterModel, breakEvenSize: number | null): Remedy[] {
  const tau = cm.person.effect;
  const growth = cm.person.growthGap;
  const share = (b: number) => shareOfEffect(b, tau);
  const current = growth + clusterArtefact('matchedDifference', { ...cm, design: { ...cm.design, level: 'clusters' } });
  const matchedClusters = (m: ClusterModel) => growth + clusterArtefact('matchedDifference', { ...m, design: { ...m.design, level: 'clusters' } });
  const same = cm.design.cohort === 'same';
  const out: Remedy[] = [];

  const n = cm.comparison.size;
  const target = breakEvenSize ?? n * 4;
  const bigger = clusterModelFor(
    { ...cm.design, clusterSize: { programme: target, comparison: target } },
    cm.person,
  );
  const biasBigger = matchedClusters(bigger);
  out.push({
    id: 'more-people-per-cluster',
    title: `Test ${target} people per cluster instead of ${n}`,
    summary:
      `${breakEvenSize !== null ? `${target} people per cluster reach the break-even cluster-mean reliability` : `With ${target} people per cluster`}: ` +
      `λ rises from ${rel(cm.comparison.clusterMeanReliability)} to ${rel(bigger.comparison.clusterMeanReliability)} (Spearman–Brown${same ? '' : ', ICC(2)'}) ` +
      `and the matched-cluster artefact changes from ${pts(current)} to ${pts(biasBigger)} points.`,
    remainingBias: biasBigger,
    remainingBiasShare: share(biasBigger),
    discardedShare: null,
    assumption: 'The extra people are drawn from the same clusters, and the clusters are large enough to test them.',
  });

  const years = clusterModelFor(cm.design, cm.person, YEARS_AVERAGED);
  const biasYears = matchedClusters(years);
  out.push({
    id: 'several-years-means',
    title: `Match clusters on the average of ${YEARS_AVERAGED} years' means`,
    summary:
      `Averaging ${YEARS_AVERAGED} yearly cohorts' means raises λ from ${rel(cm.comparison.clusterMeanReliability)} to ` +
      `${rel(years.comparison.clusterMeanReliability)}; the matched-cluster artefact changes from ${pts(current)} to ${pts(biasYears)} points.`,
    remainingBias: biasYears,
    remainingBiasShare: share(biasYears),
    discardedShare: null,
    assumption: "The clusters' true means are stable over those years, and earlier years' results are on the same scale.",
  });

  const samePeople = same ? cm : clusterModelFor({ ...cm.design, cohort: 'same' }, cm.person);
  const biasSame = matchedClusters(samePeople);
  if (!same) {
    out.push({
      id: 'same-people-cluster-mean',
      title: 'Match on a cluster mean of the people who will sit the posttest',
      summary:
        `Pretesting the cohort that sits the posttest makes the matched mean measure what predicts the outcome: λ ${rel(samePeople.comparison.clusterMeanReliability)} ` +
        `instead of ${rel(cm.comparison.clusterMeanReliability)}, and the artefact changes from ${pts(current)} to ${pts(biasSame)} points.`,
      remainingBias: biasSame,
      remainingBiasShare: share(biasSame),
      discardedShare: null,
      assumption: 'The posttest cohort can be tested before the programme starts.',
    });
  }

  const { beta, pretestGap, reliability } = cm.person;
  const biasPerson = growth + beta * (1 - reliability.pooled) * pretestGap;
  out.push({
    id: 'person-level-own-pretests',
    title: "Adjust at person level for the people's own pretests",
    summary:
      `ANCOVA on each person's own pretest (reliability ${rel(reliability.pooled)}) with cluster-robust SEs leaves ${pts(biasPerson)} points ` +
      `(matching clusters now: ${pts(current)}); a person's score is ${reliability.pooled < cm.comparison.clusterMeanReliability ? 'less' : 'more'} reliable than a cluster mean here.`,
    remainingBias: biasPerson,
    remainingBiasShare: share(biasPerson),
    discardedShare: 0,
    assumption: 'The same people sit the pretest and the posttest, and the SEs count the clustering.',
  });

  out.push({
    id: 'pretests-within-matched-clusters',
    title: "Use the people's own pretests within matched clusters",
    summary:
      `Matching clusters on the mean of the people who sit the posttest and then adjusting for their own pretests leaves ${pts(biasSame)} points in expectation ` +
      '(the matched groups already agree on the pretest mean); the adjustment mainly narrows the SE.',
    remainingBias: biasSame,
    remainingBiasShare: share(biasSame),
    discardedShare: null,
    assumption: 'The same people sit the pretest and the posttest, and the analysis counts the clustering (cluster-robust SEs).',
  });

  const tol = 1e-9 * Math.max(1, Math.abs(tau), Math.abs(current));
  return out.sort((a, b) => {
    const d = Math.abs(a.remainingBias) - Math.abs(b.remainingBias);
    if (Math.abs(d) > tol) return d;
    return (a.discardedShare ?? 0) - (b.discardedShare ?? 0);
  });
}
