import jStat from 'jstat';

/** Step of the grid in u = 1/df on which fractional-df quantiles are interpolated. */
const U_STEP = 1 / 8192;
const U_NODES = 8193; // u = 0 (df = ∞) … 1 (df = 1)

/**
 * Two-sided critical values of Student's t, t_{1 - alpha/2, df}, cached so
 * the Monte Carlo loop rarely computes a quantile (jStat's studentt.inv,
 * inverse of the regularised incomplete beta function; Abramowitz & Stegun
 * 1972, 26.7). Cross-checked in the tests against @stdlib's t quantile.
 *
 * Whole df are computed exactly, once each. Fractional df ≥ 1 (the
 * Welch–Satterthwaite df of the gain score and ANCOVA, different in every
 * replication) are interpolated linearly in u = 1/df between exact
 * quantiles on a grid of step 1/8192, computed when first needed: t is a
 * smooth function of 1/df (its Cornish–Fisher expansion is a power series
 * in 1/df; Abramowitz & Stegun 26.7.5), so the interpolation error is below
 * 1e-7 relative for df ≥ 1 (tested), far below anything a coverage or
 * rejection decision can notice, and the value depends on df alone, so
 * results stay bit-identical however replications are chunked. Fractional
 * df below 1 are computed exactly and cached.
 *
 * @example new TCriticalValues(0.05).get(10) ≈ 2.228139 (Student t table, df 10, two-sided .05; common practice)
 * @throws Error when alpha is not in (0, 1) or df is not positive.
 */
export class TCriticalValues {
  private readonly byIntegerDf: Float64Array;
  private readonly other = new Map<number, number>();
  /** Exact quantiles at u = k / 8192 (0 = not yet computed). */
  private readonly grid = new Float64Array(U_NODES);

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
    if (Number.isInteger(df)) {
      if (df < this.byIntegerDf.length) {
        const v = this.byIntegerDf[df] as number;
        if (v !== 0) return v;
        const q = this.exact(df);
        this.byIntegerDf[df] = q;
        return q;
      }
    } else if (df > 1) {
      const pos = 1 / df / U_STEP;
      const k = Math.floor(pos);
      const f = pos - k;
      const a = this.node(k);
      return f === 0 ? a : a + f * (this.node(k + 1) - a);
    }
    const v = this.other.get(df);
    if (v !== undefined) return v;
    const q = this.exact(df);
    this.other.set(df, q);
    return q;
  }

  /** The exact quantile at grid node k (u = k / 8192; k = 0 is the normal quantile). */
  private node(k: number): number {
    const v = this.grid[k] as number;
    if (v !== 0) return v;
    const q = k === 0 ? (jStat.normal.inv(1 - this.alpha / 2, 0, 1) as number) : this.exact(1 / (k * U_STEP));
    this.grid[k] = q;
    return q;
  }

  private exact(df: number): number {
    const q = jStat.studentt.inv(1 - this.alpha / 2, df) as number;
    if (!Number.isFinite(q) || q <= 0) throw new Error(`Could not compute the t quantile for df = ${df}.`);
    return q;
  }
}
