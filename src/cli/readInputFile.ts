import { readFile } from 'node:fs/promises';

/** A file named on the command line, read as UTF-8 text, or one line saying why it could not be read. */
export type InputFileRead = { ok: true; text: string } | { ok: false; problem: string };

/**
 * Read a file named on the command line (a plan or a pilot data file) as
 * UTF-8 text. Never throws: a missing file, a folder or a permission problem
 * comes back as one plain line naming the file, e.g.
 * `Cannot read the plan file "plan.json": there is no such file.`
 *
 * @param file the path as the user typed it.
 * @param kind which file it is, for the message ("plan" or "pilot").
 */
export async function readInputFile(file: string, kind: 'plan' | 'pilot'): Promise<InputFileRead> {
  try {
    return { ok: true, text: await readFile(file, 'utf8') };
  } catch (err) {
    return { ok: false, problem: `Cannot read the ${kind} file ${JSON.stringify(file)}: ${readFailure(err)}.` };
  }
}

/** Plain words for a failed read (the common Node error codes), else the error's own message. */
function readFailure(err: unknown): string {
  const code = (err as { code?: string } | null)?.code;
  if (code === 'ENOENT') return 'there is no such file';
  if (code === 'EISDIR') return 'it is a folder, not a file';
  if (code === 'EACCES' || code === 'EPERM') return 'permission denied';
  return err instanceof Error ? err.message : String(err);
}
