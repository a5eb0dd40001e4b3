import type { ModelParameters } from '../../src/core/modelParameters';

/**
 * Test fixture: model parameters built directly from true-score quantities
 * (no plan), so closed forms can be checked at chosen reliabilities.
 */
export function modelFixture(o: {
  gap?: number;
  rhoP?: number;
  rhoC?: number;
  beta?: number;
  tau?: number;
  growthGap?: number;
  observedSD?: number;
  residualSD?: number;
  nP?: number;
  nC?: number;
}): ModelParameters {
  const sd = o.observedSD ?? 10;
  const rhoP = o.rhoP ?? 0.8;
  const rhoC = o.rhoC ?? rhoP;
  const nP = o.nP ?? 100;
  const nC = o.nC ?? 100;
  const beta = o.beta ?? 1;
  const residualSD = o.residualSD ?? 5;
  const tvP = rhoP * sd * sd;
  const tvC = rhoC * sd * sd;
  const gap = o.gap ?? 10;
  return {
    mean: { programme: 50 + gap, comparison: 50 },
    pretestGap: gap,
    observedSD: { programme: sd, comparison: sd },
    trueSD: { programme: Math.sqrt(tvP), comparison: Math.sqrt(tvC) },
    // SEM from the comparison group; equal SDs keep it common to both when rhoP = rhoC.
    sem: sd * Math.sqrt(1 - rhoC),
    reliability: { programme: rhoP, comparison: rhoC, pooled: (nP * tvP + nC * tvC) / ((nP + nC) * sd * sd) },
    beta,
    residualSD,
    posttestSD: {
      programme: Math.sqrt(beta * beta * tvP + residualSD ** 2),
      comparison: Math.sqrt(beta * beta * tvC + residualSD ** 2),
    },
    growthGap: o.growthGap ?? 0,
    effect: o.tau ?? 0,
    n: { programme: nP, comparison: nC },
  };
}
