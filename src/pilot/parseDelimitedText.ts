import Papa from 'papaparse';
import { parsePilotNumber } from './parsePilotNumber';
import { type Delimiter, type ParsedTable, type ParseOptions, PilotDataError } from './types';

/** The delimiters the reader knows, with the names messages use. */
const DELIMITER_NAMES: Record<Delimiter, string> = { ',': 'comma (",")', '\t': 'tab', ';': 'semicolon (";")' };
const DELIMITERS: Delimiter[] = [',', '\t', ';'];

/** How much of the file the binary check looks at (characters). */
const SNIFF_LENGTH = 65_536;
/** Share of control characters above which text is taken for a binary file. */
const BINARY_SHARE = 0.05;
/** Data rows the header check looks at. */
const HEADER_SNIFF_ROWS = 100;

/**
 * Read CSV/TSV text into a table of text cells: detect (or take) the
 * delimiter and whether the first row is a header, skip leading comment lines
 * ("# …") and blank lines, and reject files that cannot be a pilot table.
 *
 * Reference: RFC 4180 (Shafranovich 2005), "Common format and MIME type for
 * CSV files": fields separated by a delimiter, optionally in double quotes
 * with "" for a quote inside; parsing by papaparse 5.7, whose guess picks the
 * delimiter giving the most consistent number of fields over the first 10
 * records (here among comma, tab and semicolon). The header check is common
 * practice: the first row is a header when none of its cells is a number, or
 * when a column's first cell is text while at least 90% of the next 100
 * filled cells below it are numbers.
 *
 * Pure and synchronous (no DOM): runs in a Web Worker or in Node. The result
 * is plain data (structured-clone friendly).
 *
 * @param text the file's text (a leading byte-order mark is ignored).
 * @param options delimiter (',', '\t', ';' or 'auto', default 'auto') and
 *   header (true, false or 'auto', default 'auto').
 * @returns columns (header names, or "column 1", "column 2", … without a
 *   header), rows (each padded to the number of columns), the delimiter and
 *   header used, each row's number as a spreadsheet shows it, and the number
 *   of comment lines skipped.
 * @throws PilotDataError with code 'empty-file' (nothing but blank or comment
 *   lines, or a header without data rows), 'binary-file' (NUL bytes or more
 *   than 5% control characters: e.g. a workbook, not text), 'single-column'
 *   (one column: the delimiter is probably another character), 'duplicate-header'
 *   (names each repeated column name and its positions), 'ragged-row' (a row
 *   with more filled cells than there are columns), 'bad-quotes' (a quoted
 *   value that never closes).
 * @example
 *   parseDelimitedText('group,score\nA,10\nB,12\n')
 *   // { columns: ['group', 'score'], rows: [['A', '10'], ['B', '12']], delimiter: ',', hasHeader: true,
 *   //   lineNumbers: [2, 3], commentLines: 0 }
 */
export function parseDelimitedText(text: string, options: ParseOptions = {}): ParsedTable {
  let body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  rejectBinary(body);

  // Leading comment lines ("# Invented data …") are skipped but still count as spreadsheet rows.
  let commentLines = 0;
  for (;;) {
    const m = /^[ \t]*#[^\r\n]*(\r\n|\n|\r|$)/.exec(body);
    if (m === null || m[0].length === 0) break;
    commentLines++;
    body = body.slice(m[0].length);
    if (m[1] === '') break;
  }
  if (body.trim() === '') {
    throw new PilotDataError(
      'empty-file',
      commentLines > 0
        ? `The file holds only ${commentLines} comment line${commentLines === 1 ? '' : 's'} (starting with "#") and no table. A pilot file needs a header row and one row per person.`
        : 'The file is empty. A pilot file needs a header row and one row per person (CSV or TSV text).',
    );
  }

  const wanted = options.delimiter === undefined || options.delimiter === 'auto' ? undefined : options.delimiter;
  const delimiter = wanted ?? guessDelimiter(body);
  const result = Papa.parse<string[]>(body, {
    delimiter,
    header: false,
    dynamicTyping: false,
    skipEmptyLines: false,
    quoteChar: '"',
  });
  const quoteError = result.errors.find((e) => e.type === 'Quotes');
  if (quoteError) {
    const row = commentLines + (quoteError.row ?? 0) + 1;
    throw new PilotDataError(
      'bad-quotes',
      `Row ${row}: a value starts with a double quote (") that is never closed, so the rest of the file would be read as one value. Close the quote, or remove it.`,
      { row },
    );
  }

  // Keep non-blank records with their row number as a spreadsheet shows it.
  const records: string[][] = [];
  const recordRows: number[] = [];
  const data = result.data;
  for (let i = 0; i < data.length; i++) {
    const r = data[i]!;
    if (isBlank(r)) continue;
    records.push(r);
    recordRows.push(commentLines + i + 1);
  }
  if (records.length === 0) throw new PilotDataError('empty-file', 'The file has no rows with values.');

  const decimalComma = delimiter === ';';
  const first = records[0]!;
  const hasHeader =
    options.header === undefined || options.header === 'auto' ? looksLikeHeader(records, decimalComma) : options.header;

  // Width: the header's (or the widest row's), less trailing columns empty everywhere (trailing delimiters).
  let width = hasHeader ? first.length : records.reduce((w, r) => Math.max(w, r.length), 0);
  while (width > 1 && records.every((r) => (r[width - 1] ?? '').trim() === '')) width--;

  if (width < 2) {
    throw new PilotDataError('single-column', singleColumnMessage(first, delimiter, wanted !== undefined));
  }

  const columns: string[] = [];
  if (hasHeader) {
    for (let c = 0; c < width; c++) {
      const name = (first[c] ?? '').trim();
      columns.push(name === '' ? `column ${c + 1}` : name);
    }
    rejectDuplicates(columns, recordRows[0]!);
  } else {
    for (let c = 0; c < width; c++) columns.push(`column ${c + 1}`);
  }

  const start = hasHeader ? 1 : 0;
  if (records.length <= start) {
    throw new PilotDataError('empty-file', `The file has a header row (row ${recordRows[0]}) but no data rows below it.`);
  }
  const rows: string[][] = new Array<string[]>(records.length - start);
  const lineNumbers: number[] = new Array<number>(records.length - start);
  for (let i = start; i < records.length; i++) {
    const r = records[i]!;
    if (r.length > width) {
      for (let c = width; c < r.length; c++) {
        if ((r[c] ?? '').trim() !== '') throw raggedRow(recordRows[i]!, r, width, hasHeader, delimiter);
      }
      r.length = width;
    }
    while (r.length < width) r.push('');
    rows[i - start] = r;
    lineNumbers[i - start] = recordRows[i]!;
  }
  return { columns, rows, delimiter, hasHeader, lineNumbers, commentLines };
}

/** papaparse's delimiter guess over the first records, blank lines skipped (comma when none fits). */
function guessDelimiter(body: string): Delimiter {
  const sniff = Papa.parse<string[]>(body, {
    delimiter: '',
    delimitersToGuess: DELIMITERS,
    skipEmptyLines: 'greedy',
    preview: 20,
  });
  const d = sniff.meta.delimiter;
  return (DELIMITERS as string[]).includes(d) ? (d as Delimiter) : ',';
}

function isBlank(r: string[]): boolean {
  for (const cell of r) if (cell.trim() !== '') return false;
  return true;
}

/** NUL bytes, or many control characters / undecodable bytes: not a text table. */
function rejectBinary(text: string): void {
  const n = Math.min(text.length, SNIFF_LENGTH);
  let odd = 0;
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i);
    if (c === 0) {
      throw new PilotDataError(
        'binary-file',
        `This is not a text file: it contains NUL bytes (the first at character ${i + 1}), as workbooks, archives and images do. Save the sheet as CSV (comma-separated) or TSV (tab-separated) text and choose that file.`,
      );
    }
    if ((c < 32 && c !== 9 && c !== 10 && c !== 13) || c === 127 || c === 0xfffd) odd++;
  }
  if (n > 0 && odd / n > BINARY_SHARE) {
    throw new PilotDataError(
      'binary-file',
      `This does not look like a text file: ${Math.round((100 * odd) / n)}% of its first ${n} characters are control characters or bytes that are not text (more than ${BINARY_SHARE * 100}%). Save the sheet as CSV (comma-separated) or TSV (tab-separated) text and choose that file.`,
    );
  }
}

function looksLikeHeader(records: string[][], decimalComma: boolean): boolean {
  const first = records[0]!;
  const isNumber = (s: string) => {
    const x = parsePilotNumber(s, decimalComma);
    return x !== undefined && !Number.isNaN(x);
  };
  if (!first.some(isNumber)) return true;
  // A column whose first cell is text while the cells below are (nearly all) numbers.
  for (let c = 0; c < first.length; c++) {
    const head = (first[c] ?? '').trim();
    if (head === '' || isNumber(head) || Number.isNaN(parsePilotNumber(head, decimalComma) ?? 0)) continue;
    let filled = 0;
    let numeric = 0;
    for (let i = 1; i < records.length && filled < HEADER_SNIFF_ROWS; i++) {
      const cell = (records[i]![c] ?? '').trim();
      if (cell === '') continue;
      filled++;
      if (isNumber(cell)) numeric++;
    }
    if (filled > 0 && numeric >= 0.9 * filled) return true;
  }
  return false;
}

function rejectDuplicates(columns: string[], headerRow: number): void {
  const seen = new Map<string, number[]>();
  columns.forEach((name, i) => {
    const at = seen.get(name);
    if (at) at.push(i + 1);
    else seen.set(name, [i + 1]);
  });
  const dups = [...seen.entries()].filter(([, at]) => at.length > 1);
  if (dups.length === 0) return;
  const list = dups.map(([name, at]) => `"${name}" (columns ${joinList(at.map(String))})`);
  throw new PilotDataError(
    'duplicate-header',
    `The header row (row ${headerRow}) names ${dups.length === 1 ? 'a column' : 'columns'} more than once: ${joinList(list)}. Give each column its own name so it can be chosen.`,
    { column: dups[0]![0], row: headerRow },
  );
}

function singleColumnMessage(first: string[], delimiter: Delimiter, forced: boolean): string {
  const line = first.join(DELIMITER_NAMES[delimiter] === 'tab' ? '\t' : delimiter);
  const shown = JSON.stringify(line.length > 60 ? `${line.slice(0, 60)}…` : line);
  const how = forced ? `with the ${DELIMITER_NAMES[delimiter]} delimiter you chose` : 'with a comma, tab or semicolon as delimiter';
  const others = DELIMITERS.filter((d) => d !== delimiter && line.includes(d));
  const foreign = ['|', ' '].filter((d) => line.includes(d));
  let hint: string;
  if (others.length > 0) hint = `Its first row contains the ${others.map((d) => DELIMITER_NAMES[d]).join(' and ')}: choose that delimiter.`;
  else if (foreign.length > 0)
    hint = `Its first row contains ${foreign.map((d) => (d === ' ' ? 'spaces' : `"${d}"`)).join(' and ')}, which this reader does not take as a delimiter: save the file with commas, tabs or semicolons between columns.`;
  else hint = 'Check that the columns are separated by commas, tabs or semicolons.';
  return `The file reads as a single column ${how} (first row: ${shown}). A pilot file needs at least a group column and a pretest column. ${hint}`;
}

function raggedRow(row: number, cells: string[], width: number, hasHeader: boolean, delimiter: Delimiter): PilotDataError {
  const filled = cells.length - [...cells].reverse().findIndex((c) => c.trim() !== '');
  return new PilotDataError(
    'ragged-row',
    `Row ${row} has ${filled} values but the ${hasHeader ? 'header names' : 'first rows have'} ${width} columns (delimiter: ${DELIMITER_NAMES[delimiter]}). A value probably contains the delimiter without being in double quotes; put such values in quotes, or choose another delimiter.`,
    { row },
  );
}

function joinList(items: string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}
