import type { AssignmentBasis } from '../plan';
import { requireNonNegative, requireReliability } from '../inputChecks';
import type { SelectionDesign } from './studyDesign';
import { selectionModelFor, type SelectionModel, type SelectionPopulation } from './selectionModel';

/*
 * "What if" versions of a selection model: the same people and outcome model,
 * one design feature changed. Used by the remedies and the sensitivity curves.
 */

/**
 * The population with the pretest's SEM changed (a longer, averaged or
 * different pretest), true scores and the outcome model (slope on the true
 * score, residual SD) unchanged: observed SD sqrt(trueSD² + sem²), reliability
 * trueSD²/SD² (Lord & Novick 1968, ch. 3, from memory). Averaging m parallel
 * forms divides the SEM by sqrt(m). The posttest SD the plan states is kept as
 * the population's (it does not depend on the pretest).
 * @throws Error when sem is negative. @example populationWithSem(p, 0).reliability // 1
 */
export function populationWithSem(p: SelectionPopulation, sem: number): SelectionPopulation {
  requireNonNegative(sem, 'The SEM');
  const tv = p.trueSD * p.trueSD;
  const sx2 = tv + sem * sem;
  return { ...p, sem, observedSD: Math.sqrt(sx2), reliability: tv / sx2 };
}

/**
 * The design and population with a rule on a different basis; a screener
 * needs its reliability (its SD follows: trueSD / sqrt(reliability)).
 * @throws Error when basis is 'screener' and the reliability is out of (0, 1].
 * @example withBasis(d, p, 'screener', 0.8).population.screenerSD // trueSD / sqrt(.8)
 */
export function withBasis(
  design: SelectionDesign,
  population: SelectionPopulation,
  basis: AssignmentBasis,
  screenerReliability: number | null,
): { design: SelectionDesign; population: SelectionPopulation } {
  if (basis !== 'screener') return { design: { ...design, basis, screenerReliability: null }, population: { ...population, screenerSD: null } };
  const r = requireReliability(screenerReliability ?? Number.NaN, 'The screener reliability');
  return {
    design: { ...design, basis, screenerReliability: r },
    population: { ...population, screenerSD: population.trueSD / Math.sqrt(r) },
  };
}

/** The model with one change to the design and/or the population (selectionModelFor). @throws as selectionModelFor. */
export function modelWith(
  m: SelectionModel,
  change: { design?: Partial<SelectionDesign>; population?: SelectionPopulation },
): SelectionModel {
  return selectionModelFor({ ...m.design, ...change.design }, change.population ?? m.population);
}
