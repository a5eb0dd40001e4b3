import jStat from 'jstat';

/**
 * Two-sided critical values of Student's t, t_{1 - alpha/2, df}, cached per
 * degrees of freedom so the Monte Carlo loop computes each quantile once
 * (jStat's studentt.inv, inverse of the regularised incomplete beta
 * function; Abramowitz & Stegun 1972, 26.7). Cross-checked in the tests
 * against @stdlib's t quantile.
 *
 * @example new TCriticalValues(0.05).get(10) ≈ 2.228139 (Student t table, df 10, two-sided .05; common practice)
 * @throws Error when alpha is not in (0, 1) or df is not positive.
 */
export class TCriticalValues {
  private readonly byIntegerDf: Float64Array;
  private readonly other = new Map<number, number>();

  /**
   * @param alpha two-sided level in (0, 1).
   * @param maxIntegerDf integer df up to this are kept in a flat array (others in a map).
   */
  constructor(
    readonly alpha: number,
    maxIntegerDf = 4096,
  ) {
    if (!(alpha > 0 && alpha < 1)) {
      throw new Error(`The significance level must be between 0 and 1 (exclusive); got ${String(alpha)}.`);
    }
    this.byIntegerDf = new Float64Array(maxIntegerDf + 1);
  }

  /** t_{1 - alpha/2, df}; df > 0 (need not be an integer). */
  get(df: number): number {
    if (!(df > 0) || !Number.isFinite(df)) {
      throw new Error(`Degrees of freedom must be a positive number; got ${String(df)}.`);
    }
    const flat = Number.isInteger(df) && df < this.byIntegerDf.length;
    if (flat) {
      const v = this.byIntegerDf[df] as number;
      if (v !== 0) return v;
    } else {
      const v = this.other.get(df);
      if (v !== undefined) return v;
    }
    const q = jStat.studentt.inv(1 - this.alpha / 2, df) as number;
    if (!Number.isFinite(q) || q <= 0) throw new Error(`Could not compute the t quantile for df = ${df}.`);
    if (flat) this.byIntegerDf[df] = q;
    else this.other.set(df, q);
    return q;
  }
}
