import { main } from '../../src/cli/main';

/**
 * Run the CLI's main in-process with captured stdout and stderr (no child
 * process), for the CLI tests. `io` adds fields to the streams' host object
 * (e.g. a clock) when a test needs them.
 * @example const { code, stdout } = await runCli(['demo']);
 */
export async function runCli(argv: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  // One worker unless a test asks for --workers, so results never depend on the machine's cores.
  const code = await main(argv, { stdout: { write: (s: string) => (stdout += s) }, stderr: { write: (s: string) => (stderr += s) }, defaultWorkers: 1 });
  return { code, stdout, stderr };
}
