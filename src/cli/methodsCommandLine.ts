import { eachArgument } from './flagParts';

/** What `meanward methods …` asked for, after checking every flag. */
export interface MethodsCommandLine {
  command: 'methods';
  file: string;
  /** 'md' (Markdown, the default) or 'docx' (a Word document; needs an output file). */
  format: 'md' | 'docx';
  /** -o / --output FILE; Markdown goes to stdout when absent. */
  output?: string;
}

export const METHODS_USAGE = 'meanward methods <plan.json> [--format md|docx] [-o FILE]';

/**
 * Read the arguments after "meanward methods": a plan file, `--format md|docx`
 * and `-o FILE` (required with docx). Reports every problem at once.
 */
export function parseMethodsCommandLine(rest: readonly string[]): { ok: true; value: MethodsCommandLine } | { ok: false; problems: string[] } {
  const problems: string[] = [];
  const files: string[] = [];
  let format: 'md' | 'docx' = 'md';
  let output: string | undefined;
  for (const { word: a, flag, inline, takeValue } of eachArgument(rest, '-')) {
    if (flag === '--format') {
      const v = takeValue();
      if (v === 'md' || v === 'markdown') format = 'md';
      else if (v === 'docx') format = 'docx';
      else problems.push(`--format must be "md" (Markdown) or "docx" (Word); got ${v === undefined ? 'nothing' : JSON.stringify(v)}.`);
    } else if (flag === '-o' || flag === '--output') {
      const v = takeValue();
      if (v === undefined || v.trim() === '') problems.push(`${flag} needs a file name, e.g. "-o methods.docx".`);
      else output = v;
    } else if (a.startsWith('-') && a !== '-') {
      problems.push(`Unknown option ${JSON.stringify(a)}. "meanward methods" takes --format md|docx and -o FILE.`);
    } else files.push(a);
  }
  if (files.length === 0) problems.push('"meanward methods" needs a plan file, e.g. "meanward methods plan.json".');
  if (files.length > 1) problems.push(`"meanward methods" takes one plan file; got ${files.length}: ${files.map((f) => JSON.stringify(f)).join(', ')}.`);
  if (format === 'docx' && output === undefined && problems.length === 0) {
    problems.push('A Word document cannot be printed to the terminal: add -o FILE, e.g. "meanward methods plan.json --format docx -o methods.docx".');
  }
  if (problems.length > 0) return { ok: false, problems };
  return { ok: true, value: { command: 'methods', file: files[0]!, format, ...(output !== undefined ? { output } : {}) } };
}
