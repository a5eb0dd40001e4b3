/**
 * The matched sets of one replication: programme member j (0-based in the
 * programme pool as the matcher saw it) has partnerCount[j] partners,
 * partners[j * ratio + q] for q < partnerCount[j], each an index into the
 * comparison members as the matcher saw them (the matcher says which order).
 */
export interface MatchedSets {
  readonly nProgramme: number;
  readonly nComparison: number;
  /** Partners per programme member sought (1..5). */
  readonly ratio: number;
  readonly partners: Int32Array;
  readonly partnerCount: Uint8Array;
}

/**
 * Allocate empty matched sets for pools of the given sizes: the part every
 * matcher's workspace shares.
 * @param nProgramme programme pool size (≥ 0). @param nComparison comparison pool size (≥ 0).
 * @param ratio partners per programme member, 1..5.
 * @returns partners (nProgramme × ratio) and partnerCount (nProgramme), zero-filled.
 * @throws RangeError (from the typed arrays) for a negative or non-integer size.
 * @example createMatchedSets(180, 1200, 2).partners.length // 360
 */
export function createMatchedSets(nProgramme: number, nComparison: number, ratio: number): MatchedSets {
  return {
    nProgramme,
    nComparison,
    ratio,
    partners: new Int32Array(nProgramme * ratio),
    partnerCount: new Uint8Array(nProgramme),
  };
}
