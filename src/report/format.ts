/**
 * Number formatting shared by the planner's screens, the PDF summary and the
 * exports, so every place shows the same figure the same way. Formatting only:
 * no statistic is computed here. A value that is not a finite number is shown
 * as "not available" (never "NaN" or "Infinity").
 */

/** What is shown in place of a missing or non-finite figure. */
export const NOT_AVAILABLE = 'not available';

function finite(x: number | null | undefined): x is number {
  return typeof x === 'number' && Number.isFinite(x);
}

/** Fixed decimals with a plain hyphen-minus; "-0.00" is shown as "0.00". */
function fixed(x: number, digits: number): string {
  const s = x.toFixed(digits);
  return /^-0(\.0+)?$/.test(s) ? s.slice(1) : s;
}

/**
 * A quantity in test or posttest points, 2 decimals by default.
 * @example formatPoints(1.2345) === '1.23'; formatPoints(-2.5) === '-2.50'
 */
export function formatPoints(x: number | null | undefined, digits = 2): string {
  return finite(x) ? fixed(x, digits) : NOT_AVAILABLE;
}

/** A signed quantity in points ("+1.25", "-0.40", "0.00"): used for biases and estimates. */
export function formatSignedPoints(x: number | null | undefined, digits = 2): string {
  if (!finite(x)) return NOT_AVAILABLE;
  const s = fixed(x, digits);
  return s.startsWith('-') || Number(s) === 0 ? s : `+${s}`;
}

/** A standardised quantity (SD units, SMD), signed, 2 decimals: "+0.15 SD" without the unit. */
export function formatSD(x: number | null | undefined, digits = 2): string {
  return formatSignedPoints(x, digits);
}

/** A reliability or correlation, 3 decimals: "0.750". */
export function formatReliability(x: number | null | undefined): string {
  return finite(x) ? fixed(x, 3) : NOT_AVAILABLE;
}

/**
 * A probability or rate as a percentage with one decimal ("80.3%"); tiny
 * non-zero values as "<0.1%" and values just short of 1 as ">99.9%", so a
 * rate that is not exactly 0 or 1 never reads as if it were.
 */
export function formatProbability(p: number | null | undefined): string {
  if (!finite(p)) return NOT_AVAILABLE;
  if (p > 0 && p < 0.0005) return '<0.1%';
  if (p < 1 && p > 0.9995) return '>99.9%';
  return `${fixed(p * 100, 1)}%`;
}

/** A share (e.g. bias as a share of the effect, share discarded) as a whole percentage: "38%". */
export function formatShare(s: number | null | undefined): string {
  if (!finite(s)) return NOT_AVAILABLE;
  return `${fixed(s * 100, 0)}%`;
}

/** A count with thousands separators: 1200 → "1,200"; non-integers rounded to 1 decimal. */
export function formatCount(n: number | null | undefined): string {
  if (!finite(n)) return NOT_AVAILABLE;
  const s = Number.isInteger(n) ? String(Math.abs(n)) : fixed(Math.abs(n), 1);
  const [int = '', frac] = s.split('.');
  const grouped = int.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return `${n < 0 ? '-' : ''}${grouped}${frac ? `.${frac}` : ''}`;
}

/** A figure with its Monte Carlo standard error: "+1.23 (MC SE 0.02)". */
export function withMcse(value: string, mcse: number | null | undefined, format: (x: number) => string): string {
  if (!finite(mcse)) return value;
  return `${value} (MC SE ${format(mcse)})`;
}

/** A plain (non-statistical) input value as typed: numbers keep their own digits. */
export function formatInput(x: number | string | boolean | null | undefined): string {
  if (x === null || x === undefined) return NOT_AVAILABLE;
  if (typeof x === 'boolean') return x ? 'yes' : 'no';
  if (typeof x === 'number') return finite(x) ? String(x) : NOT_AVAILABLE;
  return x;
}

/** A calendar date and UTC time, e.g. "1 December 2026, 21:40 UTC". */
export function formatDateTime(d: Date): string {
  const months = [
    'January', 'February', 'March', 'April', 'May', 'June',
    'July', 'August', 'September', 'October', 'November', 'December',
  ];
  const hh = String(d.getUTCHours()).padStart(2, '0');
  const mm = String(d.getUTCMinutes()).padStart(2, '0');
  return `${d.getUTCDate()} ${months[d.getUTCMonth()]} ${d.getUTCFullYear()}, ${hh}:${mm} UTC`;
}
