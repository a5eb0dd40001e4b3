// Each matcher's workspace lists these five fields in its own object literal
// rather than spreading a shared allocation into it: a workspace built by
// spread gets a different object layout, and the one-pretest engine ran
// measurably slower with it (three same-process A/B runs, order rotated:
// median 1.12–1.41 times the time), so the literal was restored.

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
