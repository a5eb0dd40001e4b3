import { writeFile } from 'node:fs/promises';
import { methodsText } from '../core/methodsText';
import { plainErrorMessage } from '../core/plainErrorMessage';
import { parsePlanText } from '../io/planFile';
import { methodsMarkdown } from '../report/methodsTextRender';
import { analysePlannedProcedure } from '../sim/analysePlannedProcedure';
import type { MethodsCommandLine } from './methodsCommandLine';
import { readInputFile } from './readInputFile';

/** What `meanward methods` produced: Markdown for stdout (may be empty when written to a file), or problems. */
export type MethodsCommandResult = { ok: true; stdout: string; wrote: string | null } | { ok: false; problems: string[] };

/**
 * `meanward methods plan.json [--format md|docx] [-o FILE]`: the methods text
 * (src/core/methodsText.ts) for the plan, with the figures analysePlannedProcedure
 * gives (the same as `meanward run --no-sim`), as Markdown on stdout or in a
 * file, or as a Word document. Reads, checks and writes only.
 */
export async function runMethodsCommand(cmd: MethodsCommandLine): Promise<MethodsCommandResult> {
  const read = await readInputFile(cmd.file, 'plan');
  if (!read.ok) return { ok: false, problems: [read.problem] };
  const checked = parsePlanText(read.text);
  if (!checked.ok) return { ok: false, problems: checked.problems.map((p) => (p.field === '' ? `${cmd.file}: ${p.message}` : `${cmd.file}: ${p.field}: ${p.message}`)) };
  const plan = checked.plan;
  let text;
  try {
    text = methodsText(plan, analysePlannedProcedure(plan));
  } catch (err) {
    return { ok: false, problems: [`${cmd.file}: ${plainErrorMessage(err, 'The figures for this plan could not be computed.')}`] };
  }
  const markdown = methodsMarkdown(text);
  if (cmd.output === undefined) return { ok: true, stdout: markdown, wrote: null };
  try {
    // The Word writer (the docx package, the CLI's largest part) loads only when a .docx is asked for.
    const docx = cmd.format === 'docx' ? await (await import('./methodsDocx')).methodsDocx(text) : null;
    await writeFile(cmd.output, docx ?? markdown);
  } catch (err) {
    const code = (err as { code?: string } | null)?.code;
    const why = code === 'ENOENT' ? 'its folder does not exist' : code === 'EISDIR' ? 'it is a folder' : code === 'EACCES' || code === 'EPERM' ? 'permission denied' : plainErrorMessage(err, 'the file could not be written');
    return { ok: false, problems: [`Cannot write ${JSON.stringify(cmd.output)}: ${why}.`] };
  }
  return { ok: true, stdout: '', wrote: cmd.output };
}
