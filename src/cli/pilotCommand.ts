import { basename } from 'node:path';
import { estimatePilot } from '../pilot/estimatePilot';
import { parseDelimitedText } from '../pilot/parseDelimitedText';
import { PilotDataError, type PilotEstimates } from '../pilot/types';
import type { PilotCommandLine } from './pilotCommandLine';
import { formatPilotTable, PILOT_NOTE } from './pilotTable';
import { PLANNING_CAUTION } from './formatResultsTable';
import { readInputFile } from './readInputFile';
import { plainErrorMessage } from '../core/plainErrorMessage';

export type PilotCommandResult =
  | { ok: true; estimates: PilotEstimates; output: string }
  | { ok: false; problems: string[]; internal?: boolean };

/**
 * `meanward pilot`: read the file, estimate with src/pilot, and format the
 * table or the JSON. Every figure comes from estimatePilot; this file only
 * reads and formats. Never throws for bad input: problems come back as lines.
 */
export async function runPilotCommand(cmd: PilotCommandLine): Promise<PilotCommandResult> {
  const read = await readInputFile(cmd.file, 'pilot');
  if (!read.ok) return { ok: false, problems: [read.problem] };
  let estimates: PilotEstimates;
  try {
    const table = parseDelimitedText(read.text, { delimiter: cmd.delimiter ?? 'auto', header: cmd.noHeader ? false : 'auto' });
    estimates = estimatePilot(table, cmd.mapping, basename(cmd.file));
  } catch (err) {
    // A PilotDataError is bad input (exit 2); anything else is a fault of ours (exit 1).
    if (err instanceof PilotDataError) return { ok: false, problems: [`${cmd.file}: ${err.message}`] };
    const detail = plainErrorMessage(err, '');
    return {
      ok: false,
      internal: true,
      problems: [`The pilot file could not be read because of a fault in Meanward, not in your file${detail === '' ? '' : ` (${detail})`}. Please report it with the file's layout.`],
    };
  }
  const output = cmd.json
    ? `${JSON.stringify({ ...estimates, note: PILOT_NOTE, caution: PLANNING_CAUTION }, null, 2)}\n`
    : formatPilotTable(estimates);
  return { ok: true, estimates, output };
}
