/**
 * A coefficient as researchers write it in notes and warnings: two decimals,
 * no leading zero, a true minus sign (".81", "−.21", "1.00"). Formatting only.
 * @param x a finite number.
 * @param decimals decimals shown (default 2).
 * @example formatCoefficient(0.8123) // ".81"
 */
export function formatCoefficient(x: number, decimals = 2): string {
  const s = Math.abs(x).toFixed(decimals).replace(/^0\./, '.');
  const zero = Number(s.replace(/^\./, '0.')) === 0;
  return x < 0 && !zero ? `−${s}` : s;
}

/**
 * A score or SD in messages and notes: up to 2 decimals, trailing zeros dropped.
 * @example formatScore(12.5) // "12.5"
 */
export function formatScore(x: number): string {
  const s = x.toFixed(2).replace(/\.?0+$/, '');
  return s === '-0' ? '0' : s.replace(/^-/, '−');
}
