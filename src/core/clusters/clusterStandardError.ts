import type { AnalysisId } from '../plan';
import { adjustedDifferenceStandardError } from '../adjustedDifferenceStandardError';
import { welchSatterthwaiteDf } from '../welchSatterthwaiteDf';
import type { ClusterGroup, ClusterModel } from './clusterModel';

/** Cluster-aware precision of one analysis. */
export interface ClusterPrecision {
  /** Standard error, posttest points. */
  se: number;
  /** Degrees of freedom of the t test (from the number of clusters). */
  df: number;
  /** What a person-level analysis that ignores the clustering would report as its SE (personLevelAncova only). */
  naiveSE?: number;
}

/** What the precision depends on besides the model. */
export interface ClusterPrecisionOptions {
  /** Comparison partners per matched programme unit (cluster or person; ≥ 1). */
  ratio: number;
  /** Expected share of programme units (clusters, or people) that find partners, in (0, 1]. */
  matchedShare: number;
  /** Clusters per group to compute at (default: each group's own pool); used for the clusters needed. */
  clustersPerGroup?: number;
}

/**
 * Cluster-aware standard error and df of each analysis of the clusters
 * design (large-sample approximations; the simulation gives the figures for
 * the planned procedure). With J_g clusters of n_g people, the cluster means'
 * moments var(X̄), var(Ȳ), cov(X̄, Ȳ) from the clusters model:
 * - matchedDifference, clusters matched: m = J_P·share matched clusters, each
 *   with k partner clusters; SE² = (v_P + v_C/k + (b_P − b_C)²var(X̄_P))/m,
 *   v_g = var(Ȳ) − cov²/var(X̄) (the conditional variance given the matched
 *   mean), b_g = cov/var(X̄); df = m − 1 (the matched cluster pairs);
 * - matchedDifference, people matched: the conditional residual of Y given the
 *   person's own X split into its cluster part c_g = (beta − b_g)²τ² + σ²_w and
 *   person part p_g = (beta − b_g)²σ²_wT + σ²_e + b_g²SEM² (b_g = beta·rho_g);
 *   SE² ≈ c_P/J_P + c_C/J_C + (p_P + p_C/k + spread)/m with m matched people;
 *   df = J_P + J_C − 2 (approximate: partners are taken as spread over all comparison clusters);
 * - ancova on cluster means: the delta-method SE of adjustedDifferenceStandardError
 *   with the clusters as units (Welch–Satterthwaite df on the clusters, minus 1);
 * - gainScore on cluster means: Welch (1947) on the clusters' mean gains;
 * - personLevelAncova: OLS of Y on group and the covariate (own pretest, or the
 *   cluster's pretest mean for a new cohort) over all people; its variance is
 *   Σ_g (Z_c + Z_p/n)/J_g for the group means of Z = Y − b*x (cluster and
 *   person parts of Z), plus Delta²·Var(b̂) with the cluster-robust slope variance
 *   Var(b̂) = Σ_g J_g Var(S_j) / (Σ_g N_g var x)², S_j = Σ_i x̃_ij r_ij, whose
 *   variance under normality (Isserlis 1918) is
 *   n²(A·R_c + κ_c²) + n(A·R_p + B·R_c + B·R_p + 2κ_cκ_p + κ_p²)
 *   (A, B: cluster and person variance of x; R_c, R_p of the residual r; κ their
 *   covariances). df = J_P + J_C − 2, the simple small-sample rule for a
 *   cluster-level contrast (Bell & McCaffrey 2002 give a Satterthwaite df;
 *   for a group indicator constant within clusters it is close to this). The
 *   naive OLS SE sqrt(σ²(1/N_P + 1/N_C + Delta²/SS_x)) ignores the clustering.
 * Reference: Kish (1965); Raudenbush (1997); Bell & McCaffrey (2002); Welch (1947).
 * @param id analysis. @param cm clusters model. @param o options.
 * @returns { se, df } (and naiveSE for the person-level ANCOVA).
 * @throws Error when fewer than 2 clusters per group (or matched clusters) are left, or the SE is zero.
 * @example 20 clusters of 25 per group, ICC .2, reliability .8, SD 15, r .8, new cohort: gain on cluster means,
 *   var(Ȳ − X̄) = 2·52.2 − 2·45 = 14.4 → SE = sqrt(14.4/20 · 2) = 1.2, df 38
 */
export function clusterStandardError(id: AnalysisId, cm: ClusterModel, o: ClusterPrecisionOptions): ClusterPrecision {
  const J = (g: ClusterGroup) => o.clustersPerGroup ?? g.clusters;
  const P = cm.programme;
  const C = cm.comparison;
  const JP = J(P);
  const JC = J(C);
  if (!(JP >= 2 && JC >= 2)) throw new Error(`Each group needs at least 2 clusters; got ${JP} and ${JC}.`);
  const gap = cm.person.pretestGap;
  const beta = cm.person.beta;
  let out: ClusterPrecision;
  switch (id) {
    case 'matchedDifference': {
      const k = o.ratio;
      if (cm.design.level === 'clusters') {
        const m = Math.max(2, JP * o.matchedShare);
        const b = (g: ClusterGroup) => g.clusterMeanCov / g.clusterMeanVar;
        const v = (g: ClusterGroup) => g.outcomeMeanVar - g.clusterMeanCov * b(g);
        const spread = (b(P) - b(C)) ** 2 * P.clusterMeanVar;
        out = { se: Math.sqrt((v(P) + v(C) / k + spread) / m), df: m - 1 };
      } else {
        const rho = cm.person.reliability;
        const parts = (g: ClusterGroup, r: number) => {
          const bg = beta * r;
          const c = g.components;
          return {
            cluster: (beta - bg) ** 2 * c.betweenTrue + cm.outcomeClusterVar,
            person: (beta - bg) ** 2 * c.withinTrue + cm.outcomePersonVar + bg * bg * c.error,
            slope: bg,
          };
        };
        const p = parts(P, rho.programme);
        const c = parts(C, rho.comparison);
        const m = Math.max(2, JP * P.size * o.matchedShare);
        const spread = (p.slope - c.slope) ** 2 * P.observedVar;
        out = { se: Math.sqrt(p.cluster / JP + c.cluster / JC + (p.person + c.person / k + spread) / m), df: JP + JC - 2 };
      }
      break;
    }
    case 'ancova': {
      const moments = (g: ClusterGroup, n: number) => ({ n, varY: g.outcomeMeanVar, covXY: [g.clusterMeanCov], covX: [[g.clusterMeanVar]] });
      out = adjustedDifferenceStandardError(moments(P, JP), moments(C, JC), [gap], [[1]]);
      break;
    }
    case 'gainScore': {
      const v = (g: ClusterGroup, n: number) => (g.outcomeMeanVar + g.clusterMeanVar - 2 * g.clusterMeanCov) / n;
      const a = v(P, JP);
      const b = v(C, JC);
      out = { se: Math.sqrt(a + b), df: welchSatterthwaiteDf([{ variance: a, df: JP - 1 }, { variance: b, df: JC - 1 }]) };
      break;
    }
    case 'personLevelAncova':
      out = personLevelPrecision(cm, JP, JC);
      break;
    default:
      throw new Error(`The clusters design has no ${id} analysis.`);
  }
  if (!(out.se > 0) || !Number.isFinite(out.se)) {
    throw new Error('The standard error of this analysis is zero or undefined: the outcome would be predicted perfectly. Check the pre–post correlation, the reliability and the ICCs.');
  }
  return out;
}

/** The person-level ANCOVA's cluster-robust precision and its naive OLS SE (see clusterStandardError). */
function personLevelPrecision(cm: ClusterModel, JP: number, JC: number): ClusterPrecision {
  const beta = cm.person.beta;
  const same = cm.design.cohort === 'same';
  const w = cm.outcomeClusterVar;
  const e = cm.outcomePersonVar;
  // Per group: variance of x (cluster part A, person part B), of Y (Yc, Yp) and their covariances.
  const parts = (g: ClusterGroup, J: number) => {
    const c = g.components;
    const A = same ? c.betweenTrue : g.clusterMeanVar;
    const B = same ? c.withinTrue + c.error : 0;
    return {
      J,
      n: g.size,
      A,
      B,
      Yc: beta * beta * c.betweenTrue + w,
      Yp: beta * beta * c.withinTrue + e,
      Cc: beta * c.betweenTrue,
      Cp: same ? beta * c.withinTrue : 0,
    };
  };
  const groups = [parts(cm.programme, JP), parts(cm.comparison, JC)];
  let sxx = 0;
  let sxy = 0;
  for (const g of groups) {
    sxx += g.J * g.n * (g.A + g.B);
    sxy += g.J * g.n * (g.Cc + g.Cp);
  }
  const b = sxy / sxx;
  let meanTerms = 0;
  let slopeNumerator = 0;
  let residual = 0;
  let people = 0;
  for (const g of groups) {
    const Rc = g.Yc - 2 * b * g.Cc + b * b * g.A;
    const Rp = g.Yp - 2 * b * g.Cp + b * b * g.B;
    meanTerms += (Rc + Rp / g.n) / g.J;
    const kc = g.Cc - b * g.A;
    const kp = g.Cp - b * g.B;
    const varS = g.n * g.n * (g.A * Rc + kc * kc) + g.n * (g.A * Rp + g.B * Rc + g.B * Rp + 2 * kc * kp + kp * kp);
    slopeNumerator += g.J * varS;
    residual += g.J * g.n * (Rc + Rp);
    people += g.J * g.n;
  }
  const gap = cm.person.pretestGap;
  const variance = meanTerms + (gap * gap * slopeNumerator) / (sxx * sxx);
  const sigma2 = residual / people;
  const naive = Math.sqrt(sigma2 * (1 / (JP * cm.programme.size) + 1 / (JC * cm.comparison.size) + (gap * gap) / sxx));
  return { se: Math.sqrt(variance), df: JP + JC - 2, naiveSE: naive };
}
