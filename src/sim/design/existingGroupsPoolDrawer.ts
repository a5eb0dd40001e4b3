import type { Plan } from '../../core/plan';
import { deriveModelParameters } from '../../core/deriveModelParameters';
import type { NormalSampler } from '../normalSampler';
import type { RandomSource } from '../randomSource';
import type { DrawnPools, PoolDrawer } from './poolDrawer';

/**
 * A pool drawer for two existing groups (the original model,
 * deriveModelParameters): per group g, T ~ N(mu_g, sd_Tg²), X = T + N(0, SEM²),
 * Y = growthGap·[P] + tau·[P] + beta·T + e, drawn plainly (T, then X, then Y;
 * no sorted samples). It exists to show that the pools engine's seam is real:
 * with it, createPoolsSimulation simulates the same world as the one-pretest
 * engine (createSimulation), which stays the one used in production for these
 * plans (faster, and its results are fixed bit for bit); a test checks that the
 * two agree within Monte Carlo error.
 *
 * @param plan a validated plan with two existing groups and no covariates.
 * @returns a drawer with fixed group sizes (its capacity is both pools together).
 * @throws Error with a researcher-readable message for contradictory inputs (from deriveModelParameters).
 * @example existingGroupsPoolDrawer(demoPlan()).capacity // 180 + 1200 (the demo's pools)
 */
export function existingGroupsPoolDrawer(plan: Plan): PoolDrawer {
  return new ExistingGroupsPoolDrawer(plan);
}

class ExistingGroupsPoolDrawer implements PoolDrawer {
  readonly capacity: number;
  readonly effect: number;
  readonly observedBasis = false;
  readonly sortedByPretest = false;
  readonly nP: number;
  readonly nC: number;
  readonly mu: Float64Array;
  readonly trueSD: Float64Array;
  readonly yCentre: Float64Array;
  readonly sem: number;
  readonly beta: number;
  readonly residualSD: number;
  readonly z: Float64Array;

  constructor(plan: Plan) {
    const m = deriveModelParameters(plan);
    this.nP = m.n.programme;
    this.nC = m.n.comparison;
    this.capacity = this.nP + this.nC;
    this.effect = m.effect;
    // Index 0: comparison, 1: programme.
    this.mu = Float64Array.of(m.mean.comparison, m.mean.programme);
    this.trueSD = Float64Array.of(m.trueSD.comparison, m.trueSD.programme);
    this.yCentre = Float64Array.of(0, m.growthGap + m.effect);
    this.sem = m.sem;
    this.beta = m.beta;
    this.residualSD = m.residualSD;
    this.z = new Float64Array(3 * this.capacity);
  }

  draw(normal: NormalSampler, _rng: RandomSource, pools: DrawnPools): void {
    const N = this.capacity;
    const nC = this.nC;
    const z = this.z;
    normal.fillStandard(z, 3 * N);
    const { sem, beta, residualSD } = this;
    const { observed, trueScore, outcome } = pools;
    for (let i = 0; i < N; i++) {
      const g = i < nC ? 0 : 1;
      const t = (this.mu[g] as number) + (this.trueSD[g] as number) * (z[i] as number);
      trueScore[i] = t;
      observed[i] = t + sem * (z[N + i] as number);
      outcome[i] = (this.yCentre[g] as number) + beta * t + residualSD * (z[2 * N + i] as number);
    }
    pools.nComparison = nC;
    pools.nProgramme = this.nP;
  }
}
