// The CLI's text tables for a clustered plan (the invented schools example):
// the design and the cluster figures in core's words, clusters counted as
// clusters where matching pairs clusters, and the naive person-level rows
// after a simulation. λ is checked against ICC(2) = n·ICC / (1 + (n − 1)·ICC)
// worked by hand (Bliese 2000; common practice) and the design effects against
// Kish (1965), 1 + (n − 1)·ICC.
import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { SCHOOLS_MATCHED_ON_MEANS } from '../../src/io/examplePlans';
import { fmtPercent, fmtPoints, formatResultsTable } from '../../src/cli/formatResultsTable';
import { formatSimulationTable } from '../../src/cli/formatSimulationTable';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { isFeasible } from '../../src/sim/types';

describe('the CLI text for schools matched on their means', () => {
  const plan = structuredClone(SCHOOLS_MATCHED_ON_MEANS);
  const a = analysePlan(plan);

  it('states the design, the clusters, λ, the cohort, the design effects, clusters needed and the MDE', () => {
    const text = formatResultsTable(plan, a);
    expect(text).toContain(`Design: two existing groups of clusters. ${a.design.rule}`);
    expect(text).not.toContain('formed by a rule');
    expect(text).toContain('Programme schools (750 people in 30 clusters of 25)');
    expect(text).toContain('Comparison schools (2000 people in 80 clusters of 25)');
    // Bliese (2000): 25 × .2 / (1 + 24 × .2) = .8621; Kish (1965): 1 + 24 × .2 = 5.80, 1 + 24 × .25 = 7.00.
    expect(text).toContain("Reliability of a cluster's observed mean (lambda): 0.862 (comparison)");
    expect(text).toContain('Design effect (Kish): 5.80 for the pretest, 7.00 for the posttest.');
    expect(text).toContain('a new cohort sits the posttest (not the people tested)');
    const md = a.analyses.matchedDifference!;
    // The matched-cluster artefact is not tolerable here, so no number of clusters is offered.
    expect(md.clustersPerGroupNeeded).toBeNull();
    expect(text).toContain(`biased: more people do not help (no number of clusters per group is offered); minimum detectable effect ${fmtPoints(md.minimumDetectableEffect!)} points`);
    const pl = a.analyses.personLevelAncova!;
    expect(text).toContain(`ignoring the clustering its SE would be reported as ${fmtPoints(pl.naiveSE!)}`);
    expect(text).toContain('Programme n (people)');
  });

  it('after a simulation: counts clusters as clusters and shows the naive row with its coverage', () => {
    const sim = simulatePlan(plan, { replications: 60, seed: 11 });
    const text = formatSimulationTable(sim, a);
    expect(text).toContain('Programme clusters matched:');
    expect(text).not.toContain('Programme members matched');
    expect(text).toContain('of 30 clusters (counts below are clusters)');
    const naive = sim.naivePersonLevel!.personLevelAncova;
    expect(isFeasible(naive)).toBe(true);
    if (!isFeasible(naive)) return;
    const line = text.split('\n').find((l) => l.includes('naive SE (ignores clustering)'));
    expect(line).toBeDefined();
    expect(line).toContain(fmtPercent(naive.coverage));
  });
});
