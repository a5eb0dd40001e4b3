/**
 * The project's number formatting, shared by the planner (src/ui), the PDF
 * (src/report) and the CLI (src/cli). It sits below all three, so layers only
 * point downward: nothing here imports from ui, report or cli.
 *
 * Display formatting only (no statistics): turn numbers from src/core and
 * src/sim into text. Anything that is not a finite number shows as an em dash,
 * so NaN or Infinity never reach the screen.
 */
import { groupDigits } from './groupDigits';

export function fmt(x: number | null | undefined, digits = 2): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  const s = x.toFixed(digits);
  // Avoid "-0.00".
  return /^-0(\.0+)?$/.test(s) ? s.slice(1) : s.replace('-', '−');
}

/** Signed: "+1.25" / "−1.25" / "0.00". */
export function fmtSigned(x: number | null | undefined, digits = 2): string {
  const s = fmt(x, digits);
  if (s === '—' || s.startsWith('−') || Number(s) === 0) return s;
  return `+${s}`;
}

/** A proportion as a percentage: 0.0512 → "5.1%". */
export function fmtPct(x: number | null | undefined, digits = 1): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  return `${fmt(x * 100, digits)}%`;
}

/** A reliability or correlation without the leading zero: 0.75 → ".75". */
export function fmtR(x: number | null | undefined, digits = 2): string {
  const s = fmt(x, digits);
  return s.replace(/^(−?)0\./, '$1.');
}

/** A whole number with thousands separators (the en-GB text, without loading Intl: see groupDigits). */
export function fmtInt(x: number | null | undefined): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  return groupDigits(x);
}

/**
 * An estimated duration in words, rounded for reading: 0.4 → "under 1 s", 42 → "about 42 s",
 * 754 → "about 13 min", 37,000 → "about 10 h 17 min"; with `exact`, no "about" (600 → "10 min").
 * Formatting only (the seconds come from src/sim).
 */
export function fmtDuration(seconds: number | null | undefined, exact = false): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds) || seconds < 0) return '—';
  if (seconds < 1) return 'under 1 s';
  const about = exact ? '' : 'about ';
  if (seconds < 90) return `${about}${Math.round(seconds)} s`;
  const minutes = Math.round(seconds / 60);
  if (minutes < 120) return `${about}${minutes} min`;
  const h = Math.floor(minutes / 60);
  const m = minutes - 60 * h;
  return `${about}${m === 0 ? `${fmtInt(h)} h` : `${fmtInt(h)} h ${m} min`}`;
}
