import type { Plan } from '../../core/plan';
import { selectionModel } from '../../core/design/selectionModel';
import type { NormalSampler } from '../normalSampler';
import type { RandomSource } from '../randomSource';
import type { DrawnPools, PoolDrawer } from './poolDrawer';

/**
 * The pool drawer of a selection design (docs/simulation.md, "The pools
 * engine"): every replication draws the whole population of the plan
 * (population.poolSize people) from the core's selection model
 * (selectionModel; Lord & Novick 1968 classical test theory) and applies the
 * rule, so the programme's size varies from replication to replication as it
 * would in the study:
 *
 *   X = mu + sd_X z₁ (z₁ a sorted sample),  T = mu + rho (X − mu) + sqrt(rho (1 − rho)) sd_X z₂,
 *   S = T + SEM_S z₃ (screener only),
 *   Y0 = mu + beta (T − mu) + sigma_e z₄  (the posttest without the programme),
 *   B = X, S or T (the rule's basis),  B' = B + spread·z₅ ('probability' only),
 *   programme ⇔ B' < cut-off ('below') or B' > cut-off ('above'),
 *   Y = Y0 + tau + growthGap for programme members, Y = Y0 otherwise.
 *
 * A probability rule P(programme | B) = Φ((c − B)/spread) is exactly the
 * sharp cut on B + spread·z₅ (the model's own definition). Drawing X first
 * and T from its regression on X (Kelley 1947) is exactly the joint law of
 * T ~ N(mu, sd_T²), X = T + N(0, SEM²), and lets the pretests be drawn as a
 * sorted sample (NormalSampler.fillSortedStandard: exponential spacings and
 * Φ⁻¹, Devroye 1986, V.3), so each group comes out ascending by pretest and
 * matching needs no sort (the programme's rows, written from the back, are
 * put back in ascending order). In a one-group
 * design growthGap is the growth the population shows without the
 * programme, so the programme members' Y carries it the same way; the people
 * not selected are drawn but never analysed. Comparison members are written
 * to the front rows, programme members to the back rows (the pools engine's
 * layout).
 *
 * @param plan a validated plan with a selection rule (or a one-group design).
 * @returns a drawer with its own buffers (5 normal variates per person at most).
 * @throws Error with a researcher-readable message from selectionModel when the
 *   inputs contradict each other or the rule leaves too few people in a group.
 * @example selectionPoolDrawer(plan).capacity // plan.population.poolSize
 */
export function selectionPoolDrawer(plan: Plan): PoolDrawer {
  return new SelectionPoolDrawer(plan);
}

class SelectionPoolDrawer implements PoolDrawer {
  readonly capacity: number;
  readonly effect: number;
  readonly observedBasis: boolean;
  readonly sortedByPretest = true;
  readonly mean: number;
  readonly observedSD: number;
  readonly reliability: number;
  readonly conditionalSD: number;
  readonly screenerSEM: number;
  readonly beta: number;
  readonly residualSD: number;
  readonly shift: number;
  readonly cutOff: number;
  readonly below: boolean;
  readonly spread: number;
  /** 0 pretest, 1 screener, 2 true score. */
  readonly basisKind: number;
  readonly variates: number;
  readonly z: Float64Array;

  constructor(plan: Plan) {
    const model = selectionModel(plan);
    const { population, design } = model;
    this.capacity = population.poolSize;
    this.effect =
      plan.outcome.effectScale === 'points' ? plan.outcome.hypothesisedEffect : plan.outcome.hypothesisedEffect * plan.outcome.posttestSD;
    this.mean = population.mean;
    this.observedSD = population.observedSD;
    this.reliability = population.reliability;
    // SD of T given X: sd_T · SEM / sd_X (= sqrt(rho (1 − rho)) sd_X).
    this.conditionalSD = (population.trueSD * population.sem) / population.observedSD;
    this.screenerSEM = population.screenerSD === null ? 0 : Math.sqrt(Math.max(0, population.screenerSD ** 2 - population.trueSD ** 2));
    this.beta = population.beta;
    this.residualSD = population.residualSD;
    this.shift = this.effect + plan.outcome.growthGap;
    this.cutOff = design.cutOff;
    this.below = design.side === 'below';
    this.spread = design.rule === 'probability' ? design.spread : 0;
    this.basisKind = design.basis === 'pretest' ? 0 : design.basis === 'screener' ? 1 : 2;
    this.observedBasis = this.basisKind !== 2;
    // T, E, e always; the screener's error; the probability rule's noise.
    this.variates = 3 + (this.basisKind === 1 ? 1 : 0) + (this.spread > 0 ? 1 : 0);
    this.z = new Float64Array(this.variates * this.capacity);
  }

  draw(normal: NormalSampler, _rng: RandomSource, pools: DrawnPools): void {
    const N = this.capacity;
    const z = this.z;
    // Variate blocks: [X (ascending) | T given X | e | screener error | rule noise], N each.
    normal.fillSortedStandard(z, N, 0);
    normal.fillStandard(z, (this.variates - 1) * N, N);
    const { mean, observedSD, reliability, conditionalSD, screenerSEM, beta, residualSD, shift, cutOff, below, spread, basisKind } = this;
    const { observed, trueScore, outcome, basis } = pools;
    const zT = N;
    const zY = 2 * N;
    let next = 3 * N;
    // Blocks a rule does not use are read at a valid offset and multiplied by 0 (no branch per person).
    const zS = basisKind === 1 ? next : zT;
    if (basisKind === 1) next += N;
    const zL = spread > 0 ? next : zT;
    // The basis as B = mean + ax·(X − mean) + at·(T − mean) + as·(screener error).
    const ax = basisKind === 0 ? 1 : 0;
    const at = basisKind === 0 ? 0 : 1;
    const as = basisKind === 1 ? screenerSEM : 0;
    // Selected ⇔ sign·(B' − cut-off) < 0.
    const sign = below ? 1 : -1;
    let c = 0; // next comparison row (front, ascending)
    let p = N - 1; // next programme row (back, descending; reversed below)
    for (let i = 0; i < N; i++) {
      const dx = observedSD * (z[i] as number);
      const dt = reliability * dx + conditionalSD * (z[zT + i] as number);
      const y0 = mean + beta * dt + residualSD * (z[zY + i] as number);
      const b = mean + ax * dx + at * dt + as * (z[zS + i] as number);
      const latent = b + spread * (z[zL + i] as number);
      const sel = sign * (latent - cutOff) < 0 ? 1 : 0;
      const row = sel === 1 ? p : c;
      p -= sel;
      c += 1 - sel;
      observed[row] = mean + dx;
      trueScore[row] = mean + dt;
      outcome[row] = y0 + sel * shift;
      basis[row] = b;
    }
    pools.nComparison = c;
    pools.nProgramme = N - c;
    // Programme rows ascending by pretest, like the comparison rows.
    observed.subarray(c, N).reverse();
    trueScore.subarray(c, N).reverse();
    outcome.subarray(c, N).reverse();
    basis.subarray(c, N).reverse();
  }
}
