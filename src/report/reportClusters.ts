import type { AnalyticResults } from '../core/analyticResults';
import type { AnalysisId } from '../core/plan';
import { presentAnalyses } from '../core/presentAnalyses';
import { isFeasible, type SimulationResult } from '../sim/types';
import { formatCount, formatPoints, formatProbability, formatReliability, formatSignedPoints } from './format';
import type { ReportTable } from './reportCovariates';

/** The clusters design's model lines for the PDF's "Model" list. */
export const CLUSTER_MODEL_LINES: string[] = [
  'People sit in clusters: a cluster’s true mean, each person’s deviation from it, measurement error, and an outcome with its own cluster-level part.',
  'A cluster’s observed mean measures what predicts its outcome with reliability λ: ICC(2) = n·ICC / (1 + (n − 1)·ICC) when a new cohort sits the posttest; for the same people, the cluster mean’s classical reliability.',
  'Matching or adjusting on cluster means leaves β(1 − λ)Δ of the true gap (Thorndike’s artefact at cluster level); a person-level SE must count the clustering (design effect 1 + (n − 1)·ICC).',
];

/**
 * A general caution as it reads for a clusters design: the model does count
 * the clustering, so "clustering" leaves the list of what it leaves out and
 * unequal cluster sizes and ICCs that differ between groups take its place.
 */
export function clusterCaution(caution: string): string {
  return caution.replace('clustering (classes, clinics, areas)', 'unequal cluster sizes and ICCs that differ between the groups');
}

/** The clusters design's references, added to the PDF's list. */
export const CLUSTER_REFERENCES: string[] = [
  'Bell, R. M. & McCaffrey, D. F. (2002). Bias reduction in standard errors for linear regression with multi-stage samples. Survey Methodology, 28, 169–181.',
  'Bliese, P. D. (2000). Within-group agreement, non-independence, and reliability. In K. J. Klein & S. W. J. Kozlowski (Eds.), Multilevel theory, research, and methods in organizations (pp. 349–381). Jossey-Bass.',
  'Bloom, H. S. (1995). Minimum detectable effects. Evaluation Review, 19, 547–556.',
  'Hedges, L. V. & Hedberg, E. C. (2007). Intraclass correlation values for planning group-randomized trials in education. Educational Evaluation and Policy Analysis, 29, 60–87.',
  'Kish, L. (1965). Survey sampling. Wiley.',
  'Raudenbush, S. W. (1997). Statistical analysis and optimal design for cluster randomized trials. Psychological Methods, 2, 173–185.',
];

/**
 * The clusters' inputs and what follows from them (core's ClusterSummary):
 * people per cluster and clusters per group, the ICCs, who sits the
 * posttest, what is matched, λ per group, the design effects and the three
 * artefacts. Empty rows for a plan without clusters. Formatting only.
 */
export function clusterSummaryTable(analytic: AnalyticResults): ReportTable {
  const c = analytic.clusters;
  const columns: ReportTable['columns'] = [
    { header: 'Quantity', width: 60 },
    { header: 'Value', width: 20, align: 'right' },
    { header: 'Unit', width: 20 },
  ];
  if (!c) return { columns, rows: [] };
  return {
    columns,
    rows: [
      ['People tested per cluster', formatCount(c.size.comparison), 'people'],
      ['Clusters: programme / comparison', `${formatCount(c.clustersPerGroup.programme)} / ${formatCount(c.clustersPerGroup.comparison)}`, 'clusters'],
      ['Pretest ICC / posttest ICC', `${formatReliability(c.pretestICC)} / ${formatReliability(c.posttestICC)}`, 'coefficient'],
      ['Who sits the posttest', c.cohort === 'same' ? 'the same people' : 'a new cohort', ''],
      ['What is matched', c.level === 'clusters' ? 'clusters, on their means' : 'people, across clusters', ''],
      ['Reliability of a cluster’s observed mean, comparison (λ_C)', formatReliability(c.clusterMeanReliability.comparison), 'coefficient'],
      ['Reliability of a cluster’s observed mean, programme (λ_P)', formatReliability(c.clusterMeanReliability.programme), 'coefficient'],
      ['Design effect, pretest / posttest (Kish)', `${formatPoints(c.designEffect.pretest)} / ${formatPoints(c.designEffect.posttest)}`, 'ratio of variances'],
      ['Artefact of matching clusters on their means', formatSignedPoints(c.matchedClusterArtefact), 'post-test points'],
      ['Artefact of ANCOVA on cluster means', formatSignedPoints(c.clusterMeansAncovaArtefact), 'post-test points'],
      ['Artefact of matching people on their own pretests', formatSignedPoints(c.personMatchingArtefact), 'post-test points'],
      ['People per cluster whose mean reaches the break-even λ', c.breakEvenClusterSize === null ? 'none needed or unreachable' : formatCount(c.breakEvenClusterSize), 'people'],
    ],
  };
}

/** One sentence for the PDF's summary: λ, the cohort and the design effect. */
export function clusterSummarySentence(analytic: AnalyticResults): string {
  const c = analytic.clusters;
  if (!c) return '';
  return (
    `People sit in clusters of ${formatCount(c.size.comparison)} (${formatCount(c.clustersPerGroup.programme)} programme and ${formatCount(c.clustersPerGroup.comparison)} comparison clusters); ` +
    `a cluster’s observed pretest mean has reliability λ = ${formatReliability(c.clusterMeanReliability.comparison)}, and ` +
    `${c.cohort === 'same' ? 'the same people sit the posttest' : 'a new cohort, not the people tested, sits the posttest'}. ` +
    `The design effect is ${formatPoints(c.designEffect.posttest)} for the posttest.`
  );
}

/**
 * The cluster-aware SE of each analysis beside, after a simulation, the
 * naive person-level SE of the same estimates and both coverages (what
 * ignoring the clustering costs). Empty rows without clusters or a simulation.
 */
export function naiveComparisonTable(analytic: AnalyticResults, sim: SimulationResult | null): ReportTable {
  const columns: ReportTable['columns'] = [
    { header: 'Analysis', width: 34 },
    { header: 'SE counting clusters (expected)', width: 17, align: 'right' },
    { header: 'Coverage, cluster-aware (sim.)', width: 17, align: 'right' },
    { header: 'Naive SE, mean reported (sim.)', width: 16, align: 'right' },
    { header: 'Coverage, naive (sim.)', width: 16, align: 'right' },
  ];
  const naive = sim?.naivePersonLevel;
  if (!analytic.clusters || !sim || !naive) return { columns, rows: [] };
  const rows: string[][] = [];
  for (const [id, a] of presentAnalyses(analytic.analyses)) {
    const twin = id === 'personLevelAncova' ? naive.personLevelAncova : id === 'matchedDifference' ? naive.matchedDifference : undefined;
    if (!twin) continue;
    const aware = sim.analyses[id];
    rows.push([
      a.name,
      formatPoints(a.se),
      aware && isFeasible(aware) ? formatProbability(aware.coverage) : 'not computed',
      isFeasible(twin) ? formatPoints(twin.meanModelSE) : 'not computed',
      isFeasible(twin) ? formatProbability(twin.coverage) : 'not computed',
    ]);
  }
  return { columns, rows };
}

/** Per analysis, the clusters per group the target power needs and the minimum detectable effect (rows for the results table). */
export function clusterPowerCells(analytic: AnalyticResults): { needed: (id: AnalysisId) => string; mde: (id: AnalysisId) => string } | null {
  if (!analytic.clusters) return null;
  const get = (id: AnalysisId) => analytic.analyses[id];
  return {
    needed: (id) => {
      const a = get(id);
      if (!a || !a.feasible) return 'not feasible';
      if (a.requiredNNote !== null) return a.requiredNNote;
      return a.clustersPerGroupNeeded === null || a.clustersPerGroupNeeded === undefined ? 'not reachable' : formatCount(a.clustersPerGroupNeeded);
    },
    mde: (id) => {
      const a = get(id);
      if (!a || !a.feasible || a.minimumDetectableEffect === null || a.minimumDetectableEffect === undefined) return 'not feasible';
      return formatSignedPoints(a.minimumDetectableEffect);
    },
  };
}
