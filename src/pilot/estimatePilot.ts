import { spearmanBrown } from '../core/spearmanBrown';
import { cronbachAlpha } from './cronbachAlpha';
import { feldtInterval } from './feldtInterval';
import { fisherZInterval } from './fisherZInterval';
import { formatCoefficient, formatScore } from './formatPilotNumber';
import { LARGEST_SCORE_TEXT, parsePilotNumber, pilotNumberBeyondLimit } from './parsePilotNumber';
import {
  type GroupEstimates,
  type ParsedTable,
  PilotDataError,
  type PilotEstimates,
  type PilotMapping,
  type PilotWarning,
  type PrePostByGroup,
  type ReverseItems,
} from './types';
import { correlationDifference } from './correlationDifference';
import { widenLongTable } from './widenLongTable';

/** Confidence level of every interval in the pilot estimates. */
export const PILOT_CONFIDENCE_LEVEL = 0.95;
/** Reliability below this is flagged: the usual floor for group comparisons (common practice). */
export const RELIABILITY_FLOOR = 0.7;
/** Groups smaller than this are flagged as giving rough estimates (common practice). */
export const SMALL_GROUP_SIZE = 30;

const PROGRAMME = 1;
const COMPARISON = 0;
const NO_GROUP = -1;

/**
 * Estimate a plan's inputs from a pilot (or earlier-wave) table: each group's
 * pretest mean and SD, the group gap in points and as an SMD, the pooled
 * within-group SD, reliability (Cronbach's alpha with Feldt's CI, pooled
 * within groups and per group; odd–even split-half with Spearman–Brown;
 * test–retest with a Fisher z CI), corrected item–total correlations, and
 * the posttest SD and pre–post correlation, with plain-words warnings.
 *
 * References: Cronbach (1951), Psychometrika 16, 297–334 (alpha); Feldt
 * (1965), Psychometrika 30, 357–370 (alpha's CI); Spearman (1910) and Brown
 * (1910), British Journal of Psychology 3 (split-half step-up); Fisher
 * (1921), Metron 1 (z transformation); pooled within-group statistics as in
 * one-way MANOVA's within-groups SSCP matrix (common practice).
 *
 * Pooled within-group means: every score is centred on its own group's mean
 * before sums of squares and cross-products are added over the groups, so a
 * gap between the groups does not inflate a correlation or alpha (the plan
 * needs within-group values). Degrees of freedom lose one per group mean.
 *
 * Missing values (empty cells and the codes in MISSING_CODES): listwise over
 * the group and pretest columns (a row without a group label or with any
 * missing pretest item is left out of every estimate: alpha needs complete
 * item rows, common practice); pairwise for the test–retest and pre–post
 * figures (each uses the remaining rows that also have that score).
 *
 * Linear in rows × mapped columns, two passes, one Float64Array per mapped
 * column; pure, and the result is plain data (structured-clone friendly).
 *
 * Steps, each a named function below: resolve the columns (`resolveColumns`),
 * read them as numbers (`readPilotColumns`), place rows in groups
 * (`assignGroups`, listwise), the pretest moments (`pretestEstimates`), the
 * estimates (`itemEstimates`, `testRetestEstimate`, `posttestEstimates`), the
 * warnings (`pilotWarnings`) and the note on rows left out (`droppedRowsReason`).
 *
 * @param table a table from parseDelimitedText (cells as text).
 * @param mapping which column is the group (and which value is the programme
 *   group; every other non-empty value is the comparison group), the pretest
 *   (a total column, or ≥ 2 item columns combined by sum or mean), and the
 *   optional retest and posttest columns.
 * @param fileName shown in notes (optional).
 * @returns PilotEstimates (every number finite).
 * @throws PilotDataError: 'bad-mapping' (a column mapped twice, no programme
 *   value), 'missing-column' (names the column and lists those in the file),
 *   'non-numeric' (names the column, the first bad row as a spreadsheet shows
 *   it, and the cell), 'programme-value-absent' and 'one-group' (name the
 *   values found), 'too-few-items' (fewer than 2), 'constant-item' (names
 *   them), 'constant-column' (a pretest, retest or posttest without
 *   within-group variation), 'too-few-rows' (fewer than 2 usable rows in a group).
 * @example
 *   estimatePilot(parseDelimitedText(csv), { group: 'group', programmeValue: 'support',
 *     pretest: { kind: 'items', columns: ['q1', 'q2', 'q3'], combine: 'sum' } })
 *   // { groups: { programme: { n, pretestMean, pretestSD }, … }, reliability: { alpha: { value, lower, upper, … } }, … }
 */
export function estimatePilot(givenTable: ParsedTable, givenMapping: PilotMapping, fileName?: string): PilotEstimates {
  const long = givenMapping.layout?.kind === 'long' ? widenLongTable(givenTable, givenMapping) : undefined;
  const table = long?.table ?? givenTable;
  const mapping = long?.mapping ?? givenMapping;
  const cols = resolveColumns(table, mapping);
  const data = readPilotColumns(table, mapping, cols);
  const groups = assignGroups(table, mapping, cols, data.total);
  const warnings: PilotWarning[] = [];
  const pretest = pretestEstimates(mapping, cols, data.total, groups);
  const items = data.items.length > 0 ? itemEstimates(data.items, cols, groups, warnings) : undefined;
  const retest = data.retest ? testRetestEstimate(data.total, data.retest, mapping, groups, warnings) : undefined;
  const post = data.posttest ? posttestEstimates(data.total, data.posttest, mapping, groups, pretest, warnings) : undefined;

  const reliability: PilotEstimates['reliability'] = {};
  if (items) {
    reliability.alpha = items.alpha;
    reliability.alphaByGroup = items.alphaByGroup;
    if (items.splitHalf) reliability.splitHalf = items.splitHalf;
  }
  if (retest?.testRetest) reliability.testRetest = retest.testRetest;
  warnings.push(...pilotWarnings(reliability, items?.itemTotal, groups));
  const prePostByGroup = comparePrePostByGroup(pretest);

  const result: PilotEstimates = {
    ...(fileName !== undefined ? { fileName } : {}),
    mapping: structuredCopy(givenMapping),
    rowsRead: groups.rowsRead,
    rowsUsed: groups.N,
    rowsDropped: groups.rowsRead - groups.N,
    droppedReason: (long ? `${long.note} ` : '') + droppedRowsReason(groups, data, retest?.rows ?? 0, post?.rows ?? 0),
    groups: { programme: pretest.programme, comparison: pretest.comparison, comparisonValue: groups.comparisonValues.join(', ') },
    gap: { points: pretest.gapPoints, smd: pretest.gapPoints / pretest.pooledWithinSD },
    pooledWithinSD: pretest.pooledWithinSD,
    reliability,
    ...(post?.prePostCorrelation ? { prePostCorrelation: post.prePostCorrelation } : {}),
    ...(prePostByGroup ? { prePostByGroup } : {}),
    ...(items ? { itemTotal: items.itemTotal } : {}),
    ...(long ? { longFile: long.counts } : {}),
    warnings,
  };
  assertAllFinite(result, 'estimates');
  return result;
}

// ── Step 2: read the mapped columns as numbers ──────────────────────────────

/** The mapped columns as numbers (NaN = missing) and the pretest score of each row. */
interface PilotColumns {
  /** One array per item column (empty when the pretest is a total column). */
  items: Float64Array[];
  /** The pretest score per row: the total column, or the items' sum or mean (NaN when any item is missing). */
  total: Float64Array;
  retest?: Float64Array;
  posttest?: Float64Array;
}

/**
 * Read every mapped column as numbers; any bad cell in a mapped column stops
 * here, before anything is estimated. Then form the pretest score per row.
 */
function readPilotColumns(table: ParsedTable, mapping: PilotMapping, cols: ResolvedColumns): PilotColumns {
  const decimalComma = table.delimiter === ';';
  const rowNumber = rowNumberOf(table);
  const readColumn = (index: number, name: string): Float64Array => readNumericColumn(table, index, name, decimalComma, rowNumber);
  const items = cols.items.map((c, j) => readColumn(c, cols.itemNames[j]!));
  if (mapping.pretest.kind === 'items' && mapping.pretest.reverse) {
    reverseItems(items, cols.itemNames, mapping.pretest.reverse, rowNumber);
  }
  const totalColumn = cols.total === undefined ? undefined : readColumn(cols.total, cols.totalName!);
  const retest = cols.retest === undefined ? undefined : readColumn(cols.retest, mapping.retest!);
  const posttest = cols.posttest === undefined ? undefined : readColumn(cols.posttest, mapping.posttest!);
  const total = totalColumn ?? combineItems(items, mapping, table.rows.length);
  return { items, total, ...(retest ? { retest } : {}), ...(posttest ? { posttest } : {}) };
}

/**
 * Reverse the reverse-keyed items in place: x → maximum + minimum − x
 * (common practice for Likert-type items). A score outside [minimum, maximum]
 * is refused: it cannot be on the stated scale, and reversing it would give a
 * score that is not either.
 */
function reverseItems(items: Float64Array[], names: string[], reverse: ReverseItems, rowNumber: (i: number) => number): void {
  const { minimum, maximum } = reverse;
  for (const column of reverse.columns) {
    const j = names.indexOf(column);
    const x = items[j]!;
    for (let i = 0; i < x.length; i++) {
      const v = x[i]!;
      if (Number.isNaN(v)) continue;
      if (v < minimum || v > maximum) {
        throw new PilotDataError(
          'out-of-scale',
          `Item "${column}" is to be reversed on the scale ${formatScore(minimum)} to ${formatScore(maximum)}, but row ${rowNumber(i)} holds ${formatScore(v)}, outside that scale. Check the scale's lowest and highest possible scores, or the cell.`,
          { column, row: rowNumber(i) },
        );
      }
      x[i] = maximum + minimum - v;
    }
  }
}

/** A row's number as a spreadsheet shows it (the file's line number). */
function rowNumberOf(table: ParsedTable): (i: number) => number {
  return (i) => table.lineNumbers?.[i] ?? i + 1 + (table.hasHeader ? 1 : 0) + (table.commentLines ?? 0);
}

/** The pretest score per row from the items: their sum, or their mean (NaN when any item is missing). */
function combineItems(items: Float64Array[], mapping: PilotMapping, nRows: number): Float64Array {
  const k = items.length;
  const total = new Float64Array(nRows);
  const scale = mapping.pretest.kind === 'items' && mapping.pretest.combine === 'mean' ? 1 / k : 1;
  for (let i = 0; i < nRows; i++) {
    let s = 0;
    for (let j = 0; j < k; j++) s += items[j]![i]!;
    total[i] = s * scale; // NaN when any item is missing
  }
  return total;
}

// ── Step 3: place rows in groups (listwise over group and pretest) ───────────

/** Which group each row is in, after the listwise rule, with the counts the messages need. */
interface PilotGroups {
  /** PROGRAMME, COMPARISON or NO_GROUP (no label, or an incomplete pretest) per row. */
  group: Int8Array;
  /** Usable rows per group, indexed by COMPARISON and PROGRAMME. */
  n: number[];
  N: number;
  rowsRead: number;
  /** Number of pretest items (0 for a total column). */
  k: number;
  programmeValue: string;
  comparisonValues: string[];
  /** Rows per group value in the file, in file order. */
  valueRows: Map<string, number>;
  /** Usable rows per comparison value. */
  usableByValue: Map<string, number>;
  noGroup: number;
  noPretest: number;
  /** "programme group ("…")" or "comparison group ("…", "…")", for messages. */
  whoName(g: number): string;
}

function assignGroups(table: ParsedTable, mapping: PilotMapping, cols: ResolvedColumns, total: Float64Array): PilotGroups {
  const nRows = table.rows.length;
  const programmeValue = mapping.programmeValue.trim();
  const group = new Int8Array(nRows);
  const valueRows = new Map<string, number>(); // rows per group value, in file order
  for (let i = 0; i < nRows; i++) {
    const v = (table.rows[i]![cols.group] ?? '').trim();
    if (v === '') {
      group[i] = NO_GROUP;
      continue;
    }
    valueRows.set(v, (valueRows.get(v) ?? 0) + 1);
    group[i] = v === programmeValue ? PROGRAMME : COMPARISON;
  }
  checkGroupValues(valueRows, programmeValue, mapping.group);
  const comparisonValues = [...valueRows.keys()].filter((v) => v !== programmeValue);

  let noGroup = 0;
  let noPretest = 0;
  const usableByValue = new Map<string, number>();
  const n = [0, 0];
  for (let i = 0; i < nRows; i++) {
    const g = group[i]!;
    if (g === NO_GROUP) {
      noGroup++;
      continue;
    }
    if (Number.isNaN(total[i]!)) {
      noPretest++;
      group[i] = NO_GROUP; // out of every estimate from here on
      continue;
    }
    n[g]!++;
    if (g === COMPARISON) {
      const v = (table.rows[i]![cols.group] ?? '').trim();
      usableByValue.set(v, (usableByValue.get(v) ?? 0) + 1);
    }
  }
  const whoName = (g: number) =>
    g === PROGRAMME ? `programme group ("${programmeValue}")` : `comparison group (${comparisonValues.map((v) => `"${v}"`).join(', ')})`;
  const k = cols.items.length;
  for (const g of [PROGRAMME, COMPARISON]) {
    if (n[g]! < 2) {
      const rowsOfGroup = g === PROGRAMME ? valueRows.get(programmeValue)! : sumOf(comparisonValues.map((v) => valueRows.get(v)!));
      throw new PilotDataError(
        'too-few-rows',
        `The ${whoName(g)} has ${n[g]} row${n[g] === 1 ? '' : 's'} with a complete pretest (of ${rowsOfGroup} in the file): at least 2 per group are needed for an SD, and 30 or more for useful estimates. Rows with any empty pretest ${k > 0 ? 'item' : 'cell'} are left out.`,
        { column: mapping.group },
      );
    }
  }
  return {
    group,
    n,
    N: n[0]! + n[1]!,
    rowsRead: nRows,
    k,
    programmeValue,
    comparisonValues,
    valueRows,
    usableByValue,
    noGroup,
    noPretest,
    whoName,
  };
}

// ── Step 4: pretest moments: mean and SD per group, pooled within-group SD ──

interface PretestEstimates {
  programme: GroupEstimates;
  comparison: GroupEstimates;
  gapPoints: number;
  pooledWithinSD: number;
}

function pretestEstimates(mapping: PilotMapping, cols: ResolvedColumns, total: Float64Array, groups: PilotGroups): PretestEstimates {
  const { n, N, whoName } = groups;
  const pre = groupMoments(total, groups.group);
  for (const g of [PROGRAMME, COMPARISON]) {
    if (pre.constant[g]) {
      const what = cols.total === undefined ? `pretest total (the ${mapping.pretest.kind === 'items' ? mapping.pretest.combine : 'sum'} of the items)` : `pretest column "${cols.totalName}"`;
      throw new PilotDataError(
        'constant-column',
        `The ${what} has the same value (${formatScore(pre.mean[g]!)}) in every used row of the ${whoName(g)}, so its SD there is 0 and nothing about reliability or regression toward the mean can be estimated.`,
        cols.total === undefined ? {} : { column: cols.totalName! },
      );
    }
  }
  const preWhat = cols.total === undefined ? 'pretest total' : `pretest column "${cols.totalName}"`;
  for (const g of [PROGRAMME, COMPARISON]) requireSpread(pre.ss[g]!, n[g]!, `The ${preWhat}`, `the ${whoName(g)}`, cols.totalName);
  const pooledWithinSD = Math.sqrt((pre.ss[0]! + pre.ss[1]!) / (N - 2));
  const groupEstimates = (g: number): GroupEstimates => ({
    n: n[g]!,
    pretestMean: pre.mean[g]!,
    pretestSD: Math.sqrt(pre.ss[g]! / (n[g]! - 1)),
  });
  const programme = groupEstimates(PROGRAMME);
  const comparison = groupEstimates(COMPARISON);
  return { programme, comparison, gapPoints: programme.pretestMean - comparison.pretestMean, pooledWithinSD };
}

// ── Step 5: estimates: items (alpha, split-half, item–total), retest, posttest ─

interface ItemEstimates {
  alpha: NonNullable<PilotEstimates['reliability']['alpha']>;
  alphaByGroup: NonNullable<PilotEstimates['reliability']['alphaByGroup']>;
  splitHalf?: NonNullable<PilotEstimates['reliability']['splitHalf']>;
  itemTotal: NonNullable<PilotEstimates['itemTotal']>;
}

/** Alpha (pooled within groups and per group, Feldt CIs), the odd–even split-half and corrected item–total correlations. */
function itemEstimates(items: Float64Array[], cols: ResolvedColumns, groups: PilotGroups, warnings: PilotWarning[]): ItemEstimates {
  const { n, N, k } = groups;
  const it = itemMoments(items, groups.group, k);
  const constantItems = cols.itemNames.filter((_, j) => it.constant[j]);
  if (constantItems.length > 0) {
    throw new PilotDataError(
      'constant-item',
      `${constantItems.length === 1 ? 'Item column' : 'Item columns'} ${joinQuoted(constantItems)} ${constantItems.length === 1 ? 'has' : 'have'} the same value in every used row of each group, so ${constantItems.length === 1 ? 'it carries' : 'they carry'} no information about differences between people. Leave ${constantItems.length === 1 ? 'it' : 'them'} out of the items.`,
      { column: constantItems[0]! },
    );
  }
  cols.itemNames.forEach((column, j) =>
    requireSpread(it.ssItem[j]! + it.ssItem[k + j]!, N - 1, `Item column "${column}"`, 'both groups together', column),
  );
  const ssItemsPooled = sumOf(Array.from({ length: k }, (_, j) => it.ssItem[j]! + it.ssItem[k + j]!));
  const ssSumPooled = it.ssSum[0]! + it.ssSum[1]!;
  const alphaPooled = Math.min(1, cronbachAlpha(k, ssItemsPooled, ssSumPooled));
  const alpha = { ...feldtInterval(alphaPooled, N - 2, k, PILOT_CONFIDENCE_LEVEL), n: N, items: k };
  const byGroup = (g: number) => {
    let s = 0;
    for (let j = 0; j < k; j++) s += it.ssItem[g * k + j]!;
    const a = Math.min(1, cronbachAlpha(k, s, it.ssSum[g]!));
    return { ...feldtInterval(a, n[g]! - 1, k, PILOT_CONFIDENCE_LEVEL), n: n[g]! };
  };
  const alphaByGroup = { programme: byGroup(PROGRAMME), comparison: byGroup(COMPARISON) };

  const itemTotal = cols.itemNames.map((column, j) => {
    const ssj = it.ssItem[j]! + it.ssItem[k + j]!;
    const cpj = it.cpItemSum[j]!;
    const ssRest = ssSumPooled - 2 * cpj + ssj;
    if (!(ssRest > 1e-12 * ssSumPooled)) {
      throw new PilotDataError(
        'constant-column',
        `The items other than "${column}" add up to the same value in every used row of each group, so "${column}" cannot be compared with the rest of the test. Check the item columns.`,
        { column },
      );
    }
    return { column, correctedCorrelation: clampCorrelation((cpj - ssj) / (Math.sqrt(ssj) * Math.sqrt(ssRest))) };
  });

  let splitHalf: ItemEstimates['splitHalf'];
  if (it.ssOdd > 0 && it.ssEven > 0) {
    const half = clampCorrelation(it.cpOddEven / (Math.sqrt(it.ssOdd) * Math.sqrt(it.ssEven)));
    if (half > 0) splitHalf = { halfCorrelation: half, spearmanBrown: spearmanBrown(half, 2), n: N };
    else {
      warnings.push({
        code: 'split-half-not-positive',
        message: `The odd-numbered and even-numbered items do not correlate positively (r = ${formatCoefficient(half)}), so no split-half reliability is given. Check the items for reverse-keyed ones.`,
      });
    }
  }
  return { alpha, alphaByGroup, ...(splitHalf ? { splitHalf } : {}), itemTotal };
}

/** The pooled within-group pretest–retest correlation with its Fisher z CI (pairwise), and the rows it used. */
function testRetestEstimate(
  total: Float64Array,
  retest: Float64Array,
  mapping: PilotMapping,
  groups: PilotGroups,
  warnings: PilotWarning[],
): { testRetest?: NonNullable<PilotEstimates['reliability']['testRetest']>; rows: number } {
  const pr = pairMoments(total, retest, groups.group);
  const rows = pr.n[0]! + pr.n[1]!;
  if (pr.constantY[0] && pr.constantY[1] && rows > 0) {
    throw new PilotDataError(
      'constant-column',
      `The retest column "${mapping.retest}" has the same value in every used row of each group, so it cannot show how consistently people score.`,
      { column: mapping.retest! },
    );
  }
  const ssx = pr.ssx[0]! + pr.ssx[1]!;
  const ssy = pr.ssy[0]! + pr.ssy[1]!;
  if (rows >= 5 && ssx > 0 && ssy > 0) {
    const r = clampCorrelation((pr.cp[0]! + pr.cp[1]!) / (Math.sqrt(ssx) * Math.sqrt(ssy)));
    return { testRetest: fisherZInterval(r, rows, 1, PILOT_CONFIDENCE_LEVEL), rows };
  }
  warnings.push({
    code: 'retest-too-few',
    message: `Only ${rows} used row${rows === 1 ? ' has' : 's have'} both a pretest and a retest score ("${mapping.retest}"): at least 5 are needed, so no test–retest correlation is given.`,
  });
  return { rows };
}

/**
 * Posttest SD and pre–post correlation per group (written into `pretest`'s
 * group estimates) and pooled within groups (pairwise), and the rows used.
 */
function posttestEstimates(
  total: Float64Array,
  posttest: Float64Array,
  mapping: PilotMapping,
  groups: PilotGroups,
  pretest: PretestEstimates,
  warnings: PilotWarning[],
): { prePostCorrelation?: NonNullable<PilotEstimates['prePostCorrelation']>; rows: number } {
  const pp = pairMoments(total, posttest, groups.group);
  const rows = pp.n[0]! + pp.n[1]!;
  if (pp.constantY[0] && pp.constantY[1] && rows > 0) {
    throw new PilotDataError(
      'constant-column',
      `The posttest column "${mapping.posttest}" has the same value in every used row of each group, so it has no SD and no correlation with the pretest.`,
      { column: mapping.posttest! },
    );
  }
  for (const [g, est] of [
    [PROGRAMME, pretest.programme],
    [COMPARISON, pretest.comparison],
  ] as const) {
    est.nPrePost = pp.n[g]!;
    if (pp.n[g]! >= 3 && pp.ssx[g]! > 0 && pp.ssy[g]! > 0) {
      est.posttestSD = Math.sqrt(pp.ssy[g]! / (pp.n[g]! - 1));
      est.prePostCorrelation = clampCorrelation(pp.cp[g]! / (Math.sqrt(pp.ssx[g]!) * Math.sqrt(pp.ssy[g]!)));
    } else {
      warnings.push({
        code: 'posttest-too-few',
        message: `In the ${groups.whoName(g)} only ${pp.n[g]} used row${pp.n[g] === 1 ? ' has' : 's have'} a posttest score ("${mapping.posttest}")${pp.n[g]! >= 3 ? ', and the scores do not vary' : ''}: at least 3 varying scores are needed, so that group's posttest SD and pre–post correlation are not given.`,
      });
    }
  }
  const ssx = pp.ssx[0]! + pp.ssx[1]!;
  const ssy = pp.ssy[0]! + pp.ssy[1]!;
  if (rows >= 4 && ssx > 0 && ssy > 0) {
    return { prePostCorrelation: { value: clampCorrelation((pp.cp[0]! + pp.cp[1]!) / (Math.sqrt(ssx) * Math.sqrt(ssy))), n: rows }, rows };
  }
  return { rows };
}

/** Gap between the groups' pre–post correlations from which they are said to differ (whatever the test says). */
export const PRE_POST_GAP_NOTED = 0.1;

/**
 * The two groups' pre–post correlations side by side (when both exist, each
 * from 4 or more pairs), with Fisher's z test of the difference, in words:
 * the plan takes the comparison group's, and a merged slope would hide a gap.
 */
function comparePrePostByGroup(pretest: PretestEstimates): PrePostByGroup | undefined {
  const { programme: p, comparison: c } = pretest;
  if (p.prePostCorrelation === undefined || c.prePostCorrelation === undefined || p.nPrePost === undefined || c.nPrePost === undefined) return undefined;
  if (p.nPrePost < 4 || c.nPrePost < 4) return undefined;
  const d = correlationDifference(p.prePostCorrelation, p.nPrePost, c.prePostCorrelation, c.nPrePost);
  const differ = d.p < 0.05 || Math.abs(d.difference) >= PRE_POST_GAP_NOTED;
  const both = `The pre–post correlation is ${formatCoefficient(p.prePostCorrelation)} in the programme group (n = ${p.nPrePost}) and ${formatCoefficient(c.prePostCorrelation)} in the comparison group (n = ${c.nPrePost}); Fisher's z = ${d.z.toFixed(2).replace('-', '−')}, p ${d.p < 0.001 ? '< .001' : `= ${formatCoefficient(d.p, 3)}`}.`;
  const used = `The plan uses the comparison group's ${formatCoefficient(c.prePostCorrelation)} (its pre–post correlation describes the comparison group).`;
  const message = differ
    ? `${both} They differ, so one slope does not fit both groups: the pooled within-group value is shown for reference only, not used. ${used} Consider whether the programme changes how the pretest predicts the outcome.`
    : `${both} They are similar. ${used}`;
  return {
    programme: { value: p.prePostCorrelation, n: p.nPrePost },
    comparison: { value: c.prePostCorrelation, n: c.nPrePost },
    difference: d.difference,
    z: d.z,
    p: d.p,
    differ,
    used: 'comparison',
    message,
  };
}

// ── Step 6: warnings in plain words, and what was left out ──────────────────

/** The warnings about the estimates themselves (the estimating steps add their own before these). */
function pilotWarnings(
  reliability: PilotEstimates['reliability'],
  itemTotal: PilotEstimates['itemTotal'],
  groups: PilotGroups,
): PilotWarning[] {
  const { n, whoName, programmeValue, comparisonValues, valueRows, usableByValue } = groups;
  const warnings: PilotWarning[] = [];
  const alpha = reliability.alpha;
  if (alpha && alpha.value < RELIABILITY_FLOOR) {
    warnings.push({
      code: 'alpha-below-0.7',
      message: `Cronbach's alpha is ${formatCoefficient(alpha.value)} (within groups), below .70, the usual floor for comparing groups (common practice). Matching or adjusting on this pretest leaves a large part of the group gap in place; look at the remedies.`,
    });
  }
  const tr = reliability.testRetest;
  if (tr && tr.value < RELIABILITY_FLOOR) {
    warnings.push({
      code: 'retest-below-0.7',
      message: `The test–retest correlation is ${formatCoefficient(tr.value)} (within groups), below .70, the usual floor for comparing groups (common practice).`,
    });
  }
  for (const g of [PROGRAMME, COMPARISON]) {
    if (n[g]! < SMALL_GROUP_SIZE) {
      warnings.push({
        code: 'small-group',
        message: `The ${whoName(g)} has ${n[g]} usable rows, fewer than ${SMALL_GROUP_SIZE}: its estimates are rough (see how wide the intervals are).`,
      });
    }
  }
  const reversed = (itemTotal ?? []).filter((x) => x.correctedCorrelation < 0);
  if (reversed.length > 0) {
    const list = reversed.map((x) => `"${x.column}" (r = ${formatCoefficient(x.correctedCorrelation)})`);
    warnings.push({
      code: 'reverse-keyed-item',
      message: `${reversed.length === 1 ? 'Item' : 'Items'} ${joinList(list)} ${reversed.length === 1 ? 'correlates' : 'correlate'} negatively with the rest of the items (corrected item–total correlation): probably reverse-keyed. Reverse ${reversed.length === 1 ? 'its' : 'their'} scores (highest possible + lowest possible − score) or leave ${reversed.length === 1 ? 'it' : 'them'} out, and read the file again.`,
    });
  }
  for (const v of comparisonValues) {
    if ((usableByValue.get(v) ?? 0) === 0) {
      const rows = valueRows.get(v)!;
      warnings.push({
        code: 'group-value-no-rows',
        message: `The group value "${v}" has ${rows} row${rows === 1 ? '' : 's'} in the file but none with a complete pretest, so it adds nothing to the comparison group.`,
      });
    }
  }
  if (comparisonValues.length > 1) {
    const list = comparisonValues.map((v) => `"${v}" (${valueRows.get(v)} rows)`);
    warnings.push({
      code: 'several-comparison-values',
      message: `The comparison group pools every group value other than "${programmeValue}": ${joinList(list)}. If some of these rows should not be in the comparison group, remove them from the file.`,
    });
  }
  return warnings;
}

/** Plain words: which rows were left out and why, and which rows the pairwise figures use. */
function droppedRowsReason(groups: PilotGroups, data: PilotColumns, rowsRetest: number, rowsPost: number): string {
  const { rowsRead: nRows, N: rowsUsed, noGroup, noPretest, k } = groups;
  const rowsDropped = nRows - rowsUsed;
  const parts: string[] = [];
  if (noGroup > 0) parts.push(`${noGroup} without a group label`);
  if (noPretest > 0) parts.push(`${noPretest} with ${k > 0 ? 'a missing pretest item' : 'no pretest score'}`);
  let droppedReason =
    rowsDropped === 0
      ? `No rows were left out: all ${nRows} have a group label and a complete pretest.`
      : `${rowsDropped} of ${nRows} rows were left out of every estimate: ${joinList(parts)} (listwise deletion over the group and pretest columns).`;
  const pairwise: string[] = [];
  if (data.retest) pairwise.push(`the test–retest correlation uses the ${rowsRetest} of the ${rowsUsed} used rows that also have a retest score`);
  if (data.posttest) pairwise.push(`the posttest SD and pre–post correlation use the ${rowsPost} that also have a posttest score`);
  if (pairwise.length > 0) droppedReason += ` Pairwise: ${pairwise.join('; ')}.`;
  return droppedReason;
}

// ── Step 1: resolve the mapping's column names to indices ───────────────────

interface ResolvedColumns {
  group: number;
  items: number[];
  itemNames: string[];
  total?: number;
  totalName?: string;
  retest?: number;
  posttest?: number;
}

function resolveColumns(table: ParsedTable, mapping: PilotMapping): ResolvedColumns {
  const index = new Map<string, number>();
  table.columns.forEach((c, i) => {
    if (!index.has(c)) index.set(c, i);
  });
  const find = (name: string, role: string): number => {
    if (typeof name !== 'string' || name.trim() === '') {
      throw new PilotDataError('bad-mapping', `Choose the ${role} column; none was given.`);
    }
    const i = index.get(name);
    if (i === undefined) {
      const shown = table.columns.slice(0, 30).map((c) => `"${c}"`);
      throw new PilotDataError(
        'missing-column',
        `The ${role} column "${name}" is not in the file. Its columns are ${joinList(shown)}${table.columns.length > 30 ? ' and more' : ''}.`,
        { column: name },
      );
    }
    return i;
  };
  if (typeof mapping.programmeValue !== 'string' || mapping.programmeValue.trim() === '') {
    throw new PilotDataError('bad-mapping', 'Choose which value of the group column marks the programme group; none was given.', {
      column: mapping.group,
    });
  }
  const used = new Map<string, string>(); // column → role, to catch a column mapped twice
  const claim = (name: string, role: string) => {
    const before = used.get(name);
    if (before !== undefined) {
      throw new PilotDataError(
        'bad-mapping',
        `The column "${name}" is mapped both as ${before} and as ${role}; each column can have one role only.`,
        { column: name },
      );
    }
    used.set(name, role);
  };
  const out: ResolvedColumns = { group: find(mapping.group, 'group'), items: [], itemNames: [] };
  claim(mapping.group, 'the group column');
  const p = mapping.pretest;
  if (p.kind === 'total') {
    out.total = find(p.column, 'pretest');
    out.totalName = p.column;
    claim(p.column, 'the pretest');
  } else if (p.kind === 'items') {
    if (p.combine !== 'sum' && p.combine !== 'mean') {
      throw new PilotDataError('bad-mapping', `The items are combined by "sum" or "mean"; got ${JSON.stringify(p.combine)}.`);
    }
    if (p.columns.length < 2) {
      throw new PilotDataError(
        'too-few-items',
        `Cronbach's alpha and the split-half need at least two item columns; got ${p.columns.length}${p.columns.length === 1 ? ` ("${p.columns[0]}")` : ''}. Choose more items, or map the pretest as one total-score column.`,
        p.columns.length === 1 ? { column: p.columns[0]! } : {},
      );
    }
    p.columns.forEach((c, j) => {
      out.items.push(find(c, 'item'));
      out.itemNames.push(c);
      claim(c, `item ${j + 1} of ${p.columns.length}`);
    });
    if (p.reverse !== undefined) checkReverse(p.reverse, p.columns);
  } else {
    throw new PilotDataError('bad-mapping', 'The pretest must be a total-score column or a list of item columns.');
  }
  // An empty retest or posttest name means "not mapped" (a form's "none" choice).
  if (mapping.retest !== undefined && mapping.retest !== '') {
    out.retest = find(mapping.retest, 'retest');
    claim(mapping.retest, 'the retest');
  }
  if (mapping.posttest !== undefined && mapping.posttest !== '') {
    out.posttest = find(mapping.posttest, 'posttest');
    claim(mapping.posttest, 'the posttest');
  }
  return out;
}

/** The reverse-keyed items must be among the pretest's items, on a scale whose lowest score is below its highest. */
function checkReverse(reverse: ReverseItems, itemColumns: string[]): void {
  const { minimum, maximum, columns } = reverse;
  if (!Array.isArray(columns) || columns.length === 0) {
    throw new PilotDataError('bad-mapping', 'Name the items to reverse; none was given.');
  }
  const notItems = columns.filter((c) => !itemColumns.includes(c));
  if (notItems.length > 0) {
    throw new PilotDataError(
      'bad-mapping',
      `Only pretest items can be reversed, and ${joinQuoted(notItems)} ${notItems.length === 1 ? 'is not one of them' : 'are not among them'}. The items are ${joinQuoted(itemColumns)}.`,
      { column: notItems[0]! },
    );
  }
  const twice = columns.filter((c, i) => columns.indexOf(c) !== i);
  if (twice.length > 0) {
    throw new PilotDataError('bad-mapping', `Item ${joinQuoted([...new Set(twice)])} is named more than once among the items to reverse; name it once.`, {
      column: twice[0]!,
    });
  }
  if (!Number.isFinite(minimum) || !Number.isFinite(maximum) || !(minimum < maximum)) {
    throw new PilotDataError(
      'bad-mapping',
      `Reversing an item needs the scale's lowest and highest possible scores, lowest first and below the highest (e.g. 1 to 6); got ${Number.isFinite(minimum) ? formatScore(minimum) : String(minimum)} to ${Number.isFinite(maximum) ? formatScore(maximum) : String(maximum)}.`,
    );
  }
}

function readNumericColumn(
  table: ParsedTable,
  c: number,
  name: string,
  decimalComma: boolean,
  rowNumber: (i: number) => number,
): Float64Array {
  const rows = table.rows;
  const out = new Float64Array(rows.length);
  let firstBad = -1;
  let bad = 0;
  for (let i = 0; i < rows.length; i++) {
    const x = parsePilotNumber(rows[i]![c] ?? '', decimalComma);
    if (x === undefined) {
      if (firstBad < 0) firstBad = i;
      bad++;
      out[i] = Number.NaN;
    } else out[i] = x;
  }
  if (firstBad >= 0) {
    const cell = (rows[firstBad]![c] ?? '').trim();
    const row = rowNumber(firstBad);
    const more = bad > 1 ? ` (and ${bad - 1} more row${bad === 2 ? '' : 's'} in this column)` : '';
    if (pilotNumberBeyondLimit(cell, decimalComma)) {
      throw new PilotDataError(
        'non-numeric',
        `Column "${name}" must hold scores of at most ${LARGEST_SCORE_TEXT} in size (larger ones cannot be added up exactly), but row ${row} holds ${JSON.stringify(cell.length > 40 ? `${cell.slice(0, 40)}…` : cell)}${more}. Rescale the column (for example, thousands instead of units).`,
        { column: name, row },
      );
    }
    const hint =
      !decimalComma && /^[+-]?\d*,\d+$/.test(cell)
        ? ' It looks like a decimal comma: use a decimal point, or save the file with semicolons between columns.'
        : ' Leave a cell empty (or write NA) where a value is missing.';
    throw new PilotDataError(
      'non-numeric',
      `Column "${name}" must hold numbers, but row ${row} holds ${JSON.stringify(cell.length > 40 ? `${cell.slice(0, 40)}…` : cell)}${more}.${hint}`,
      { column: name, row },
    );
  }
  return out;
}

function checkGroupValues(valueRows: Map<string, number>, programmeValue: string, column: string): void {
  const list = () =>
    joinList(
      [...valueRows.entries()].slice(0, 10).map(([v, r]) => `"${v}" (${r} row${r === 1 ? '' : 's'})`),
    ) + (valueRows.size > 10 ? ` and ${valueRows.size - 10} more` : '');
  if (valueRows.size === 0) {
    throw new PilotDataError('one-group', `The group column "${column}" is empty in every row, so no row can be placed in a group.`, {
      column,
    });
  }
  if (!valueRows.has(programmeValue)) {
    throw new PilotDataError(
      'programme-value-absent',
      `The programme value "${programmeValue}" does not occur in the group column "${column}". The values found are ${list()}.`,
      { column },
    );
  }
  if (valueRows.size === 1) {
    throw new PilotDataError(
      'one-group',
      `The group column "${column}" holds one value only, "${programmeValue}" (${valueRows.get(programmeValue)} rows): the file needs comparison rows too (any other value in that column).`,
      { column },
    );
  }
}

/** Per-group mean, sum of squared deviations and exact constancy of one column over used rows. */
function groupMoments(x: Float64Array, group: Int8Array) {
  const count = [0, 0];
  const sum = [0, 0];
  const first = [Number.NaN, Number.NaN];
  const constant = [true, true];
  for (let i = 0; i < x.length; i++) {
    const g = group[i]!;
    if (g < 0) continue;
    const v = x[i]!;
    if (count[g] === 0) first[g] = v;
    else if (v !== first[g]) constant[g] = false;
    count[g]!++;
    sum[g]! += v;
  }
  const mean = [sum[0]! / count[0]!, sum[1]! / count[1]!];
  const ss = [0, 0];
  for (let i = 0; i < x.length; i++) {
    const g = group[i]!;
    if (g < 0) continue;
    const d = x[i]! - mean[g]!;
    ss[g]! += d * d;
  }
  return { mean, ss, constant };
}

/**
 * Item sums of squares per group (index g·k + j), the item-sum's per group,
 * pooled item × sum cross-products, and pooled odd/even half moments, all on
 * scores centred at their group's item means.
 */
function itemMoments(items: Float64Array[], group: Int8Array, k: number) {
  const nRows = group.length;
  const count = [0, 0];
  const mean = new Float64Array(2 * k);
  const first = new Float64Array(2 * k).fill(Number.NaN);
  const varies = new Uint8Array(2 * k);
  for (let i = 0; i < nRows; i++) {
    const g = group[i]!;
    if (g < 0) continue;
    const base = g * k;
    const fresh = count[g] === 0;
    count[g]!++;
    for (let j = 0; j < k; j++) {
      const v = items[j]![i]!;
      mean[base + j]! += v;
      if (fresh) first[base + j] = v;
      else if (v !== first[base + j]) varies[base + j] = 1;
    }
  }
  for (let g = 0; g < 2; g++) for (let j = 0; j < k; j++) mean[g * k + j]! /= count[g]!;

  const ssItem = new Float64Array(2 * k);
  const cpItemSum = new Float64Array(k);
  const ssSum = [0, 0];
  let ssOdd = 0;
  let ssEven = 0;
  let cpOddEven = 0;
  const d = new Float64Array(k);
  for (let i = 0; i < nRows; i++) {
    const g = group[i]!;
    if (g < 0) continue;
    const base = g * k;
    let s = 0;
    let odd = 0;
    let even = 0;
    for (let j = 0; j < k; j++) {
      const dj = items[j]![i]! - mean[base + j]!;
      d[j] = dj;
      s += dj;
      // Items 1, 3, 5, … (j = 0, 2, 4, …) form the odd half.
      if ((j & 1) === 0) odd += dj;
      else even += dj;
    }
    for (let j = 0; j < k; j++) {
      const dj = d[j]!;
      ssItem[base + j]! += dj * dj;
      cpItemSum[j]! += dj * s;
    }
    ssSum[g]! += s * s;
    ssOdd += odd * odd;
    ssEven += even * even;
    cpOddEven += odd * even;
  }
  const constant = Array.from({ length: k }, (_, j) => varies[j] === 0 && varies[k + j] === 0);
  return { ssItem, cpItemSum, ssSum, ssOdd, ssEven, cpOddEven, constant };
}

/** Per-group moments of (x, y) over used rows where y is present (pairwise). */
function pairMoments(x: Float64Array, y: Float64Array, group: Int8Array) {
  const n = [0, 0];
  const sx = [0, 0];
  const sy = [0, 0];
  const firstY = [Number.NaN, Number.NaN];
  const constantY = [true, true];
  for (let i = 0; i < x.length; i++) {
    const g = group[i]!;
    const yi = y[i]!;
    if (g < 0 || Number.isNaN(yi)) continue;
    if (n[g] === 0) firstY[g] = yi;
    else if (yi !== firstY[g]) constantY[g] = false;
    n[g]!++;
    sx[g]! += x[i]!;
    sy[g]! += yi;
  }
  const mx = [sx[0]! / n[0]!, sx[1]! / n[1]!];
  const my = [sy[0]! / n[0]!, sy[1]! / n[1]!];
  const ssx = [0, 0];
  const ssy = [0, 0];
  const cp = [0, 0];
  for (let i = 0; i < x.length; i++) {
    const g = group[i]!;
    const yi = y[i]!;
    if (g < 0 || Number.isNaN(yi)) continue;
    const dx = x[i]! - mx[g]!;
    const dy = yi - my[g]!;
    ssx[g]! += dx * dx;
    ssy[g]! += dy * dy;
    cp[g]! += dx * dy;
  }
  // A group without pairs contributes nothing (its means are NaN but never used).
  return { n, ssx, ssy, cp, constantY };
}

/** Smallest SD of a column that varies: below it, squares of deviations underflow double precision. */
const SMALLEST_SPREAD = 1e-100;

/**
 * Refuse scores that vary but by so little that their sums of squares cannot
 * be computed (they underflow to 0), with a message that says what to do.
 */
function requireSpread(ss: number, df: number, what: string, where: string, column?: string): void {
  if (df >= 1 && Math.sqrt(ss / df) >= SMALLEST_SPREAD) return;
  throw new PilotDataError(
    'tiny-spread',
    `${what} varies by too little to compute with in ${where}: its SD is below 10^-100 (the scores differ only far beyond the 15th significant digit, or are around 10^-100 or smaller). Rescale the scores (for example, multiply them by 10^6) and read the file again.`,
    column === undefined ? {} : { column },
  );
}

function clampCorrelation(r: number): number {
  return r > 1 ? 1 : r < -1 ? -1 : r;
}

function sumOf(xs: number[]): number {
  let s = 0;
  for (const x of xs) s += x;
  return s;
}

function joinList(items: string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

function joinQuoted(names: string[]): string {
  return joinList(names.map((c) => `"${c}"`));
}

function structuredCopy(m: PilotMapping): PilotMapping {
  const pretest =
    m.pretest.kind === 'total'
      ? { kind: 'total' as const, column: m.pretest.column }
      : {
          kind: 'items' as const,
          columns: [...m.pretest.columns],
          combine: m.pretest.combine,
          ...(m.pretest.reverse ? { reverse: { ...m.pretest.reverse, columns: [...m.pretest.reverse.columns] } } : {}),
        };
  return {
    group: m.group,
    programmeValue: m.programmeValue,
    pretest,
    ...(m.retest ? { retest: m.retest } : {}),
    ...(m.posttest ? { posttest: m.posttest } : {}),
    ...(m.layout ? { layout: { ...m.layout } } : {}),
  };
}

/** No NaN or Infinity may leave the module (a guard; the checks above should make it unreachable). */
function assertAllFinite(x: unknown, path: string): void {
  if (typeof x === 'number') {
    if (!Number.isFinite(x)) throw new Error(`Internal fault: the pilot estimate ${path} is not a finite number. Please report this with the file's layout.`);
    return;
  }
  if (Array.isArray(x)) x.forEach((v, i) => assertAllFinite(v, `${path}[${i}]`));
  else if (typeof x === 'object' && x !== null) for (const [key, v] of Object.entries(x)) assertAllFinite(v, `${path}.${key}`);
}
