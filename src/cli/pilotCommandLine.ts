import type { Delimiter, PilotMapping } from '../pilot/types';
import { flagParts } from './flagParts';

/** What `meanward pilot …` asked for, after checking every flag. */
export interface PilotCommandLine {
  command: 'pilot';
  file: string;
  mapping: PilotMapping;
  /** --delimiter; detected when absent. */
  delimiter?: Delimiter;
  /** --no-header: the first row is data (columns are then "column 1", "column 2", …). */
  noHeader: boolean;
  json: boolean;
}

export const PILOT_USAGE =
  'meanward pilot <file.csv> --group COLUMN --programme VALUE (--pretest COLUMN | --items COL,COL,...) [--combine sum|mean] [--reverse COL,COL,... --scale MIN-MAX] [--retest COLUMN] [--posttest COLUMN] [--id COLUMN --occasion COLUMN --pre VALUE [--re VALUE] [--post VALUE]] [--delimiter ,|tab|;] [--no-header] [--json]';

const DELIMITER_WORDS: Record<string, Delimiter> = {
  ',': ',',
  comma: ',',
  tab: '\t',
  '\t': '\t',
  '\\t': '\t',
  ';': ';',
  semicolon: ';',
};

/**
 * Read the arguments after "meanward pilot". Reports every problem at once.
 * Column names are taken as typed (spaces inside quotes are fine); --items
 * splits on commas.
 */
export function parsePilotCommandLine(rest: readonly string[]): { ok: true; value: PilotCommandLine } | { ok: false; problems: string[] } {
  const problems: string[] = [];
  const files: string[] = [];
  const seen = new Set<string>();
  let group: string | undefined;
  let programme: string | undefined;
  let pretest: string | undefined;
  let items: string[] | undefined;
  let combine: 'sum' | 'mean' | undefined;
  let retest: string | undefined;
  let posttest: string | undefined;
  let delimiter: Delimiter | undefined;
  let reverse: string[] | undefined;
  let scale: { minimum: number; maximum: number } | undefined;
  let id: string | undefined;
  let occasion: string | undefined;
  let preOccasion: string | undefined;
  let reOccasion: string | undefined;
  let postOccasion: string | undefined;
  let noHeader = false;
  let json = false;
  for (let i = 0; i < rest.length; i++) {
    const a = rest[i]!;
    const { flag, inline } = flagParts(a);
    const takeValue = (what: string): string | undefined => {
      let v = inline;
      if (v === undefined) {
        const next = rest[i + 1];
        if (next !== undefined && !next.startsWith('--')) {
          v = next;
          i++;
        }
      }
      if (v === undefined || v.trim() === '') {
        problems.push(`${flag} needs ${what}, e.g. "${flag} ${example(flag)}"; got nothing.`);
        return undefined;
      }
      if (seen.has(flag)) problems.push(`${flag} is given more than once; give it once.`);
      seen.add(flag);
      return v;
    };
    switch (flag) {
      case '--json':
        json = true;
        break;
      case '--no-header':
        noHeader = true;
        break;
      case '--group':
        group = takeValue('the name of the group column');
        break;
      case '--programme':
      case '--program':
        programme = takeValue('the value that marks the programme group');
        break;
      case '--pretest':
        pretest = takeValue('the name of the pretest (total score) column');
        break;
      case '--items': {
        const v = takeValue('the item columns, separated by commas');
        if (v !== undefined) items = v.split(',').map((s) => s.trim());
        if (items?.some((s) => s === '')) problems.push(`--items has an empty column name in ${JSON.stringify(v)}; separate names by single commas.`);
        break;
      }
      case '--combine': {
        const v = takeValue('"sum" or "mean"');
        if (v === 'sum' || v === 'mean') combine = v;
        else if (v !== undefined) problems.push(`--combine (how items make the pretest score) must be "sum" or "mean"; got ${JSON.stringify(v)}.`);
        break;
      }
      case '--reverse': {
        const v = takeValue('the reverse-keyed item columns, separated by commas');
        if (v !== undefined) reverse = v.split(',').map((x) => x.trim());
        if (reverse?.some((x) => x === '')) problems.push(`--reverse has an empty column name in ${JSON.stringify(v)}; separate names by single commas.`);
        break;
      }
      case '--scale': {
        const v = takeValue("the items' lowest and highest possible scores");
        if (v === undefined) break;
        const m = /^\s*(-?\d+(?:\.\d+)?)\s*(?:-|–|to|,|:)\s*(-?\d+(?:\.\d+)?)\s*$/.exec(v);
        if (!m) problems.push(`--scale must be the lowest and highest possible item scores, e.g. "--scale 1-6"; got ${JSON.stringify(v)}.`);
        else if (!(Number(m[1]) < Number(m[2]))) problems.push(`--scale: the lowest possible score (${m[1]}) must be below the highest (${m[2]}), e.g. "--scale 1-6"; got ${JSON.stringify(v)}.`);
        else scale = { minimum: Number(m[1]), maximum: Number(m[2]) };
        break;
      }
      case '--id':
        id = takeValue('the name of the column that identifies each person (long files)');
        break;
      case '--occasion':
        occasion = takeValue('the name of the column that says which occasion a row holds (long files)');
        break;
      case '--pre':
        preOccasion = takeValue('the value of the occasion column that marks the pretest');
        break;
      case '--re':
        reOccasion = takeValue('the value of the occasion column that marks the retest');
        break;
      case '--post':
        postOccasion = takeValue('the value of the occasion column that marks the posttest');
        break;
      case '--retest':
        retest = takeValue('the name of the retest column');
        break;
      case '--posttest':
        posttest = takeValue('the name of the posttest column');
        break;
      case '--delimiter': {
        const v = takeValue('",", "tab" or ";"');
        if (v === undefined) break;
        const d = DELIMITER_WORDS[v.toLowerCase()];
        if (d === undefined) problems.push(`--delimiter must be "," (comma), "tab" or ";" (semicolon); got ${JSON.stringify(v)}.`);
        else delimiter = d;
        break;
      }
      default:
        if (a.startsWith('-') && a !== '-') {
          problems.push(
            `Unknown option ${JSON.stringify(a)}. "meanward pilot" takes --group, --programme, --pretest or --items, --combine, --reverse with --scale, --retest, --posttest, --id, --occasion, --pre, --re, --post, --delimiter, --no-header and --json.`,
          );
        } else files.push(a);
    }
  }
  if (files.length === 0) problems.push('"meanward pilot" needs a pilot file, e.g. "meanward pilot cohort.csv --group group --programme support --items q1,q2,q3".');
  if (files.length > 1) problems.push(`"meanward pilot" takes one file; got ${files.length}: ${files.map((f) => JSON.stringify(f)).join(', ')}.`);
  if (group === undefined && !seen.has('--group')) problems.push('--group COLUMN is required: the column that says which group each row is in.');
  if (programme === undefined && !seen.has('--programme') && !seen.has('--program')) {
    problems.push('--programme VALUE is required: the value of the group column that marks the programme group.');
  }
  if (pretest !== undefined && items !== undefined) problems.push('Give the pretest either as --pretest COLUMN (a total score) or as --items COL,COL,...; not both.');
  if (pretest === undefined && items === undefined && !seen.has('--pretest') && !seen.has('--items')) {
    problems.push('The pretest is required: --pretest COLUMN (a total score) or --items COL,COL,... (item scores).');
  }
  if (combine !== undefined && items === undefined) problems.push('--combine applies to --items only.');
  if (reverse !== undefined && items === undefined) problems.push('--reverse applies to --items only: name reverse-keyed items among the --items columns.');
  if (reverse !== undefined && items !== undefined) {
    const notItems = reverse.filter((c) => !items!.includes(c));
    if (notItems.length > 0) problems.push(`--reverse names ${notItems.map((c) => JSON.stringify(c)).join(', ')}, not among the --items columns (${items.join(', ')}).`);
  }
  if (reverse !== undefined && scale === undefined && !seen.has('--scale')) problems.push('--reverse needs --scale MIN-MAX, the lowest and highest possible item scores (e.g. --scale 1-6): a reversed score is MAX + MIN − score.');
  if (scale !== undefined && reverse === undefined) problems.push('--scale is used to reverse items: give --reverse COL,COL,... too.');
  const long = id !== undefined || occasion !== undefined || preOccasion !== undefined || reOccasion !== undefined || postOccasion !== undefined;
  if (long) {
    if (id === undefined && !seen.has('--id')) problems.push('A long file (one row per person per occasion) needs --id COLUMN, the column that identifies each person.');
    if (occasion === undefined && !seen.has('--occasion')) problems.push('A long file needs --occasion COLUMN, the column that says which occasion each row holds.');
    if (preOccasion === undefined && !seen.has('--pre')) problems.push('A long file needs --pre VALUE, the value of the occasion column that marks the pretest.');
    if (retest !== undefined || posttest !== undefined) problems.push('In a long file the retest and posttest are occasions: use --re VALUE and --post VALUE instead of --retest and --posttest.');
  }
  if (problems.length > 0) return { ok: false, problems };
  const mapping: PilotMapping = {
    group: group!,
    programmeValue: programme!,
    pretest:
      items !== undefined
        ? { kind: 'items', columns: items, combine: combine ?? 'sum', ...(reverse !== undefined && scale ? { reverse: { columns: reverse, ...scale } } : {}) }
        : { kind: 'total', column: pretest! },
    ...(retest !== undefined ? { retest } : {}),
    ...(posttest !== undefined ? { posttest } : {}),
    ...(long
      ? {
          layout: {
            kind: 'long' as const,
            id: id!,
            occasion: occasion!,
            pretestOccasion: preOccasion!,
            ...(reOccasion !== undefined ? { retestOccasion: reOccasion } : {}),
            ...(postOccasion !== undefined ? { posttestOccasion: postOccasion } : {}),
          },
        }
      : {}),
  };
  return { ok: true, value: { command: 'pilot', file: files[0]!, mapping, ...(delimiter ? { delimiter } : {}), noHeader, json } };
}

function example(flag: string): string {
  switch (flag) {
    case '--items':
      return 'q1,q2,q3';
    case '--combine':
      return 'mean';
    case '--delimiter':
      return 'tab';
    case '--reverse':
      return 'A1,A3';
    case '--scale':
      return '1-6';
    case '--pre':
      return 'pre';
    case '--re':
      return 'retest';
    case '--post':
      return 'post';
    case '--programme':
    case '--program':
      return 'support';
    default:
      return flag.slice(2);
  }
}
