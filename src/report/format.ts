/**
 * Number formatting for the PDF summary and the exports. It delegates to the
 * shared display formatters (src/format/numbers.ts, also used by the planner), so the PDF shows every
 * figure exactly as the screen does: fixed decimals, a true minus sign (−),
 * never "-0.00", and "—" for a figure that is missing or not finite (never
 * "NaN" or "Infinity"). Formatting only: no statistic is computed here.
 */
import { fmt, fmtInt, fmtPct, fmtR, fmtSigned } from '../format/numbers';

/** What is shown in place of a missing or non-finite figure. */
export const NOT_AVAILABLE = '—';

/** A quantity in test or posttest points, 2 decimals: 1.2345 → "1.23", -2.5 → "−2.50". */
export function formatPoints(x: number | null | undefined, digits = 2): string {
  return fmt(x, digits);
}

/** A signed quantity in points ("+1.25", "−0.40", "0.00"): biases and estimates. */
export function formatSignedPoints(x: number | null | undefined, digits = 2): string {
  return fmtSigned(x, digits);
}

/** A standardised quantity (post-test SDs, SMD), signed, 2 decimals. */
export function formatSD(x: number | null | undefined, digits = 2): string {
  return fmtSigned(x, digits);
}

/** A reliability or correlation, 3 decimals without the leading zero: 0.75 → ".750". */
export function formatReliability(x: number | null | undefined): string {
  return fmtR(x, 3);
}

/** A probability or rate as a percentage with one decimal: 0.0512 → "5.1%". */
export function formatProbability(p: number | null | undefined): string {
  return fmtPct(p, 1);
}

/** A share (bias as a share of the effect, share discarded) as a whole percentage: "38%". */
export function formatShare(s: number | null | undefined): string {
  return fmtPct(s, 0);
}

/** A count with thousands separators: 1200 → "1,200" (non-integers are rounded). */
export function formatCount(n: number | null | undefined): string {
  return fmtInt(n);
}

/** A figure with its Monte Carlo standard error: "+1.23 ± 0.02" (± one MC SE). */
export function withMcse(value: string, mcse: number | null | undefined, format: (x: number) => string): string {
  if (typeof mcse !== 'number' || !Number.isFinite(mcse)) return value;
  return `${value} ± ${format(mcse)}`;
}

/** An input value as the researcher gave it: numbers keep their own digits, booleans read yes/no. */
export function formatInput(x: number | string | boolean | null | undefined): string {
  if (x === null || x === undefined) return NOT_AVAILABLE;
  if (typeof x === 'boolean') return x ? 'yes' : 'no';
  if (typeof x === 'number') return Number.isFinite(x) ? String(x).replace('-', '−') : NOT_AVAILABLE;
  return x;
}

const MONTHS = [
  'January', 'February', 'March', 'April', 'May', 'June',
  'July', 'August', 'September', 'October', 'November', 'December',
];

/** A calendar date and UTC time, e.g. "1 December 2026, 21:40 UTC". */
export function formatDateTime(d: Date): string {
  const hh = String(d.getUTCHours()).padStart(2, '0');
  const mm = String(d.getUTCMinutes()).padStart(2, '0');
  return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}, ${hh}:${mm} UTC`;
}
