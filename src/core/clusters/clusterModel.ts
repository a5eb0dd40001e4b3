import type { ModelParameters } from '../modelParameters';
import type { Plan } from '../plan';
import { deriveModelParameters } from '../deriveModelParameters';
import { formatApart, formatNumber } from '../inputChecks';
import { studyDesign, type ClustersDesign } from '../design/studyDesign';
import { averagedClusterMeanReliability, type PretestComponents } from './clusterMeanReliability';

/** An input problem of the cluster model, with the plan field it belongs to (validatePlan shows it there). */
export class ClusterModelError extends Error {
  readonly field: string;
  constructor(field: string, message: string) {
    super(message);
    this.field = field;
  }
}

/**
 * One group's clusters under the model, with the moments of the cluster means
 * (each cluster's mean over its n people) that the cluster-level analyses use.
 */
export interface ClusterGroup {
  /** Clusters in the pool (J_g). */
  clusters: number;
  /** People per cluster (n_g; kept per group so unequal sizes can come later). */
  size: number;
  /** Pretest mean (true = observed), points. */
  mean: number;
  /** Within-group observed pretest variance of people, σ²_X (points²). */
  observedVar: number;
  /** The pretest's variance components within the group. */
  components: PretestComponents;
  /** var(X̄_j): variance of the clusters' observed pretest means. */
  clusterMeanVar: number;
  /** var(Ȳ_j): variance of the clusters' posttest means (without the programme). */
  outcomeMeanVar: number;
  /** cov(X̄_j, Ȳ_j). */
  clusterMeanCov: number;
  /**
   * λ_g: reliability of the observed cluster mean as a measure of what
   * predicts the cluster's posttest mean (its true mean; with the same people
   * retested, plus their own true deviations).
   */
  clusterMeanReliability: number;
}

/**
 * The clusters model (two existing groups whose people sit in clusters). In
 * group g, person i of cluster j:
 *   true pretest      T_ij = mu_g + u_j + v_ij,   u_j ~ N(0, τ²_g), v_ij ~ N(0, σ²_wT,g)
 *   observed pretest  X_ij = T_ij + E_ij,         E_ij ~ N(0, SEM²)
 *   outcome           Y_ij = d_g + tau·[P] + beta·T*_ij + w_j + e_ij,
 *                     w_j ~ N(0, σ²_w) (the outcome's own cluster-level part), e_ij ~ N(0, σ²_e),
 * where T*_ij is the posttest taker's true score: T_ij itself when the same
 * people sit the posttest (cohort 'same'), or mu_g + u_j + v'_ij of a new
 * person of the same cluster (cohort 'new'). The ICCs are of observed scores
 * within a group: τ²_g = pretestICC·σ²_X,g, and
 * beta²τ²_C + σ²_w = posttestICC·posttestSD² (comparison group). The
 * pretest's reliability, the SEM, beta and the total residual variance
 * σ²_w + σ²_e are those of the person-level model (deriveModelParameters),
 * so a plan read without its clusters describes the same people.
 */
export interface ClusterModel {
  design: ClustersDesign;
  /** The person-level model (reliability of people's scores, beta, residual, effect, growth gap). */
  person: ModelParameters;
  /** σ²_w: the outcome's cluster-level residual variance. */
  outcomeClusterVar: number;
  /** σ²_e: the outcome's person-level residual variance. */
  outcomePersonVar: number;
  programme: ClusterGroup;
  comparison: ClusterGroup;
  /** Cluster-count-weighted pooled λ (the slope of ANCOVA on cluster means is beta times it). */
  pooledClusterMeanReliability: number;
}

/**
 * The clusters model of a plan.
 * Reference: the two-level model of Snijders & Bosker (2012), ch. 4, with
 * classical test theory for the pretest (Lord & Novick 1968).
 * @param plan a validated plan with a `clusters` section.
 * @param yearsAveraged yearly cluster means the matching variable averages (default 1; remedies use more).
 * @returns the model.
 * @throws ClusterModelError (with the plan field) when the inputs contradict each other:
 *   the pretest ICC not below a group's within-group reliability, or a posttest ICC
 *   the pretest's cluster part and the slope make impossible.
 * @example ICC .2, reliability .8, SDs 15, 25 people, new cohort → programme.clusterMeanReliability 0.8621
 */
export function clusterModel(plan: Plan, yearsAveraged = 1): ClusterModel {
  const design = studyDesign(plan);
  if (design.kind !== 'clusters') throw new Error('This plan has no clusters section.');
  return clusterModelFor(design, deriveModelParameters(plan), yearsAveraged);
}

/**
 * The clusters model for a given design and person-level model (used by the
 * remedies, which change the cluster size, the cohort or the years averaged).
 * @throws ClusterModelError as clusterModel.
 */
export function clusterModelFor(design: ClustersDesign, person: ModelParameters, yearsAveraged = 1): ClusterModel {
  const sem2 = person.sem * person.sem;
  const beta = person.beta;
  const same = design.cohort === 'same';
  const group = (who: 'programme' | 'comparison'): ClusterGroup => {
    const sd = person.observedSD[who];
    const observedVar = sd * sd;
    const betweenTrue = design.pretestICC * observedVar;
    const withinTrue = observedVar - betweenTrue - sem2;
    if (!(withinTrue > 0)) {
      const [icc, rho] = formatApart(design.pretestICC, person.reliability[who]);
      throw new ClusterModelError(
        'clusters.pretestICC',
        `The pretest ICC must be smaller than the ${who} group's within-group reliability of the pretest: the share between clusters is part of the true-score variance; got an ICC of ${icc} against a reliability of ${rho}.`,
      );
    }
    const n = design.clusterSize[who];
    const components = { betweenTrue, withinTrue, error: sem2 };
    const clusterMeanVar = betweenTrue + (withinTrue + sem2) / n;
    return {
      clusters: design.clusterCount[who],
      size: n,
      mean: person.mean[who],
      observedVar,
      components,
      clusterMeanVar,
      outcomeMeanVar: 0, // filled below, once the outcome's residual parts are known
      clusterMeanCov: beta * (betweenTrue + (same ? withinTrue / n : 0)),
      clusterMeanReliability: averagedClusterMeanReliability(components, n, 1, same),
    };
  };
  const programme = group('programme');
  const comparison = group('comparison');
  const residualVar = person.residualSD * person.residualSD;
  const postVar = person.posttestSD.comparison ** 2;
  const outcomeClusterVar = design.posttestICC * postVar - beta * beta * comparison.components.betweenTrue;
  const outcomePersonVar = residualVar - outcomeClusterVar;
  const tol = 1e-12 * postVar;
  if (outcomeClusterVar < -tol) {
    const least = (beta * beta * comparison.components.betweenTrue) / postVar;
    const [lo, got] = formatApart(least, design.posttestICC);
    throw new ClusterModelError(
      'clusters.posttestICC',
      `The posttest ICC must be at least ${lo} here: the clusters' true pretest differences (pretest ICC ${formatNumber(design.pretestICC)}) carry over to the posttest through the slope of ${formatNumber(beta)}, and that alone is this share of the posttest variance; got ${got}.`,
    );
  }
  if (outcomePersonVar < -tol) {
    const most = 1 - (beta * beta * comparison.components.withinTrue) / postVar;
    const [hi, got] = formatApart(most, design.posttestICC);
    throw new ClusterModelError(
      'clusters.posttestICC',
      `The posttest ICC must be at most ${hi} here: people's true pretest differences within clusters carry over to the posttest through the slope of ${formatNumber(beta)}, leaving no more than this share between clusters; got ${got}.`,
    );
  }
  const w = Math.max(0, outcomeClusterVar);
  const e = Math.max(0, outcomePersonVar);
  for (const g of [programme, comparison]) {
    const c = g.components;
    g.outcomeMeanVar = beta * beta * c.betweenTrue + w + (beta * beta * c.withinTrue + e) / g.size;
    if (yearsAveraged !== 1) {
      // The matching variable averages several yearly means: only its variance and covariance change.
      g.clusterMeanReliability = averagedClusterMeanReliability(c, g.size, yearsAveraged, same);
      g.clusterMeanVar = c.betweenTrue + (c.withinTrue + c.error) / (g.size * yearsAveraged);
      g.clusterMeanCov = beta * g.clusterMeanReliability * g.clusterMeanVar;
    }
  }
  const pooled =
    (programme.clusters * programme.clusterMeanReliability * programme.clusterMeanVar +
      comparison.clusters * comparison.clusterMeanReliability * comparison.clusterMeanVar) /
    (programme.clusters * programme.clusterMeanVar + comparison.clusters * comparison.clusterMeanVar);
  return { design, person, outcomeClusterVar: w, outcomePersonVar: e, programme, comparison, pooledClusterMeanReliability: pooled };
}
