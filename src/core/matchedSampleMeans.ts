/** One matched set as the simulation reports it (observed and true pretest scores). */
export interface MatchedSetScores {
  programme: { observed: number; trueScore: number };
  comparison: { observed: number; trueScore: number }[];
}

/** Mean observed and true pretest of the matched members of each group. */
export interface MatchedSampleMeans {
  observed: { programme: number; comparison: number };
  trueScore: { programme: number; comparison: number };
  /** Matched programme members and comparison partners counted. */
  n: { programme: number; comparison: number };
}

/**
 * Mean observed and true pretest scores of the matched members in one
 * (simulated) study: programme members weighted equally; each member's
 * partners weighted 1/k so every matched set counts once (common practice for
 * 1:k matched sets; Stuart 2010).
 *
 * @param sets matched sets, each with one programme member and at least one partner.
 * @returns the means (test points) and counts.
 * @throws Error when there are no sets, a set has no partner, or a score is not finite.
 * @example
 *   matchedSampleMeans([{ programme: { observed: 40, trueScore: 41 }, comparison: [{ observed: 40.5, trueScore: 44 }] },
 *                       { programme: { observed: 50, trueScore: 49 }, comparison: [{ observed: 49.5, trueScore: 52 }, { observed: 50.5, trueScore: 50 }] }])
 *   // observed 45 vs 45.25; true 45 vs 47.5
 */
export function matchedSampleMeans(sets: readonly MatchedSetScores[]): MatchedSampleMeans {
  if (sets.length === 0) throw new Error('No programme member found a partner, so the matched sample has no means.');
  let oP = 0;
  let tP = 0;
  let oC = 0;
  let tC = 0;
  let nC = 0;
  for (const s of sets) {
    const k = s.comparison.length;
    if (k === 0) throw new Error('A matched set has no comparison partner.');
    oP += s.programme.observed;
    tP += s.programme.trueScore;
    for (const c of s.comparison) {
      oC += c.observed / k;
      tC += c.trueScore / k;
    }
    nC += k;
  }
  const m = sets.length;
  const out = {
    observed: { programme: oP / m, comparison: oC / m },
    trueScore: { programme: tP / m, comparison: tC / m },
    n: { programme: m, comparison: nC },
  };
  for (const v of [out.observed.programme, out.observed.comparison, out.trueScore.programme, out.trueScore.comparison]) {
    if (!Number.isFinite(v)) throw new Error('A matched member has a missing or non-finite pretest score.');
  }
  return out;
}
