/**
 * Cells that mean "no value": empty, or a missing-value code that common
 * statistics and spreadsheet programs write (common practice: NA, N/A, NULL,
 * ".", "-"; compared without regard to case). Kept in one place so the
 * reader, the estimates and the documentation agree.
 */
export const MISSING_CODES: readonly string[] = ['', 'na', 'n/a', 'null', 'nan', '.', '-'];

const MISSING = new Set(MISSING_CODES);

// A plain decimal number: optional sign, digits with an optional decimal point, optional exponent.
const DECIMAL_POINT = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
// The same with a decimal comma (files written with ';' between columns in many European locales).
const DECIMAL_COMMA = /^[+-]?(?:\d+,?\d*|,\d+)(?:[eE][+-]?\d+)?$/;

/** Largest magnitude accepted as a score; beyond it sums of squares could overflow. */
export const LARGEST_SCORE = 1e15;

/** LARGEST_SCORE as messages write it. */
export const LARGEST_SCORE_TEXT = '1,000,000,000,000,000 (10^15)';

/**
 * Read one cell as a number.
 *
 * Reference: common practice (plain decimal notation; a decimal comma in
 * files whose columns are separated by semicolons).
 *
 * @param cell the cell's text (surrounding spaces ignored).
 * @param decimalComma also accept "3,5" for 3.5 (use for ';'-separated files).
 * @returns the number; NaN when the cell is empty or a missing-value code
 *   (MISSING_CODES); undefined when it is neither a number nor missing, or its
 *   size exceeds LARGEST_SCORE. Never throws.
 * @example parsePilotNumber(' 12.5 ', false) // 12.5
 * @example parsePilotNumber('NA', false) // NaN (missing)
 * @example parsePilotNumber('12a', false) // undefined (not a number)
 */
export function parsePilotNumber(cell: string, decimalComma: boolean): number | undefined {
  const s = cell.trim();
  if (s.length <= 4 && MISSING.has(s.toLowerCase())) return Number.NaN;
  let x: number;
  if (DECIMAL_POINT.test(s)) x = Number(s);
  else if (decimalComma && DECIMAL_COMMA.test(s)) x = Number(s.replace(',', '.'));
  else return undefined;
  return Number.isFinite(x) && Math.abs(x) <= LARGEST_SCORE ? x : undefined;
}

/**
 * Whether a cell is a number in plain notation that parsePilotNumber refuses
 * only for its size (beyond LARGEST_SCORE), so the message can state the limit
 * rather than say the cell is not a number.
 * @param cell the cell's text. @param decimalComma as for parsePilotNumber.
 * @returns true for e.g. "2e15" or "1e400"; false otherwise. Never throws.
 * @example pilotNumberBeyondLimit('1000000000000001', false) // true
 */
export function pilotNumberBeyondLimit(cell: string, decimalComma: boolean): boolean {
  const s = cell.trim();
  const text = DECIMAL_POINT.test(s) ? s : decimalComma && DECIMAL_COMMA.test(s) ? s.replace(',', '.') : undefined;
  if (text === undefined) return false;
  const x = Number(text);
  return !(Math.abs(x) <= LARGEST_SCORE);
}
