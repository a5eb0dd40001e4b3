import type { MatchedSets } from './matchedSets';
import type { ExamplePair, SimulationResult } from './types';

/** One group's observed pretest, true score and outcome, indexed by person. */
export interface PersonColumns {
  readonly observed: Float64Array;
  readonly trueScore: Float64Array;
  readonly outcome: Float64Array;
}

/**
 * One replication's matched sets as the charts draw them: every programme
 * member with partners, with its partners' observed pretest, true score and
 * outcome (in the matcher's partner order), and the discarded members'
 * observed pretest and true score.
 *
 * @param sets the replication's matched sets (partners index `comparison`'s rows).
 * @param programme the programme members' columns; member j is row programmeOffset + j.
 * @param programmeOffset row of programme member 0 in `programme` (0, or n_C when both groups share columns).
 * @param comparison the comparison members' columns.
 * @returns pairs and discarded, in programme order.
 * @throws never.
 * @example
 *   // one programme member (row 0) with partner 1 → pairs [{ programme: row 0, comparison: [row 1] }], discarded [] (hand-worked).
 */
export function exampleReplication(
  sets: MatchedSets,
  programme: PersonColumns,
  programmeOffset: number,
  comparison: PersonColumns,
): SimulationResult['example'] {
  const { nProgramme: nP, ratio: k, partners, partnerCount } = sets;
  const pairs: ExamplePair[] = [];
  const discarded: { observed: number; trueScore: number }[] = [];
  for (let j = 0; j < nP; j++) {
    const i = programmeOffset + j;
    const cnt = partnerCount[j] as number;
    if (cnt === 0) {
      discarded.push({ observed: programme.observed[i] as number, trueScore: programme.trueScore[i] as number });
      continue;
    }
    const partnersOf: ExamplePair['comparison'] = [];
    for (let q = 0; q < cnt; q++) {
      const c = partners[j * k + q] as number;
      partnersOf.push({ observed: comparison.observed[c] as number, trueScore: comparison.trueScore[c] as number, outcome: comparison.outcome[c] as number });
    }
    pairs.push({
      programme: { observed: programme.observed[i] as number, trueScore: programme.trueScore[i] as number, outcome: programme.outcome[i] as number },
      comparison: partnersOf,
    });
  }
  return { pairs, discarded };
}
