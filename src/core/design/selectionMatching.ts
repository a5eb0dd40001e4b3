import type { MatchingDemand } from '../expectedMatchedShare';
import { normalCdf, normalPdf } from '../distributions';
import { formatNumber, requirePositive } from '../inputChecks';
import { millsBelow, SEL_OUTCOME, SEL_PRETEST, type SelectionModel } from './selectionModel';

/**
 * What exact matching on the observed pretest gives in a selection design,
 * with unlimited pools: each programme member compared with comparison
 * members of exactly the same pretest score.
 */
export interface SelectionMatchedFigures {
  /**
   * false when the rule leaves no overlap on the pretest (a sharp cut-off on
   * the pretest itself, or on a true score the pretest measures without
   * error): nobody in the comparison group has a programme member's score.
   * The other figures are then the limit of a probability rule whose spread
   * shrinks to 0 (artefact 0, variances of the two sides at the cut-off).
   */
  overlap: boolean;
  /** E over the programme's pretest of E(Y0 | X, programme) − E(Y0 | X, comparison), posttest points. */
  artefact: number;
  /** E over the programme's pretest of Var(Y0 | X, programme), squared points. */
  programmeVariance: number;
  /** E over the programme's pretest of Var(Y0 | X, comparison), squared points. */
  comparisonVariance: number;
  /** Variance over the programme's pretest of the conditional mean difference, squared points. */
  differenceSpread: number;
  /** Grid intervals of the numerical integration. */
  intervals: number;
}

/** The pretest grid both integrals use, with the population density and P(programme | x) at each point. */
interface PretestGrid {
  xs: number[];
  h: number;
  /** Population density of the pretest at each x. */
  density: number[];
  /** P(programme | X = x). */
  programme: number[];
  /** Conditional law of (Y0, B') given X = x. */
  cond: ConditionalLaw;
}

/** The law of (Y0, B') given the pretest X = x, B' = basis + spread·ε (bivariate normal; common practice). */
interface ConditionalLaw {
  meanY: (x: number) => number;
  varY: number;
  meanB: (x: number) => number;
  varB: number;
  covYB: number;
  /** Whether B' given X has no spread left (no overlap): the cut splits the pretest line sharply. */
  sharp: boolean;
}

function conditionalLaw(m: SelectionModel): ConditionalLaw {
  const S = m.populationCov;
  const mu = m.population.mean;
  const b = m.basisIndex;
  const varX = (S[SEL_PRETEST] as number[])[SEL_PRETEST] as number;
  const cYX = (S[SEL_OUTCOME] as number[])[SEL_PRETEST] as number;
  const cBX = (S[b] as number[])[SEL_PRETEST] as number;
  const latentVar = m.latentSD * m.latentSD;
  const varB = Math.max(0, latentVar - (cBX * cBX) / varX);
  return {
    meanY: (x) => mu + (cYX * (x - mu)) / varX,
    varY: Math.max(0, ((S[SEL_OUTCOME] as number[])[SEL_OUTCOME] as number) - (cYX * cYX) / varX),
    meanB: (x) => mu + (cBX * (x - mu)) / varX,
    varB,
    covYB: ((S[SEL_OUTCOME] as number[])[b] as number) - (cYX * cBX) / varX,
    sharp: varB <= 1e-12 * latentVar,
  };
}

/**
 * The grid: the population's pretest mean ± 10 SD, with a step of at most
 * 1/200 SD and at most 1/20 of the width over which P(programme | x) moves
 * from near 0 to near 1 (so a near-sharp rule is resolved), and at most 40,000 intervals.
 */
function pretestGrid(m: SelectionModel): PretestGrid {
  const cond = conditionalLaw(m);
  const mu = m.population.mean;
  const sx = m.population.observedSD;
  const cBX = (m.populationCov[m.basisIndex] as number[])[SEL_PRETEST] as number;
  const width = cond.sharp || cBX === 0 ? Infinity : (Math.sqrt(cond.varB) * sx * sx) / Math.abs(cBX);
  const lo = mu - 10 * sx;
  const hi = mu + 10 * sx;
  const step = Math.max(Math.min(sx / 200, width / 20), (hi - lo) / 40000);
  let n = Math.ceil((hi - lo) / step);
  if (n % 2 === 1) n += 1;
  const h = (hi - lo) / n;
  const xs = Array.from({ length: n + 1 }, (_, i) => (i === n ? hi : lo + i * h));
  const density = xs.map((x) => normalPdf((x - mu) / sx) / sx);
  const programme = xs.map((x) => programmeProbability(m, cond, x));
  return { xs, h, density, programme, cond };
}

/** P(programme | X = x) from the conditional law of B' given X. */
function programmeProbability(m: SelectionModel, cond: ConditionalLaw, x: number): number {
  const cut = m.design.cutOff;
  const mb = cond.meanB(x);
  const below = cond.sharp ? (mb < cut ? 1 : mb > cut ? 0 : 0.5) : normalCdf((cut - mb) / Math.sqrt(cond.varB));
  return m.design.side === 'below' ? below : 1 - below;
}

/** Simpson weights 1, 4, 2, …, 4, 1 (times h/3). */
function simpsonWeight(i: number, n: number): number {
  return i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
}

/**
 * Expected matched post-test difference's artefact, and the conditional
 * variances behind its approximate SE, for exact matching on the observed
 * pretest with unlimited pools in a selection design.
 *
 * Given X = x, the outcome without the programme Y0 and the latent selection
 * score B' = B + spread·ε are bivariate normal (all variables load on the
 * true score; ε is independent), with a = (c − E[B'|x]) / sd(B'|x),
 * k = cov(Y0, B' | x) / sd(B'|x), λ = φ(a)/Φ(a), λ' = φ(a)/(1 − Φ(a)), v = Var(Y0 | x):
 *   E[Y0 | x, B' < c] = E[Y0|x] − k λ,   Var = v − k²(aλ + λ²),
 *   E[Y0 | x, B' > c] = E[Y0|x] + k λ',  Var = v − k²(λ'² − aλ')
 * (truncated bivariate normal; Johnson, Kotz & Balakrishnan 1994, ch. 13 and
 * Tallis 1961, from memory). The artefact is the mean over the programme's
 * pretest density f_X(x)·P(programme | x) / share of D(x) = E[Y0|x, programme] − E[Y0|x, comparison],
 * integrated by Simpson's rule on the grid of pretestGrid (population mean
 * ± 10 SD, step ≤ SD/200; accuracy: agrees with a grid twice as fine to
 * better than 1e-8 points in the tests' plans).
 * With the pretest as the basis k = 0 for every x: matching on the variable
 * the rule used is exactly unbiased when there is overlap (a probability rule).
 *
 * @param m the selection model (two-group shape).
 * @returns the figures; overlap false for a sharp cut on the pretest (or on a
 *   true score the pretest measures exactly).
 * @throws never for a valid model.
 * @example cut-off on a screener (reliability .7) at its 20th percentile, population SD 10,
 *   pretest reliability .8, r .7 → artefact about −2.3 points (the programme's true scores sit
 *   below those of comparison members with the same pretest)
 */
export function selectionMatchedFigures(m: SelectionModel): SelectionMatchedFigures {
  const g = pretestGrid(m);
  const { cond } = g;
  const n = g.xs.length - 1;
  if (cond.sharp) {
    return { overlap: false, artefact: 0, programmeVariance: cond.varY, comparisonVariance: cond.varY, differenceSpread: 0, intervals: n };
  }
  const sdB = Math.sqrt(cond.varB);
  const k = cond.covYB / sdB;
  const below = m.design.side === 'below';
  let mass = 0;
  let sumD = 0;
  let sumD2 = 0;
  let sumVP = 0;
  let sumVC = 0;
  for (let i = 0; i <= n; i++) {
    const x = g.xs[i] as number;
    const wP = (g.density[i] as number) * (g.programme[i] as number) * simpsonWeight(i, n);
    if (!(wP > 0)) continue;
    const a = (m.design.cutOff - cond.meanB(x)) / sdB;
    const lamBelow = millsBelow(a);
    const lamAbove = millsBelow(-a);
    const varBelow = Math.max(0, cond.varY - k * k * (a * lamBelow + lamBelow * lamBelow));
    const varAbove = Math.max(0, cond.varY - k * k * (lamAbove * lamAbove - a * lamAbove));
    // D(x) = E[Y0 | below] − E[Y0 | above] = −k(λ + λ'), sign flipped when the programme is above.
    const dBelow = -k * (lamBelow + lamAbove);
    const d = below ? dBelow : -dBelow;
    mass += wP;
    sumD += wP * d;
    sumD2 += wP * d * d;
    sumVP += wP * (below ? varBelow : varAbove);
    sumVC += wP * (below ? varAbove : varBelow);
  }
  const artefact = sumD / mass;
  return {
    overlap: true,
    artefact,
    programmeVariance: sumVP / mass,
    comparisonVariance: sumVC / mass,
    differenceSpread: Math.max(0, sumD2 / mass - artefact * artefact),
    intervals: n,
  };
}

/**
 * Approximate share of the programme group expected to find at least one
 * comparison partner within the caliper, in a selection design: the same
 * Poisson and supply-versus-demand approximation as expectedMatchedShare
 * (λ(x) = n_C·P(|X_C − x| ≤ c); with replacement share = E_P[1 − e^{−λ}];
 * without, times min(1, λ / (k·n_P·P(|X_P − x| ≤ c)))), with each group's
 * pretest distribution the population's normal density times P(group | x)
 * (not normal), its window masses from cumulative trapezoid sums on the grid
 * of pretestGrid. The caliper half-width is caliper × sqrt((s_P² + s_C²)/2)
 * with the groups' pretest SDs (Cochran & Rubin 1973 units). An
 * APPROXIMATION for planning at a glance; the simulation gives the exact figure.
 *
 * @param m the selection model. @param matching caliper (> 0), ratio (≥ 1), replacement.
 * @returns share in [0, 1] (0 when the rule leaves no overlap is not implied: a caliper
 *   still reaches across a sharp cut-off; callers decide feasibility separately).
 * @throws Error when caliper ≤ 0 or ratio < 1.
 * @example a screener rule with 4,000 of 20,000 selected, caliper 0.2, 1:1 without replacement → about 0.99
 */
export function selectionMatchedShare(m: SelectionModel, matching: MatchingDemand): number {
  const ratio = requirePositive(matching.ratio, 'The matching ratio');
  if (ratio < 1) throw new Error(`The matching ratio must be at least 1; got ${formatNumber(ratio)}.`);
  const sP2 = (m.programme.cov[SEL_PRETEST] as number[])[SEL_PRETEST] as number;
  const sC2 = (m.comparison.cov[SEL_PRETEST] as number[])[SEL_PRETEST] as number;
  const c = requirePositive(matching.caliper, 'The caliper') * Math.sqrt((sP2 + sC2) / 2);
  const g = pretestGrid(m);
  const n = g.xs.length - 1;
  const fP = g.density.map((f, i) => (f * (g.programme[i] as number)) / m.programme.share);
  const fC = g.density.map((f, i) => (f * (1 - (g.programme[i] as number))) / m.comparison.share);
  const cumulative = (f: number[]): number[] => {
    const out = [0];
    for (let i = 1; i <= n; i++) out.push((out[i - 1] as number) + (((f[i - 1] as number) + (f[i] as number)) * g.h) / 2);
    return out;
  };
  const FP = cumulative(fP);
  const FC = cumulative(fC);
  const lo = g.xs[0] as number;
  const at = (F: number[], x: number): number => {
    const u = (x - lo) / g.h;
    if (u <= 0) return 0;
    if (u >= n) return F[n] as number;
    const i = Math.floor(u);
    return (F[i] as number) + ((F[i + 1] as number) - (F[i] as number)) * (u - i);
  };
  const nP = m.programme.n;
  const nC = m.comparison.n;
  let sum = 0;
  for (let i = 0; i <= n; i++) {
    const f = fP[i] as number;
    if (!(f > 0)) continue;
    const x = g.xs[i] as number;
    const lambda = nC * Math.max(0, at(FC, x + c) - at(FC, x - c));
    let share = 1 - Math.exp(-lambda);
    if (!matching.replacement) {
      const demand = ratio * nP * Math.max(0, at(FP, x + c) - at(FP, x - c));
      if (demand > 0) share *= Math.min(1, lambda / demand);
    }
    sum += simpsonWeight(i, n) * f * share;
  }
  return Math.min(1, Math.max(0, (sum * g.h) / 3));
}
