import { describe, expect, it } from 'vitest';
import { parseDelimitedText } from '../../src/pilot/parseDelimitedText';
import { parsePilotNumber } from '../../src/pilot/parsePilotNumber';
import { errorOf } from './errorOf';

// Cell splitting follows RFC 4180 (Shafranovich 2005: fields, double quotes, "" inside quotes);
// the expected tables below are written out by hand from that rule. Checks are exact (text).

describe('parseDelimitedText: delimiter and header', () => {
  it('reads a comma file with a header (RFC 4180 quoting: a comma and "" inside quotes)', () => {
    const t = parseDelimitedText('group,score,note\nA,10,"late, ""ill"""\nB,12,\n');
    expect(t).toEqual({
      columns: ['group', 'score', 'note'],
      rows: [
        ['A', '10', 'late, "ill"'],
        ['B', '12', ''],
      ],
      delimiter: ',',
      hasHeader: true,
      lineNumbers: [2, 3],
      commentLines: 0,
    });
  });
  it('detects tab and semicolon delimiters', () => {
    expect(parseDelimitedText('g\tq1\tq2\nA\t1\t2\nB\t3\t4').delimiter).toBe('\t');
    const semi = parseDelimitedText('g;q1;q2\nA;1,5;2\nB;3;4,25');
    expect(semi.delimiter).toBe(';');
    expect(semi.rows[0]).toEqual(['A', '1,5', '2']);
  });
  it('takes a delimiter given by the caller over the guess', () => {
    const t = parseDelimitedText('a;b,c\n1;2,3\n4;5,6', { delimiter: ';' });
    expect(t.columns).toEqual(['a', 'b,c']);
    expect(t.rows[1]).toEqual(['4', '5,6']);
  });
  it('takes a file without a header when the first row holds numbers, naming columns "column 1", …', () => {
    const t = parseDelimitedText('A,1,2\nB,3,4');
    expect(t.hasHeader).toBe(false);
    expect(t.columns).toEqual(['column 1', 'column 2', 'column 3']);
    expect(t.rows).toEqual([
      ['A', '1', '2'],
      ['B', '3', '4'],
    ]);
    expect(t.lineNumbers).toEqual([1, 2]);
  });
  it('takes a first row with a number as header when another column has a text name above numbers', () => {
    const t = parseDelimitedText('score,2019\n1,2\n3,4');
    expect(t.hasHeader).toBe(true);
    expect(t.columns).toEqual(['score', '2019']);
    // Text over text and numbers over numbers: read as data (the caller can say header: true).
    expect(parseDelimitedText('group,2019\nA,1\nB,3').hasHeader).toBe(false);
  });
  it('honours header: false and header: true from the caller', () => {
    expect(parseDelimitedText('g,s\nA,1', { header: false }).rows).toEqual([
      ['g', 's'],
      ['A', '1'],
    ]);
    expect(parseDelimitedText('A,1\nB,2', { header: true }).columns).toEqual(['A', '1']);
  });
  it('skips a byte-order mark, leading "#" comment lines and blank lines, keeping spreadsheet row numbers', () => {
    const t = parseDelimitedText('\uFEFF# Invented data\n# second comment\ngroup,score\r\nA,1\r\n\r\nB,2\r\n');
    expect(t.commentLines).toBe(2);
    expect(t.columns).toEqual(['group', 'score']);
    expect(t.rows).toEqual([
      ['A', '1'],
      ['B', '2'],
    ]);
    // Rows 1–2 comments, 3 header, 4 A, 5 blank, 6 B.
    expect(t.lineNumbers).toEqual([4, 6]);
  });
  it('pads short rows with empty cells and drops trailing empty columns (trailing delimiters)', () => {
    const t = parseDelimitedText('a,b,c,,\n1,2\n3,4,5,,\n');
    expect(t.columns).toEqual(['a', 'b', 'c']);
    expect(t.rows).toEqual([
      ['1', '2', ''],
      ['3', '4', '5'],
    ]);
  });
  it('names an empty header cell by its position', () => {
    expect(parseDelimitedText('group,,score\nA,x,1').columns).toEqual(['group', 'column 2', 'score']);
  });
  it('gives plain data that survives structured cloning unchanged', () => {
    const t = parseDelimitedText('group,score\nA,1\nB,2');
    expect(structuredClone(t)).toEqual(t);
  });
});

describe('parseDelimitedText: bad files', () => {
  it('empty file', () => {
    const e = errorOf(() => parseDelimitedText(''));
    expect(e.code).toBe('empty-file');
    expect(e.message).toMatch(/The file is empty/);
    expect(errorOf(() => parseDelimitedText(' \n\r\n\t\n')).code).toBe('empty-file');
  });
  it('only comment lines', () => {
    const e = errorOf(() => parseDelimitedText('# nothing here\n'));
    expect(e.code).toBe('empty-file');
    expect(e.message).toMatch(/only 1 comment line/);
  });
  it('a header without data rows', () => {
    const e = errorOf(() => parseDelimitedText('group,score\n\n'));
    expect(e.code).toBe('empty-file');
    expect(e.message).toMatch(/header row \(row 1\) but no data rows/);
  });
  it('binary: NUL bytes (e.g. a workbook), naming where', () => {
    const e = errorOf(() => parseDelimitedText('PK\u0003\u0004\u0000\u0000abc'));
    expect(e.code).toBe('binary-file');
    expect(e.message).toMatch(/NUL bytes \(the first at character 5\)/);
    expect(e.message).toMatch(/CSV/);
  });
  it('binary: mostly control characters or undecodable bytes', () => {
    const junk = Array.from({ length: 200 }, (_, i) => (i % 3 === 0 ? '\uFFFD' : i % 3 === 1 ? '\u0007' : 'a')).join('');
    const e = errorOf(() => parseDelimitedText(junk));
    expect(e.code).toBe('binary-file');
    expect(e.message).toMatch(/67% of its first 200 characters/);
  });
  it('a single column suggests another delimiter, naming the one seen', () => {
    const pipe = errorOf(() => parseDelimitedText('group|score\nA|1\nB|2'));
    expect(pipe.code).toBe('single-column');
    expect(pipe.message).toMatch(/single column/);
    expect(pipe.message).toMatch(/"group\|score"/);
    expect(pipe.message).toMatch(/contains "\|"/);
    const forced = errorOf(() => parseDelimitedText('group;score\nA;1\nB;2', { delimiter: ',' }));
    expect(forced.code).toBe('single-column');
    expect(forced.message).toMatch(/comma \(","\) delimiter you chose/);
    expect(forced.message).toMatch(/semicolon \(";"\): choose that delimiter/);
  });
  it('duplicate headers, naming each and its positions', () => {
    const e = errorOf(() => parseDelimitedText('id,score,group,score,item,item\n1,2,A,3,4,5'));
    expect(e.code).toBe('duplicate-header');
    expect(e.message).toContain('"score" (columns 2 and 4) and "item" (columns 5 and 6)');
    expect(e.column).toBe('score');
    expect(e.row).toBe(1);
  });
  it('a row with more values than columns, naming the row', () => {
    const e = errorOf(() => parseDelimitedText('name,score\nSmith,1\nSmith, J,2\n'));
    expect(e.code).toBe('ragged-row');
    expect(e.row).toBe(3);
    expect(e.message).toMatch(/^Row 3 has 3 values but the header names 2 columns/);
  });
  it('an unclosed quote, naming the row', () => {
    const e = errorOf(() => parseDelimitedText('a,b\n1,2\n"3,4\n5,6\n'));
    expect(e.code).toBe('bad-quotes');
    expect(e.row).toBe(3);
    expect(e.message).toMatch(/^Row 3: a value starts with a double quote/);
  });
});

describe('parsePilotNumber (plain decimal notation; common practice)', () => {
  it('reads signs, decimals and exponents; exact', () => {
    expect(parsePilotNumber(' 12.5 ', false)).toBe(12.5);
    expect(parsePilotNumber('+2', false)).toBe(2);
    expect(parsePilotNumber('-.5', false)).toBe(-0.5);
    expect(parsePilotNumber('1e3', false)).toBe(1000);
    expect(parsePilotNumber('7.', false)).toBe(7);
  });
  it('reads missing-value codes as NaN (missing), in any case', () => {
    for (const m of ['', '  ', 'NA', 'na', 'N/A', 'NULL', 'NaN', '.', '-']) expect(parsePilotNumber(m, false)).toBeNaN();
  });
  it('rejects text, hexadecimal, infinities and sizes beyond 1e15 (undefined = not a number)', () => {
    for (const bad of ['abc', '12a', '0x10', 'Infinity', '1,5', '1 000', '2e400', '1e16']) expect(parsePilotNumber(bad, false)).toBeUndefined();
  });
  it('reads a decimal comma only when asked (semicolon files)', () => {
    expect(parsePilotNumber('3,25', true)).toBe(3.25);
    expect(parsePilotNumber('-,5', true)).toBe(-0.5);
    expect(parsePilotNumber('1,2,3', true)).toBeUndefined();
  });
});
