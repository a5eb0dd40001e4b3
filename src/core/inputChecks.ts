/**
 * Input checks shared by the core's formulas: each throws an Error whose
 * message names the quantity, the valid range and the value received, so a
 * researcher can see what to change (common practice).
 */

/** Format a number for a message: integers as is, others to 3 decimals without trailing zeros. */
export function formatNumber(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  return Number.isInteger(x) ? String(x) : x.toFixed(3).replace(/0+$/, '').replace(/\.$/, '');
}

/**
 * A number of points for sentences shown to researchers: two decimals and a
 * typographic minus, as the planner's tables show points (e.g. "−1.80").
 */
export function formatPointsText(x: number): string {
  return `${x >= 0 ? '' : '−'}${Math.abs(x).toFixed(2)}`;
}

/** Throws unless `value` is a finite number. */
export function requireFinite(value: number, what: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new Error(`${what} must be a finite number; got ${String(value)}.`);
  }
  return value;
}

/** Throws unless 0 < value ≤ 1 (a reliability coefficient). */
export function requireReliability(value: number, what = 'Reliability'): number {
  requireFinite(value, what);
  if (!(value > 0 && value <= 1)) {
    throw new Error(`${what} must be between 0 and 1 (exclusive of 0); got ${formatNumber(value)}.`);
  }
  return value;
}

/** Throws unless value > 0. */
export function requirePositive(value: number, what: string): number {
  requireFinite(value, what);
  if (!(value > 0)) {
    throw new Error(`${what} must be greater than 0; got ${formatNumber(value)}.`);
  }
  return value;
}

/** Throws unless value ≥ 0. */
export function requireNonNegative(value: number, what: string): number {
  requireFinite(value, what);
  if (!(value >= 0)) {
    throw new Error(`${what} must be 0 or more; got ${formatNumber(value)}.`);
  }
  return value;
}

/** Throws unless lo < value < hi. */
export function requireOpenInterval(value: number, lo: number, hi: number, what: string): number {
  requireFinite(value, what);
  if (!(value > lo && value < hi)) {
    throw new Error(
      `${what} must be between ${formatNumber(lo)} and ${formatNumber(hi)} (exclusive); got ${formatNumber(value)}.`,
    );
  }
  return value;
}
