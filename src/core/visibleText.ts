/**
 * Characters that a terminal or a page would act on or hide rather than show:
 * the C0 controls (U+0000–U+001F: NUL, BEL, BS, TAB, LF, CR, ESC, …), DEL
 * (U+007F), the C1 controls (U+0080–U+009F, which include a one-character
 * "control sequence introducer"), the line and paragraph separators
 * (U+2028, U+2029), the invisible direction marks and overrides (U+200E,
 * U+200F, U+202A–U+202E, U+2066–U+2069) and the byte-order mark (U+FEFF).
 */
export const CONTROL_CHARACTERS = /[\u0000-\u001f\u007f-\u009f\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069\ufeff]/g;

/**
 * User text with every control or invisible formatting character shown as an
 * escape, so that text from a plan or a pilot file (a title, a group label, a
 * covariate or column name) can never move the cursor, ring the bell, clear
 * the screen or reorder a line when it is printed or quoted in a message.
 * The one function every place that echoes user text uses (the CLI, and the
 * messages built in src/core and src/pilot).
 *
 * Reference: common practice (show untrusted text with control characters
 * escaped, as terminals' own tools do).
 *
 * @param text any string.
 * @param notation "x" (default): "\x1b" for characters up to U+00FF and
 *   "\u202e" above, for people; "json": "\u001b" for every one, which is also
 *   a valid escape inside a JSON string (use it on JSON text).
 * @returns the text with those characters escaped; other text unchanged.
 * @throws never.
 * @example showControlCharacters('Reading\u001b[2J club') // "Reading\\x1b[2J club"
 * @example showControlCharacters('"a\u009bb"', 'json') // '"a\\u009bb"'
 */
export function showControlCharacters(text: string, notation: 'x' | 'json' = 'x'): string {
  return text.replace(CONTROL_CHARACTERS, (ch) => {
    const code = ch.charCodeAt(0);
    if (notation === 'json' && code < 0x20) return ch;
    if (notation === 'x' && code <= 0xff) return `\\x${code.toString(16).padStart(2, '0')}`;
    return `\\u${code.toString(16).padStart(4, '0')}`;
  });
}
