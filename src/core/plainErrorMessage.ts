import { showControlCharacters } from './visibleText';

/** Words that only a program, never a researcher, should read in a message. */
const PROGRAM_TEXT = /\b(NaN|undefined|Infinity|Matrix|TypeError|RangeError|ReferenceError|Internal fault)\b|\bat \S+ \(|\bis not a function\b|\bCannot read properties\b/;

/**
 * The message of an error caught at a last-resort boundary (the CLI, the
 * planner's evaluation of the draft, opening a link or an autosave), in plain
 * words. Meanward's own messages are sentences a researcher understands
 * (they end with a full stop and name no program internals) and are kept, with
 * control characters escaped; anything else (a library's text such as
 * "Matrix is not symmetric", a TypeError, a message naming NaN) is replaced
 * by `fallback`, so no stack trace or library text ever reaches a researcher.
 *
 * Reference: common practice (translate unexpected failures at the boundary).
 *
 * @param err whatever was thrown.
 * @param fallback the plain sentence to show instead of program text.
 * @returns one line of plain text. @throws never.
 * @example plainErrorMessage(new Error('Matrix is not symmetric'), 'This plan could not be analysed.') // "This plan could not be analysed."
 * @example plainErrorMessage(new Error('Give the pretest an SEM.'), 'x') // "Give the pretest an SEM."
 */
export function plainErrorMessage(err: unknown, fallback: string): string {
  let message = '';
  try {
    message = err instanceof Error ? err.message : typeof err === 'string' ? err : '';
  } catch {
    message = '';
  }
  const firstLine = message.split('\n')[0]!.trim();
  if (firstLine === '' || !/[.!?)]$/.test(firstLine) || !/^[A-Z"'(]/.test(firstLine) || PROGRAM_TEXT.test(firstLine)) return fallback;
  return showControlCharacters(firstLine);
}
