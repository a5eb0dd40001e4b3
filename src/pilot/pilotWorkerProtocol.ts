/**
 * Messages between the main thread and the pilot-data worker, and the short
 * summary of a read table that the mapping step needs. The rows themselves
 * stay in the worker (or in the in-page reader): the main thread only ever
 * sees column names, a few preview rows, each column's distinct values (for
 * choosing the programme group) and the estimates.
 */
import { parsePilotNumber } from './parsePilotNumber';
import type { Delimiter, ParsedTable, ParseOptions, PilotDataErrorCode, PilotEstimates, PilotMapping } from './types';

/** How many data rows the mapping step previews. */
export const PREVIEW_ROWS = 5;
/** How many distinct values per column are listed (enough for a group column). */
export const DISTINCT_LIMIT = 20;

/** What the mapping step knows about one column. */
export interface ColumnFacts {
  name: string;
  /** Distinct non-empty cells in file order, at most DISTINCT_LIMIT. */
  distinct: string[];
  /** True when the column has more distinct values than listed. */
  moreDistinct: boolean;
  /** True when every cell is a number or a missing-value code, and at least one is a number (used only to offer choices). */
  looksNumeric: boolean;
}

/** A read table, as the main thread sees it (no rows beyond the preview). */
export interface PilotTableSummary {
  fileName: string;
  columns: ColumnFacts[];
  rowCount: number;
  delimiter: Delimiter;
  hasHeader: boolean;
  commentLines: number;
  /** The first PREVIEW_ROWS data rows, as text. */
  preview: string[][];
}

/** A PilotDataError or other failure, as plain data (errors lose their class in postMessage). */
export interface PilotErrorData {
  name: string;
  message: string;
  code?: PilotDataErrorCode;
  column?: string;
  row?: number;
}

/** Messages the main thread sends to the pilot worker. */
export type ToPilotWorker =
  /** Read a file (a Blob, read in the worker, or text) and keep its table for later estimates. */
  | { type: 'read'; requestId: number; file: Blob | string; fileName: string; options: ParseOptions }
  /** Estimate from the kept table with this mapping. */
  | { type: 'estimate'; requestId: number; mapping: PilotMapping }
  /** Drop the kept table (the panel was cleared). */
  | { type: 'forget' };

/** Messages the worker sends back; each answers the request with the same id. */
export type FromPilotWorker =
  | { type: 'read'; requestId: number; summary: PilotTableSummary }
  | { type: 'estimates'; requestId: number; estimates: PilotEstimates }
  | { type: 'error'; requestId: number; error: PilotErrorData };


/**
 * The summary the mapping step needs: column names, distinct values (capped)
 * and a preview. Message shaping only: no statistic is computed here.
 * @param table a table from parseDelimitedText.
 * @param fileName the file's name as the user picked it.
 */
export function summariseTableForMapping(table: ParsedTable, fileName: string): PilotTableSummary {
  const columns: ColumnFacts[] = table.columns.map((name) => ({ name, distinct: [], moreDistinct: false, looksNumeric: true }));
  const seen = table.columns.map(() => new Set<string>());
  const anyNumber = table.columns.map(() => false);
  const decimalComma = table.delimiter === ';';
  for (const row of table.rows) {
    for (let c = 0; c < columns.length; c++) {
      const cell = (row[c] ?? '').trim();
      if (cell === '') continue;
      const facts = columns[c]!;
      if (facts.looksNumeric) {
        const x = parsePilotNumber(cell, decimalComma);
        if (x === undefined) facts.looksNumeric = false;
        else if (!Number.isNaN(x)) anyNumber[c] = true;
      }
      const set = seen[c]!;
      if (set.has(cell)) continue;
      if (set.size < DISTINCT_LIMIT) {
        set.add(cell);
        facts.distinct.push(cell);
      } else {
        facts.moreDistinct = true;
      }
    }
  }
  columns.forEach((f, c) => {
    if (!anyNumber[c]) f.looksNumeric = false;
  });
  return {
    fileName,
    columns,
    rowCount: table.rows.length,
    delimiter: table.delimiter,
    hasHeader: table.hasHeader,
    commentLines: table.commentLines ?? 0,
    preview: table.rows.slice(0, PREVIEW_ROWS).map((r) => [...r]),
  };
}

/** A thrown value as plain data for postMessage (keeps a PilotDataError's code, column and row). */
export function errorToData(err: unknown): PilotErrorData {
  if (err instanceof Error) {
    const e = err as Error & { code?: PilotDataErrorCode; column?: string; row?: number };
    const out: PilotErrorData = { name: e.name, message: e.message };
    if (e.code !== undefined) out.code = e.code;
    if (e.column !== undefined) out.column = e.column;
    if (e.row !== undefined) out.row = e.row;
    return out;
  }
  return { name: 'Error', message: String(err) };
}

/** The pure functions the handler calls (from src/pilot), injected so tests and the in-page reader share it. */
export interface PilotFunctions {
  parseDelimitedText(text: string, options: ParseOptions): ParsedTable;
  estimatePilot(table: ParsedTable, mapping: PilotMapping, fileName?: string): PilotEstimates;
}

/**
 * The pilot worker's whole job, as a function of one message: keep the
 * table of the latest file read, estimate from it on request, and turn any
 * failure into an 'error' reply. Returns the reply, or null when there is
 * none ('forget', or a read overtaken by a newer read).
 */
export function createPilotRequestHandler(fns: PilotFunctions): (msg: ToPilotWorker) => Promise<FromPilotWorker | null> {
  let table: ParsedTable | null = null;
  let fileName = '';
  let latestRead = 0;
  return async (msg) => {
    if (msg.type === 'forget') {
      table = null;
      fileName = '';
      latestRead++;
      return null;
    }
    try {
      if (msg.type === 'read') {
        const mine = ++latestRead;
        table = null;
        const text = typeof msg.file === 'string' ? msg.file : await msg.file.text();
        // A newer file was chosen while this one was being read: keep only the newer.
        if (mine !== latestRead) return null;
        const parsed = fns.parseDelimitedText(text, msg.options);
        table = parsed;
        fileName = msg.fileName;
        return { type: 'read', requestId: msg.requestId, summary: summariseTableForMapping(parsed, msg.fileName) };
      }
      if (!table) throw new Error('No pilot file is open: choose a file first.');
      return { type: 'estimates', requestId: msg.requestId, estimates: fns.estimatePilot(table, msg.mapping, fileName) };
    } catch (err) {
      return { type: 'error', requestId: msg.requestId, error: errorToData(err) };
    }
  };
}
