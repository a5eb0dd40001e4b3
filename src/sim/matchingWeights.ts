/**
 * Per-comparison-member use counts of one replication's matched sets, for
 * the matching-weights variance of the matched difference (Abadie & Imbens
 * 2006, Econometrica 74, 235–267) and the stacked matched-sample ANCOVA.
 * For comparison member j, with cnt_i the partners of programme member i:
 *
 *   uses[j]    n_j  = Σ_i 1[j partner of i]           (stacked rows)
 *   weight[j]  K_j  = Σ_i 1[j partner of i] / cnt_i   (matching weight)
 *   weight2[j] K'_j = Σ_i 1[j partner of i] / cnt_i²
 *
 * Arrays are allocated once per simulation and indexed by comparison
 * position; `reset` zeroes only the members touched since the last reset
 * (a touched list), so a replication allocates and clears nothing else.
 * Without replacement each member is used at most once, so K_j² = K'_j.
 *
 * @example
 *   const w = new MatchingWeights(3); w.add(0, 1); w.add(0, 2);
 *   w.weight[0] // 1.5; w.weight2[0] // 1.25; w.reuseExcess() // 1.5² − 1.25 = 1 (hand-worked)
 */
export class MatchingWeights {
  /** n_j: how many programme members use comparison member j. */
  readonly uses: Int32Array;
  /** K_j: Σ over those programme members of 1 / (their partner count). */
  readonly weight: Float64Array;
  /** K'_j: Σ of 1 / (partner count)². */
  readonly weight2: Float64Array;
  /** Comparison positions with uses > 0, first `touchedCount` entries. */
  readonly touched: Int32Array;
  touchedCount = 0;

  /**
   * @param nComparison comparison pool size (≥ 0).
   * @throws RangeError (from the typed arrays) when nComparison is negative or not an integer.
   */
  constructor(nComparison: number) {
    this.uses = new Int32Array(nComparison);
    this.weight = new Float64Array(nComparison);
    this.weight2 = new Float64Array(nComparison);
    this.touched = new Int32Array(nComparison);
  }

  /** Zero every member touched since the last reset. */
  reset(): void {
    const { uses, weight, weight2, touched } = this;
    for (let t = 0; t < this.touchedCount; t++) {
      const j = touched[t] as number;
      uses[j] = 0;
      weight[j] = 0;
      weight2[j] = 0;
    }
    this.touchedCount = 0;
  }

  /** Record comparison member j as one of `cnt` (≥ 1) partners of a programme member. */
  add(j: number, cnt: number): void {
    const u = this.uses[j] as number;
    if (u === 0) this.touched[this.touchedCount++] = j;
    this.uses[j] = u + 1;
    const w = 1 / cnt;
    this.weight[j] = (this.weight[j] as number) + w;
    this.weight2[j] = (this.weight2[j] as number) + w * w;
  }

  /**
   * Record comparison member j's use only (uses and the touched list, as `add`
   * does), leaving weight and weight2 at 0: for callers that read neither
   * (the one-pretest engine without replacement, whose reuse term is 0).
   */
  addUse(j: number): void {
    const u = this.uses[j] as number;
    if (u === 0) this.touched[this.touchedCount++] = j;
    this.uses[j] = u + 1;
  }

  /** Σ_j (K_j² − K'_j): 0 without reuse; the reuse term of the Abadie–Imbens variance (times σ²_C / m²). */
  reuseExcess(): number {
    const { weight, weight2, touched } = this;
    let s = 0;
    for (let t = 0; t < this.touchedCount; t++) {
      const j = touched[t] as number;
      const k = weight[j] as number;
      s += k * k - (weight2[j] as number);
    }
    return s;
  }

  /** Σ_j n_j²: the stacked rows' sum of squared use counts (equals the number of rows without reuse). */
  sumUses2(): number {
    const { uses, touched } = this;
    let s = 0;
    for (let t = 0; t < this.touchedCount; t++) {
      const u = uses[touched[t] as number] as number;
      s += u * u;
    }
    return s;
  }
}
