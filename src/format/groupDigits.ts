/**
 * A whole number with comma thousands separators, "1,234,567" — the same text as
 * `Math.round(n).toLocaleString('en-GB')` for every finite number (negative zero
 * included: "-0"), without loading the locale data (Intl), which costs 10–20 ms
 * the first time in a process and so slows the command line's start.
 * Formatting only; a leaf module (no imports), so src/core may use it too.
 *
 * @param n a finite number (rounded half up to a whole number first, as Math.round does).
 * @returns the digits grouped in threes from the right with ",", a leading "-" when negative.
 * @example groupDigits(1200) // "1,200"; groupDigits(-1234567.4) // "-1,234,567"
 */
export function groupDigits(n: number): string {
  const r = Math.round(n);
  const negative = r < 0 || Object.is(r, -0);
  const digits = plainDigits(Math.abs(r));
  let out = '';
  for (let end = digits.length; end > 0; end -= 3) {
    const start = Math.max(0, end - 3);
    out = out === '' ? digits.slice(start, end) : `${digits.slice(start, end)},${out}`;
  }
  return negative ? `-${out}` : out;
}

/** The shortest round-trip digits of a whole number ≥ 0, written out in full ("1e+21" → "1000000000000000000000"). */
function plainDigits(r: number): string {
  const s = String(r);
  const e = s.indexOf('e+');
  if (e < 0) return s;
  const mantissa = s.slice(0, e).replace('.', '');
  const exponent = Number(s.slice(e + 2));
  return mantissa.padEnd(exponent + 1, '0');
}
