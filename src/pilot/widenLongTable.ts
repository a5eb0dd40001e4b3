import { formatScore } from './formatPilotNumber';
import { parsePilotNumber } from './parsePilotNumber';
import { type LongLayout, type ParsedTable, PilotDataError, type PilotMapping } from './types';

/** A long file turned into one row per person, the mapping that reads it, and a note on how. */
export interface WidenedTable {
  table: ParsedTable;
  mapping: PilotMapping;
  /** Plain words: rows in the file, people, rows not used and why. */
  note: string;
  counts: { rows: number; people: number };
}

/**
 * Turn a long file (one row per person per occasion) into one row per person,
 * so the rest of the estimating reads it as usual. A person is the set of rows
 * sharing the `id` value; the occasion column says which measurement a row
 * holds. The pretest cells (total or items) are copied from the person's row
 * at the pretest occasion; the retest and posttest become one column each:
 * the same score at those occasions (the total column's cell, or the items'
 * sum or mean after reversing the reverse-keyed items, as for the pretest).
 * Each person's row keeps the file's line number of their pretest row (or
 * their first row), so messages still name a row as a spreadsheet shows it.
 *
 * Refused with a message ('long-layout'): an occasion not found (the values
 * found are listed), two occasions mapped to the same value, a person with
 * two rows for one occasion or two different group labels (rows named), and
 * retest/posttest columns mapped as well as occasions.
 *
 * @param table the long table as read (cells as text).
 * @param mapping a mapping with `layout.kind === 'long'`.
 * @returns the wide table, the wide mapping (no layout; retest and posttest
 *   name the new columns), a note and the counts.
 */
export function widenLongTable(table: ParsedTable, mapping: PilotMapping): WidenedTable {
  const layout = mapping.layout as LongLayout;
  const lineOf = (i: number): number => table.lineNumbers?.[i] ?? i + 1 + (table.hasHeader ? 1 : 0) + (table.commentLines ?? 0);
  if ((mapping.retest ?? '') !== '' || (mapping.posttest ?? '') !== '') {
    throw new PilotDataError(
      'bad-mapping',
      'In a long file the retest and posttest are occasions (values of the occasion column), not columns: choose their occasions and leave the retest and posttest columns empty.',
    );
  }
  const index = (name: string, role: string): number => {
    if (typeof name !== 'string' || name.trim() === '') throw new PilotDataError('bad-mapping', `Choose the ${role} column of the long file; none was given.`);
    const i = table.columns.indexOf(name);
    if (i < 0) {
      const shown = table.columns.slice(0, 30).map((c) => `"${c}"`).join(', ');
      throw new PilotDataError('missing-column', `The ${role} column "${name}" is not in the file. Its columns are ${shown}${table.columns.length > 30 ? ' and more' : ''}.`, {
        column: name,
      });
    }
    return i;
  };
  const idCol = index(layout.id, 'person id');
  const occCol = index(layout.occasion, 'occasion');
  const groupCol = index(mapping.group, 'group');
  const p = mapping.pretest;
  const sourceNames = p.kind === 'total' ? [p.column] : p.kind === 'items' ? p.columns : [];
  const sourceCols = sourceNames.map((c) => index(c, p.kind === 'total' ? 'pretest' : 'item'));
  for (const [name, role] of [
    [layout.id, 'the person id'],
    [layout.occasion, 'the occasion'],
  ] as const) {
    if (name === mapping.group || sourceNames.includes(name) || (role === 'the occasion' && name === layout.id)) {
      throw new PilotDataError('bad-mapping', `The column "${name}" is mapped as ${role} and as another role; each column can have one role only.`, { column: name });
    }
  }

  // Which occasions are wanted, and which values the file has.
  const wanted: Array<[role: 'pretest' | 'retest' | 'posttest', value: string]> = [['pretest', (layout.pretestOccasion ?? '').trim()]];
  if ((layout.retestOccasion ?? '').trim() !== '') wanted.push(['retest', layout.retestOccasion!.trim()]);
  if ((layout.posttestOccasion ?? '').trim() !== '') wanted.push(['posttest', layout.posttestOccasion!.trim()]);
  const found = new Map<string, number>();
  for (const row of table.rows) {
    const v = (row[occCol] ?? '').trim();
    if (v !== '') found.set(v, (found.get(v) ?? 0) + 1);
  }
  const foundList = () =>
    [...found.entries()]
      .slice(0, 10)
      .map(([v, r]) => `"${v}" (${r} row${r === 1 ? '' : 's'})`)
      .join(', ') + (found.size > 10 ? ` and ${found.size - 10} more` : '');
  for (const [role, value] of wanted) {
    if (value === '') throw new PilotDataError('bad-mapping', `Choose which value of the occasion column "${layout.occasion}" marks the pretest.`, { column: layout.occasion });
    if (!found.has(value)) {
      throw new PilotDataError(
        'long-layout',
        `The ${role} occasion "${value}" does not occur in the occasion column "${layout.occasion}". The values found are ${found.size === 0 ? 'none (the column is empty)' : foundList()}.`,
        { column: layout.occasion },
      );
    }
  }
  const roleOf = new Map<string, 'pretest' | 'retest' | 'posttest'>();
  for (const [role, value] of wanted) {
    const before = roleOf.get(value);
    if (before !== undefined) {
      throw new PilotDataError('long-layout', `The occasion "${value}" is chosen for both the ${before} and the ${role}; each occasion can mark one measurement only.`, {
        column: layout.occasion,
      });
    }
    roleOf.set(value, role);
  }

  // Gather each person's rows.
  interface Person {
    group: string;
    groupRow: number;
    rows: Partial<Record<'pretest' | 'retest' | 'posttest', number>>;
    first: number;
  }
  const people = new Map<string, Person>();
  let noId = 0;
  let otherOccasion = 0;
  table.rows.forEach((row, i) => {
    const id = (row[idCol] ?? '').trim();
    if (id === '') {
      noId++;
      return;
    }
    let person = people.get(id);
    if (!person) {
      person = { group: '', groupRow: -1, rows: {}, first: i };
      people.set(id, person);
    }
    const label = (row[groupCol] ?? '').trim();
    if (label !== '') {
      if (person.group === '') {
        person.group = label;
        person.groupRow = i;
      } else if (person.group !== label) {
        throw new PilotDataError(
          'long-layout',
          `Person "${id}" has the group "${person.group}" in row ${lineOf(person.groupRow)} but "${label}" in row ${lineOf(i)}: a person's rows must all be in one group.`,
          { column: mapping.group, row: lineOf(i) },
        );
      }
    }
    const role = roleOf.get((row[occCol] ?? '').trim());
    if (role === undefined) {
      otherOccasion++;
      return;
    }
    const before = person.rows[role];
    if (before !== undefined) {
      throw new PilotDataError(
        'long-layout',
        `Person "${id}" has two rows for the ${role} occasion "${(row[occCol] ?? '').trim()}": rows ${lineOf(before)} and ${lineOf(i)}. Keep one row per person per occasion.`,
        { column: layout.id, row: lineOf(i) },
      );
    }
    person.rows[role] = i;
  });

  // One score per person at the retest and posttest occasions (total cell, or the items combined).
  const decimalComma = table.delimiter === ';';
  const reverse = p.kind === 'items' ? p.reverse : undefined;
  const scoreAt = (i: number | undefined): string => {
    if (i === undefined) return '';
    const row = table.rows[i]!;
    if (p.kind === 'total') return row[sourceCols[0]!] ?? '';
    let s = 0;
    for (let j = 0; j < sourceCols.length; j++) {
      const cell = row[sourceCols[j]!] ?? '';
      let x = parsePilotNumber(cell, decimalComma);
      if (x === undefined) {
        throw new PilotDataError('non-numeric', `Column "${sourceNames[j]}" must hold numbers, but row ${lineOf(i)} holds ${JSON.stringify(cell.trim().slice(0, 40))}. Leave a cell empty (or write NA) where a value is missing.`, {
          column: sourceNames[j]!,
          row: lineOf(i),
        });
      }
      if (Number.isNaN(x)) return '';
      if (reverse?.columns.includes(sourceNames[j]!)) {
        if (x < reverse.minimum || x > reverse.maximum) {
          throw new PilotDataError(
            'out-of-scale',
            `Item "${sourceNames[j]}" is to be reversed on the scale ${formatScore(reverse.minimum)} to ${formatScore(reverse.maximum)}, but row ${lineOf(i)} holds ${formatScore(x)}, outside that scale. Check the scale's lowest and highest possible scores, or the cell.`,
            { column: sourceNames[j]!, row: lineOf(i) },
          );
        }
        x = reverse.maximum + reverse.minimum - x;
      }
      s += x;
    }
    return String(p.kind === 'items' && p.combine === 'mean' ? s / sourceCols.length : s);
  };

  const retestName = uniqueName(`retest (occasion "${layout.retestOccasion?.trim() ?? ''}")`, table.columns);
  const posttestName = uniqueName(`posttest (occasion "${layout.posttestOccasion?.trim() ?? ''}")`, table.columns);
  const hasRetest = roleOf.has(layout.retestOccasion?.trim() ?? '\u0000');
  const hasPosttest = roleOf.has(layout.posttestOccasion?.trim() ?? '\u0000');
  const columns = [mapping.group, ...sourceNames, ...(hasRetest ? [retestName] : []), ...(hasPosttest ? [posttestName] : [])];
  const rows: string[][] = [];
  const lineNumbers: number[] = [];
  for (const person of people.values()) {
    const pre = person.rows.pretest;
    const cells = [person.group, ...sourceCols.map((c) => (pre === undefined ? '' : (table.rows[pre]![c] ?? '')))];
    if (hasRetest) cells.push(scoreAt(person.rows.retest));
    if (hasPosttest) cells.push(scoreAt(person.rows.posttest));
    rows.push(cells);
    lineNumbers.push(lineOf(pre ?? person.first));
  }
  if (rows.length === 0) {
    throw new PilotDataError('long-layout', `The person id column "${layout.id}" is empty in every row, so no rows can be gathered into people.`, { column: layout.id });
  }
  const { layout: _long, retest: _r, posttest: _p, ...rest } = mapping;
  const wideMapping: PilotMapping = {
    ...rest,
    ...(hasRetest ? { retest: retestName } : {}),
    ...(hasPosttest ? { posttest: posttestName } : {}),
  };
  const left: string[] = [];
  if (noId > 0) left.push(`${noId} without a person id`);
  if (otherOccasion > 0) left.push(`${otherOccasion} at an occasion not chosen`);
  const note =
    `Long file: ${table.rows.length} rows gathered into ${people.size} people by "${layout.id}" (one row per person per occasion in "${layout.occasion}")` +
    (left.length > 0 ? `; ${left.join(' and ')} not used.` : '.') +
    ' The counts below are people.';
  return {
    table: { columns, rows, delimiter: table.delimiter, hasHeader: true, lineNumbers, commentLines: 0 },
    mapping: wideMapping,
    note,
    counts: { rows: table.rows.length, people: people.size },
  };
}

function uniqueName(name: string, taken: readonly string[]): string {
  let out = name;
  while (taken.includes(out)) out = `${out}′`;
  return out;
}
