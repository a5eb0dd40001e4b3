import type { Plan } from '../plan';
import { normalCdf, normalPdf } from '../distributions';
import { formatNumber } from '../inputChecks';
import { outcomeSlope } from '../outcomeSlope';
import { reliabilityToSem } from '../reliabilityToSem';
import { studyDesign, type SelectionDesign } from './studyDesign';

/**
 * The one population a selection rule picks from, before selection
 * (classical test theory; Lord & Novick 1968):
 *   T ~ N(mu, trueSD²), X = T + E (pretest), S = T + E_S (screener, own independent error),
 *   Y0 = mu + growth·[one-group] + beta (T − mu) + e (posttest without the programme),
 * with beta and the residual SD from the population's pre–post correlation
 * (outcomeSlope), and the posttest on the pretest's scale: without the
 * programme or any growth its mean equals the pretest mean.
 */
export interface SelectionPopulation {
  label: string;
  poolSize: number;
  mean: number;
  observedSD: number;
  trueSD: number;
  sem: number;
  /** Population reliability of the pretest, trueSD² / observedSD². */
  reliability: number;
  /** Observed SD of the screener (basis 'screener'); null otherwise. */
  screenerSD: number | null;
  beta: number;
  residualSD: number;
  posttestSD: number;
}

/** Variables whose group moments the selection model gives, in this index order. */
export const SEL_PRETEST = 0;
export const SEL_TRUE = 1;
export const SEL_OUTCOME = 2;
export const SEL_SCREENER = 3;
/** Number of variables (the screener's row is all zero when there is none). */
export const SEL_VARIABLES = 4;

/** One group's expected size, share of the population and the means and covariances of (X, T, Y0, S) in it. */
export interface SelectedGroup {
  /** Expected number of people (population × share; not rounded). */
  n: number;
  share: number;
  mean: number[];
  /** cov[a][b] within the group. */
  cov: number[][];
}

/** The closed-form model of a selection design: population, the rule, and both groups' moments. */
export interface SelectionModel {
  design: SelectionDesign;
  population: SelectionPopulation;
  /** Index of the variable the rule used (SEL_PRETEST, SEL_SCREENER or SEL_TRUE). */
  basisIndex: number;
  /** SD of the variable the rule used. */
  basisSD: number;
  /** SD of the latent selection score B + spread·ε (equals basisSD for a sharp cut-off). */
  latentSD: number;
  /** Standardised cut-off (cutOff − mean) / latentSD. */
  cutZ: number;
  programme: SelectedGroup;
  comparison: SelectedGroup;
  /** Population covariance of every variable with the basis. */
  basisCov: number[];
  /** Population covariance matrix of (X, T, Y0, S). */
  populationCov: number[][];
}

/** Fewest people the rule may put in either group (expected): below this no analysis can be computed. */
export const MIN_SELECTED = 10;

/**
 * The selection model of a plan with a selection rule (or a one-group design).
 *
 * The rule acts on the basis B (the observed pretest X, the screener S or the
 * true score T). A probability rule P(programme) = Φ((c − B)/s) ('below') is a
 * sharp cut on the latent score B' = B + s·ε with ε ~ N(0, 1) independent of
 * everything (Φ((c − B)/s) = P(B + sε < c)), so both rules are truncations of
 * the normal variable B'. With z = (B' − mu)/sd(B') and a = (c − mu)/sd(B'),
 * the selected side's share, mean and variance of z are the truncated-normal
 * moments (Johnson, Kotz & Balakrishnan 1994, ch. 13, eq. 13.134–13.135, from memory):
 *   z < a: share Φ(a), mean −λ, variance 1 − aλ − λ², λ = φ(a)/Φ(a);
 *   z > a: share 1 − Φ(a), mean λ', variance 1 + aλ' − λ'², λ' = φ(a)/(1 − Φ(a)).
 * Selection on B' leaves the conditional law of every other variable given
 * B' unchanged (all are jointly normal), so for variables V, W in a group g
 * (Pearson 1903, Aitken 1934 selection formulas; common practice):
 *   E[V | g] = mu_V + c_VB (sd(B') m_g) / var(B'),
 *   cov(V, W | g) = c_VW − c_VB c_WB (1 − v_g) / var(B'),
 * with m_g, v_g the standardised mean and variance above and c_VB = cov(V, B)
 * (ε adds nothing to it).
 *
 * @param plan a plan with a selection rule that has passed range validation.
 * @returns the model. @throws Error with a researcher-readable message when
 *   the population's inputs contradict each other (SEM not below the SD,
 *   r² > reliability) or the rule leaves fewer than MIN_SELECTED people in a group.
 * @example one population mean 50, SD 10, reliability .8, lowest fifth on the pretest:
 *   programme share .2, programme pretest mean 50 − 10·φ(−0.8416)/0.2 = 36.0
 */
export function selectionModel(plan: Plan): SelectionModel {
  const design = studyDesign(plan);
  if (design.kind !== 'selection') throw new Error('This plan has no selection rule: its groups already exist.');
  const population = selectionPopulation(plan, design);
  return selectionModelFor(design, population);
}

/**
 * The selection model for a given design and population (used directly by
 * the remedies and sensitivity curves, which change one of them).
 * @throws Error when the rule leaves fewer than MIN_SELECTED people in a group.
 */
export function selectionModelFor(design: SelectionDesign, population: SelectionPopulation): SelectionModel {
  const { mean, observedSD, trueSD, beta, residualSD } = population;
  const tv = trueSD * trueSD;
  const sv = population.screenerSD === null ? 0 : population.screenerSD ** 2;
  // Population covariances of (X, T, Y0, S): every variable loads on T; errors are independent.
  const loads = [1, 1, beta, population.screenerSD === null ? 0 : 1];
  const own = [observedSD * observedSD - tv, 0, residualSD * residualSD, population.screenerSD === null ? 0 : sv - tv];
  const populationCov = loads.map((la, a) => loads.map((lb, b) => la * lb * tv + (a === b ? (own[a] as number) : 0)));
  const basisIndex = design.basis === 'pretest' ? SEL_PRETEST : design.basis === 'screener' ? SEL_SCREENER : SEL_TRUE;
  const basisCov = populationCov.map((row) => row[basisIndex] as number);
  const basisVar = basisCov[basisIndex] as number;
  const latentVar = basisVar + design.spread * design.spread;
  const latentSD = Math.sqrt(latentVar);
  const cutZ = (design.cutOff - mean) / latentSD;
  const below = truncatedMoments(cutZ, 'below');
  const above = truncatedMoments(cutZ, 'above');
  const [sel, rest] = design.side === 'below' ? [below, above] : [above, below];
  const means = [mean, mean, mean, mean];
  const group = (t: { share: number; mean: number; variance: number }): SelectedGroup => ({
    n: population.poolSize * t.share,
    share: t.share,
    mean: means.map((m, a) => m + ((basisCov[a] as number) * latentSD * t.mean) / latentVar),
    cov: populationCov.map((row, a) =>
      row.map((c, b) => c - ((basisCov[a] as number) * (basisCov[b] as number) * (1 - t.variance)) / latentVar),
    ),
  });
  const programme = group(sel);
  const comparison = group(rest);
  for (const [g, who] of [
    [programme, 'programme'],
    [comparison, design.shape === 'one-group' ? 'not selected' : 'comparison'],
  ] as const) {
    if (!(g.n >= MIN_SELECTED)) {
      throw new Error(
        `The rule puts about ${formatNumber(g.n)} of the ${population.poolSize} people in the ${who} group, and at least ${MIN_SELECTED} are needed. ` +
          'Move the cut-off toward the population mean, or enlarge the population.',
      );
    }
  }
  return {
    design,
    population,
    basisIndex,
    basisSD: Math.sqrt(basisVar),
    latentSD,
    cutZ,
    programme,
    comparison,
    basisCov,
    populationCov,
  };
}

/**
 * Share, mean and variance of a standard normal z restricted to z < a ('below') or z > a ('above')
 * (Johnson, Kotz & Balakrishnan 1994, ch. 13, from memory; common practice). The inverse Mills
 * ratio is taken from the side with the larger probability to keep it accurate in the tails.
 * @example truncatedMoments(0, 'above') // { share: 0.5, mean: 0.79788, variance: 0.36338 }
 */
export function truncatedMoments(a: number, side: 'below' | 'above'): { share: number; mean: number; variance: number } {
  // z > a is −z < −a: reflect to one case.
  const b = side === 'below' ? a : -a;
  const share = normalCdf(b);
  const lambda = millsBelow(b);
  const mean = -lambda;
  const variance = Math.max(0, 1 - b * lambda - lambda * lambda);
  return side === 'below' ? { share, mean, variance } : { share, mean: -mean, variance };
}

/**
 * The inverse Mills ratio of the lower side, φ(b)/Φ(b) (the mean of −z for z < b, z standard normal),
 * accurate far into the lower tail (an asymptotic series when Φ underflows).
 * Reference: Johnson, Kotz & Balakrishnan (1994), ch. 13, from memory; common practice.
 * @param b finite. @returns φ(b)/Φ(b) > 0. @throws Error when b is not finite.
 * @example millsBelow(0) // 0.79788 (2φ(0))
 */
export function millsBelow(b: number): number {
  const p = normalCdf(b);
  if (p > 1e-300 && b > -30) return normalPdf(b) / p;
  // Φ(b) ≈ φ(b)/(−b)·(1 − 1/b² + 3/b⁴) for b → −∞ (Abramowitz & Stegun 1964, 26.2.12, from memory).
  const b2 = b * b;
  return -b / (1 - 1 / b2 + 3 / (b2 * b2));
}

/**
 * The population before selection, from the plan: `population` for the
 * pretest's mean, SD and size; `pretest` for its reliability (reference SD
 * defaults to the population SD) or SEM; `outcome.posttestSD` and
 * `outcome.prePostCorrelation` for the whole population; the screener's
 * reliability gives its error, sharing the true score.
 * @throws Error with a researcher-readable message when the SEM is not below
 *   the population SD, or r² exceeds the population reliability (Spearman 1904).
 */
export function selectionPopulation(plan: Plan, design: SelectionDesign): SelectionPopulation {
  const pop = plan.population;
  if (!pop) throw new Error('A selection rule needs the population people are picked from (population: label, poolSize, pretestMean, pretestSD).');
  const { reliability, referenceSD, sem: givenSem } = plan.pretest;
  const sem = givenSem ?? reliabilityToSem(reliability as number, referenceSD ?? pop.pretestSD);
  if (!(pop.pretestSD > sem)) {
    throw new Error(
      `The pretest's SEM (${formatNumber(sem)} points) is not smaller than the population's pretest SD (${formatNumber(pop.pretestSD)}): ` +
        'the pretest would measure nothing but error. Use a smaller SEM, a higher reliability, or check the SD.',
    );
  }
  const trueVar = pop.pretestSD ** 2 - sem * sem;
  const rho = trueVar / pop.pretestSD ** 2;
  const { beta, residualSD } = outcomeSlope(pop.pretestSD, rho, plan.outcome.posttestSD, plan.outcome.prePostCorrelation);
  const screenerSD =
    design.basis === 'screener' && design.screenerReliability !== null ? Math.sqrt(trueVar / design.screenerReliability) : null;
  if (design.basis === 'screener' && screenerSD === null) {
    throw new Error('A rule on a screener needs the screener\u2019s reliability (assignment.screenerReliability).');
  }
  return {
    label: pop.label,
    poolSize: pop.poolSize,
    mean: pop.pretestMean,
    observedSD: pop.pretestSD,
    trueSD: Math.sqrt(trueVar),
    sem,
    reliability: rho,
    screenerSD,
    beta,
    residualSD,
    posttestSD: plan.outcome.posttestSD,
  };
}

/**
 * P(selected into the programme | variable `index` = value) under the model:
 * (V, B') are bivariate normal, so B' | V = v is normal with mean
 * mu + c_VB (v − mu_V) / var(V) and variance var(B') − c_VB² / var(V), and the
 * probability is Φ((c − mean) / sd) for 'below' (1 − that for 'above'); a
 * step at the cut-off when V is the basis itself and the cut is sharp.
 * Reference: bivariate normal conditional law (common practice).
 * @param m the selection model. @param index SEL_PRETEST, SEL_TRUE, SEL_OUTCOME or SEL_SCREENER.
 * @param value a value of that variable (its points).
 * @returns probability in [0, 1].
 * @example sharp cut on the pretest below 41.6: selectionProbabilityGiven(m, SEL_PRETEST, 40) // 1
 */
export function selectionProbabilityGiven(m: SelectionModel, index: number, value: number): number {
  const varV = (m.populationCov[index] as number[])[index] as number;
  const mean = m.population.mean;
  const c = m.basisCov[index] as number;
  const latentVar = m.latentSD * m.latentSD;
  const condMean = varV > 0 ? mean + (c * (value - mean)) / varV : mean;
  const condVar = Math.max(0, latentVar - (varV > 0 ? (c * c) / varV : 0));
  const below =
    condVar <= 1e-12 * latentVar
      ? condMean < m.design.cutOff
        ? 1
        : condMean > m.design.cutOff
          ? 0
          : 0.5
      : normalCdf((m.design.cutOff - condMean) / Math.sqrt(condVar));
  return m.design.side === 'below' ? below : 1 - below;
}

/**
 * Density of variable `index` (pretest, true score, posttest without the
 * programme, or screener) within one group: the population's normal density
 * times P(group | value), divided by the group's share (Bayes' rule).
 * Integrates to 1 over the line. Used by the charts to show the selected
 * group at the pretest and re-measured.
 * @example selectedDensity(m, SEL_OUTCOME, 45, 'programme') // the re-measured programme group's density at 45
 */
export function selectedDensity(m: SelectionModel, index: number, value: number, group: 'programme' | 'comparison'): number {
  const sd = Math.sqrt((m.populationCov[index] as number[])[index] as number);
  if (!(sd > 0)) return 0;
  const f = normalPdf((value - m.population.mean) / sd) / sd;
  const p = selectionProbabilityGiven(m, index, value);
  const g = group === 'programme' ? m.programme : m.comparison;
  return (f * (group === 'programme' ? p : 1 - p)) / g.share;
}
