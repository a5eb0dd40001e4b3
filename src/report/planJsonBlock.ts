/**
 * How the complete plan file is printed in the PDF so the PDF alone can
 * recreate the plan: between two marker lines, with over-long lines cut and
 * each cut marked by CONTINUATION at the end of the piece.
 */
export const PLAN_BEGIN = '----- BEGIN MEANWARD PLAN FILE -----';
export const PLAN_END = '----- END MEANWARD PLAN FILE -----';
/** Marks a line that continues on the next line (join without a line break). */
export const CONTINUATION = '\u21B5';

/**
 * Recover the plan file's text from text copied or extracted from the PDF:
 * take the lines between the markers, and rejoin cut lines.
 * @returns the plan file text, or null when the markers are not found.
 */
export function planTextFromReportText(text: string): string | null {
  const start = text.indexOf(PLAN_BEGIN);
  const end = text.indexOf(PLAN_END, start + 1);
  if (start < 0 || end < 0) return null;
  const body = text.slice(start + PLAN_BEGIN.length, end);
  return body
    .split(/\r?\n/)
    .map((l) => l.replace(/\s+$/, ''))
    .join('\n')
    .replace(new RegExp(`${CONTINUATION}\\n`, 'g'), '')
    .trim();
}
