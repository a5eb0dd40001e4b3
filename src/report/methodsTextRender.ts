/**
 * The methods text (src/core/methodsText.ts) as plain text and Markdown, with
 * every figure written by the shared formatters, so the screen, the Markdown
 * and the Word document show the same strings. Formatting only.
 */
import type { MethodsFigure, MethodsParagraph, MethodsText } from '../core/methodsText';
import { formatCount, formatInput, formatPoints, formatProbability, formatReliability, formatShare, formatSignedPoints } from './format';

/** One figure as text, by its kind. */
export function formatMethodsFigure(f: MethodsFigure): string {
  switch (f.kind) {
    case 'points':
      return formatPoints(f.value);
    case 'signed-points':
      return formatSignedPoints(f.value);
    case 'reliability':
      return formatReliability(f.value);
    case 'probability':
      return formatProbability(f.value);
    case 'share':
      return formatShare(f.value);
    case 'count':
      return formatCount(f.value);
    case 'input':
      return formatInput(f.value);
  }
}

/** A paragraph's running text. */
export function methodsParagraphText(p: MethodsParagraph): string {
  return p.pieces
    .map((piece) => (typeof piece === 'string' ? piece : formatMethodsFigure(piece)))
    .join('')
    .replace(/\s+/g, ' ')
    .trim();
}

/** The whole methods text as plain text: paragraphs, the caution, then the references. */
export function methodsPlainText(m: MethodsText): string {
  return [
    ...m.paragraphs.map(methodsParagraphText),
    m.caution,
    'References',
    ...m.references.map((r) => r.entry),
  ].join('\n\n');
}

/** The whole methods text as Markdown (for the CLI and for pasting into a proposal). */
export function methodsMarkdown(m: MethodsText): string {
  const lines: string[] = [`# Methods: ${escapeMarkdown(m.title)}`, ''];
  for (const p of m.paragraphs) lines.push(`**${p.heading}.** ${escapeMarkdown(methodsParagraphText(p))}`, '');
  lines.push(`*${escapeMarkdown(m.caution)}*`, '', '## References', '');
  for (const r of m.references) lines.push(`- ${escapeMarkdown(r.entry)}`);
  return `${lines.join('\n')}\n`;
}

/** Characters that would change Markdown's meaning in user text (labels, titles, notes). */
function escapeMarkdown(s: string): string {
  return s.replace(/([\\`*_[\]#<>|])/g, '\\$1');
}
