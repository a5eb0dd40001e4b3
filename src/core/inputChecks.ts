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
 * Format several numbers for one message so that numbers that differ never
 * print alike: each is shown as formatNumber does (integers as is, others to
 * 3 decimals without trailing zeros), and while two different numbers would
 * print the same (e.g. a limit of 0.86603 and a value of 0.86610, both
 * "0.866"), all of them get one more decimal, up to 20; past that, JavaScript's
 * shortest exact form. A value that rounds to −0 prints as 0 (or with enough
 * decimals to show its sign and size). Use it for a limit and the value
 * received, so "must be at most L; got V" never shows L = V.
 *
 * Reference: common practice (report enough significant digits to tell the
 * numbers apart).
 *
 * @param values the numbers, in message order (any finite or non-finite numbers).
 * @returns one string per number, in the same order.
 * @throws never.
 * @example formatApart(Math.sqrt(0.75), 0.8661) // ["0.866", "0.8661"] (both "0.866" at 3 decimals; at 4 the limit is 0.8660 → "0.866")
 * @example formatApart(1, 0.9999) // ["1", "0.9999"]
 * @example formatApart(0.3, 0.25) // ["0.3", "0.25"] (already apart: unchanged)
 */
export function formatApart(...values: number[]): string[] {
  const at = (x: number, decimals: number): string => {
    if (!Number.isFinite(x)) return String(x);
    if (Number.isInteger(x)) return String(x);
    const s = x.toFixed(decimals).replace(/0+$/, '').replace(/\.$/, '');
    return s === '-0' ? '0' : s;
  };
  const apart = (out: string[]): boolean =>
    values.every((x, i) => values.every((y, j) => j <= i || Object.is(x, y) || x === y || out[i] !== out[j]));
  for (let decimals = 3; decimals <= 20; decimals++) {
    const out = values.map((x) => at(x, decimals));
    if (apart(out)) return out;
  }
  return values.map((x) => String(x));
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
    throw new Error(`${what} must be between 0 and 1 (exclusive of 0); got ${formatApart(0, 1, value)[2]}.`);
  }
  return value;
}

/** Throws unless value > 0. */
export function requirePositive(value: number, what: string): number {
  requireFinite(value, what);
  if (!(value > 0)) {
    throw new Error(`${what} must be greater than 0; got ${formatApart(0, value)[1]}.`);
  }
  return value;
}

/** Throws unless value ≥ 0. */
export function requireNonNegative(value: number, what: string): number {
  requireFinite(value, what);
  if (!(value >= 0)) {
    throw new Error(`${what} must be 0 or more; got ${formatApart(0, value)[1]}.`);
  }
  return value;
}

/** Throws unless lo < value < hi. */
export function requireOpenInterval(value: number, lo: number, hi: number, what: string): number {
  requireFinite(value, what);
  if (!(value > lo && value < hi)) {
    const [l, h, v] = formatApart(lo, hi, value);
    throw new Error(`${what} must be between ${l} and ${h} (exclusive); got ${v}.`);
  }
  return value;
}
