import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { spearmanBrown } from '../../src/core/spearmanBrown';
import { estimatePilot } from '../../src/pilot/estimatePilot';
import { parseDelimitedText } from '../../src/pilot/parseDelimitedText';
import type { ParsedTable, PilotMapping } from '../../src/pilot/types';
import { errorOf } from './errorOf';
import { pilotFixtureMapping, pilotFixtureTable, toCsv, type PilotFixture } from './pilotFixtures';

/** Centre each value on its own group's mean (simple-statistics' mean). */
function centred(values: number[], groups: string[]): number[] {
  const means = new Map<string, number>();
  for (const g of new Set(groups)) means.set(g, ss.mean(values.filter((_, i) => groups[i] === g)));
  return values.map((v, i) => v - means.get(groups[i]!)!);
}

const TOL = 1e-10; // double-precision sums over a few hundred rows agree far closer than this

describe('estimatePilot against simple-statistics 7.12.1 (an independent implementation)', () => {
  // A generated table with missing cells: a blank group label, blank items, blank retest and posttest cells.
  const f: PilotFixture = { seed: 5, nProgramme: 90, nComparison: 130, items: 6, interItem: 0.4, gap: -0.7, retest: true, posttest: true };
  const table = pilotFixtureTable(f);
  const col = (name: string) => table.columns.indexOf(name);
  table.rows[3]![col('group')] = '';
  table.rows[10]![col('q2')] = '';
  table.rows[150]![col('q6')] = 'NA';
  table.rows[151]![col('q1')] = ' ';
  for (const i of [0, 20, 40, 100, 200]) table.rows[i]![col('retest')] = '';
  for (const i of [1, 2, 60, 61, 62, 180, 181]) table.rows[i]![col('posttest')] = '.';
  const est = estimatePilot(table, pilotFixtureMapping(f), 'invented.csv');

  // Listwise: rows with a group and all six items.
  const items = ['q1', 'q2', 'q3', 'q4', 'q5', 'q6'];
  const num = (cell: string) => (['', 'NA', '.'].includes(cell.trim()) ? Number.NaN : Number(cell));
  const used = table.rows.filter((r) => r[0]!.trim() !== '' && items.every((c) => !Number.isNaN(num(r[col(c)]!))));
  const groups = used.map((r) => r[0]!);
  const itemValues = items.map((c) => used.map((r) => num(r[col(c)]!)));
  const sum = used.map((_, i) => itemValues.reduce((s, v) => s + v[i]!, 0));

  it('counts rows read, used and dropped (listwise over group and pretest items), and says why', () => {
    expect(est.rowsRead).toBe(220);
    expect(used.length).toBe(216);
    expect(est.rowsUsed).toBe(216);
    expect(est.rowsDropped).toBe(4);
    expect(est.droppedReason).toBe(
      '4 of 220 rows were left out of every estimate: 1 without a group label and 3 with a missing pretest item (listwise deletion over the group and pretest columns). ' +
        'Pairwise: the test–retest correlation uses the 211 of the 216 used rows that also have a retest score; the posttest SD and pre–post correlation use the 209 that also have a posttest score.',
    );
  });
  it('group n, pretest mean and SD (sample SD, n − 1), gap, pooled within-group SD and SMD', () => {
    for (const who of ['programme', 'comparison'] as const) {
      const x = sum.filter((_, i) => groups[i] === who);
      expect(est.groups[who].n).toBe(x.length);
      expect(Math.abs(est.groups[who].pretestMean - ss.mean(x))).toBeLessThan(TOL);
      expect(Math.abs(est.groups[who].pretestSD - ss.sampleStandardDeviation(x))).toBeLessThan(TOL);
    }
    const xp = sum.filter((_, i) => groups[i] === 'programme');
    const xc = sum.filter((_, i) => groups[i] === 'comparison');
    const pooled = Math.sqrt(((xp.length - 1) * ss.sampleVariance(xp) + (xc.length - 1) * ss.sampleVariance(xc)) / (xp.length + xc.length - 2));
    expect(Math.abs(est.pooledWithinSD - pooled)).toBeLessThan(TOL);
    expect(Math.abs(est.gap.points - (ss.mean(xp) - ss.mean(xc)))).toBeLessThan(TOL);
    expect(Math.abs(est.gap.smd - (ss.mean(xp) - ss.mean(xc)) / pooled)).toBeLessThan(TOL);
    expect(est.groups.comparisonValue).toBe('comparison');
  });
  it("Cronbach's alpha per group and pooled within groups (item scores centred on their group's means), Cronbach 1951 eq. 2", () => {
    const k = items.length;
    const alphaOf = (vs: number[][], total: number[]) =>
      (k / (k - 1)) * (1 - vs.reduce((s, v) => s + ss.sampleVariance(v), 0) / ss.sampleVariance(total));
    for (const who of ['programme', 'comparison'] as const) {
      const pick = (v: number[]) => v.filter((_, i) => groups[i] === who);
      const a = alphaOf(itemValues.map(pick), pick(sum));
      expect(Math.abs(est.reliability.alphaByGroup![who].value - a)).toBeLessThan(TOL);
      expect(est.reliability.alphaByGroup![who].n).toBe(pick(sum).length);
    }
    const pooled = alphaOf(
      itemValues.map((v) => centred(v, groups)),
      centred(sum, groups),
    );
    expect(Math.abs(est.reliability.alpha!.value - pooled)).toBeLessThan(TOL);
    expect(est.reliability.alpha).toMatchObject({ n: 216, items: 6, level: 0.95 });
  });
  it('odd–even split-half correlation (pooled within groups) and its Spearman–Brown step-up 2r/(1 + r) (Spearman 1910; Brown 1910)', () => {
    const odd = used.map((_, i) => itemValues[0]![i]! + itemValues[2]![i]! + itemValues[4]![i]!);
    const even = used.map((_, i) => itemValues[1]![i]! + itemValues[3]![i]! + itemValues[5]![i]!);
    const r = ss.sampleCorrelation(centred(odd, groups), centred(even, groups));
    expect(Math.abs(est.reliability.splitHalf!.halfCorrelation - r)).toBeLessThan(TOL);
    expect(Math.abs(est.reliability.splitHalf!.spearmanBrown - (2 * r) / (1 + r))).toBeLessThan(TOL);
    expect(est.reliability.splitHalf!.n).toBe(216);
  });
  it('corrected item–total correlations (item against the sum of the other items, within groups)', () => {
    expect(est.itemTotal!.map((x) => x.column)).toEqual(items);
    items.forEach((_, j) => {
      const rest = sum.map((s, i) => s - itemValues[j]![i]!);
      const r = ss.sampleCorrelation(centred(itemValues[j]!, groups), centred(rest, groups));
      expect(Math.abs(est.itemTotal![j]!.correctedCorrelation - r)).toBeLessThan(TOL);
    });
  });
  it('test–retest: pooled within-group correlation over rows with a retest (pairwise)', () => {
    const pairs = used.map((r, i) => ({ g: groups[i]!, x: sum[i]!, y: num(r[col('retest')]!) })).filter((p) => !Number.isNaN(p.y));
    const g = pairs.map((p) => p.g);
    const r = ss.sampleCorrelation(centred(pairs.map((p) => p.x), g), centred(pairs.map((p) => p.y), g));
    expect(est.reliability.testRetest!.n).toBe(211);
    expect(Math.abs(est.reliability.testRetest!.value - r)).toBeLessThan(TOL);
  });
  it('posttest SD and pre–post correlation per group and pooled, over rows with a posttest (pairwise)', () => {
    const pairs = used.map((r, i) => ({ g: groups[i]!, x: sum[i]!, y: num(r[col('posttest')]!) })).filter((p) => !Number.isNaN(p.y));
    for (const who of ['programme', 'comparison'] as const) {
      const mine = pairs.filter((p) => p.g === who);
      expect(est.groups[who].nPrePost).toBe(mine.length);
      expect(Math.abs(est.groups[who].posttestSD! - ss.sampleStandardDeviation(mine.map((p) => p.y)))).toBeLessThan(TOL);
      expect(Math.abs(est.groups[who].prePostCorrelation! - ss.sampleCorrelation(mine.map((p) => p.x), mine.map((p) => p.y)))).toBeLessThan(TOL);
    }
    const g = pairs.map((p) => p.g);
    const r = ss.sampleCorrelation(centred(pairs.map((p) => p.x), g), centred(pairs.map((p) => p.y), g));
    expect(est.prePostCorrelation!.n).toBe(209);
    expect(Math.abs(est.prePostCorrelation!.value - r)).toBeLessThan(TOL);
  });
  it('is plain data: structured cloning changes nothing; the file name and mapping are kept', () => {
    expect(structuredClone(est)).toEqual(est);
    expect(est.fileName).toBe('invented.csv');
    expect(est.mapping).toEqual(pilotFixtureMapping(f));
  });
});

describe('estimatePilot: item mean instead of sum, a total column, decimal commas', () => {
  const f: PilotFixture = { seed: 8, nProgramme: 60, nComparison: 70, items: 4, interItem: 0.5 };
  const table = pilotFixtureTable(f);
  it('the mean of the items divides means and SDs by k and leaves alpha unchanged (alpha is scale-free); tolerance 1e-10', () => {
    const bySum = estimatePilot(table, pilotFixtureMapping(f, 'sum'));
    const byMean = estimatePilot(table, pilotFixtureMapping(f, 'mean'));
    expect(Math.abs(byMean.groups.programme.pretestMean - bySum.groups.programme.pretestMean / 4)).toBeLessThan(TOL);
    expect(Math.abs(byMean.groups.comparison.pretestSD - bySum.groups.comparison.pretestSD / 4)).toBeLessThan(TOL);
    expect(Math.abs(byMean.pooledWithinSD - bySum.pooledWithinSD / 4)).toBeLessThan(TOL);
    expect(Math.abs(byMean.reliability.alpha!.value - bySum.reliability.alpha!.value)).toBeLessThan(TOL);
    expect(Math.abs(byMean.gap.smd - bySum.gap.smd)).toBeLessThan(TOL);
  });
  it('a total-score column gives means and SDs but no alpha, split-half or item–total', () => {
    const t: ParsedTable = { ...table, columns: ['group', 'total', 'a', 'b', 'c'] };
    const est = estimatePilot(t, { group: 'group', programmeValue: 'programme', pretest: { kind: 'total', column: 'total' } });
    const x = t.rows.filter((r) => r[0] === 'programme').map((r) => Number(r[1]));
    expect(Math.abs(est.groups.programme.pretestSD - ss.sampleStandardDeviation(x))).toBeLessThan(TOL);
    expect(est.reliability).toEqual({});
    expect(est.itemTotal).toBeUndefined();
  });
  it("reads decimal commas in a ';' file", () => {
    const text = 'g;x\nP;1,5\nP;2,5\nP;4\nC;3,25\nC;1\nC;2';
    const est = estimatePilot(parseDelimitedText(text), { group: 'g', programmeValue: 'P', pretest: { kind: 'total', column: 'x' } });
    expect(est.groups.programme.pretestMean).toBeCloseTo(8 / 3, 12);
    expect(est.groups.comparison.pretestMean).toBeCloseTo(6.25 / 3, 12);
  });
});

describe('estimatePilot: bad files and mappings (each message names the column or row)', () => {
  const f: PilotFixture = { seed: 3, nProgramme: 40, nComparison: 40, items: 3, interItem: 0.5, retest: true, posttest: true };
  const base = () => pilotFixtureTable(f);
  const mapping = pilotFixtureMapping(f);

  it('a mapped column missing from the file, listing the columns there are', () => {
    const e = errorOf(() => estimatePilot(base(), { ...mapping, retest: 'retest2' }));
    expect(e.code).toBe('missing-column');
    expect(e.column).toBe('retest2');
    expect(e.message).toBe('The retest column "retest2" is not in the file. Its columns are "group", "q1", "q2", "q3", "retest" and "posttest".');
    expect(errorOf(() => estimatePilot(base(), { ...mapping, group: 'Group' })).message).toMatch(/^The group column "Group" is not in the file/);
  });
  it('non-numeric cells: the column, the first bad row as a spreadsheet shows it, the cell, and how many more', () => {
    const raw = base();
    raw.rows[0]![2] = 'abc';
    raw.rows[45]![2] = 'n/a?';
    raw.rows[46]![3] = 'x'; // a later column: the first bad column is reported
    const t = parseDelimitedText(`# Invented data\n${toCsv(raw)}`);
    const e = errorOf(() => estimatePilot(t, mapping));
    expect(e.code).toBe('non-numeric');
    expect(e.column).toBe('q2');
    // Row 1 comment, row 2 header, row 3 the first data row.
    expect(e.row).toBe(3);
    expect(e.message).toBe(
      'Column "q2" must hold numbers, but row 3 holds "abc" (and 1 more row in this column). Leave a cell empty (or write NA) where a value is missing.',
    );
  });
  it('a decimal comma in a comma file gets a hint', () => {
    const t = base();
    t.rows[4]![1] = '3,5';
    const e = errorOf(() => estimatePilot(t, mapping));
    expect(e.message).toMatch(/row 6 holds "3,5"\. It looks like a decimal comma/);
  });
  it('the programme value absent, naming the values found with their rows', () => {
    const e = errorOf(() => estimatePilot(base(), { ...mapping, programmeValue: 'Programme' }));
    expect(e.code).toBe('programme-value-absent');
    expect(e.message).toBe(
      'The programme value "Programme" does not occur in the group column "group". The values found are "programme" (40 rows) and "comparison" (40 rows).',
    );
  });
  it('one group only', () => {
    const t = base();
    t.rows = t.rows.filter((r) => r[0] === 'programme');
    const e = errorOf(() => estimatePilot(t, mapping));
    expect(e.code).toBe('one-group');
    expect(e.message).toMatch(/holds one value only, "programme" \(40 rows\): the file needs comparison rows too/);
  });
  it('fewer than two items', () => {
    const e = errorOf(() => estimatePilot(base(), { ...mapping, pretest: { kind: 'items', columns: ['q1'], combine: 'sum' } }));
    expect(e.code).toBe('too-few-items');
    expect(e.message).toMatch(/at least two item columns; got 1 \("q1"\)/);
  });
  it('constant items, naming them', () => {
    const t = base();
    for (const r of t.rows) {
      r[1] = '3';
      r[3] = r[0] === 'programme' ? '1' : '2'; // varies between groups only: still no within-group information
    }
    const e = errorOf(() => estimatePilot(t, mapping));
    expect(e.code).toBe('constant-item');
    expect(e.message).toMatch(/^Item columns "q1" and "q3" have the same value in every used row of each group/);
  });
  it('a pretest total without variation in one group', () => {
    const t = base();
    const c = t.columns.length;
    t.columns.push('flat');
    t.rows.forEach((r, i) => r.push(r[0] === 'comparison' ? '7' : String(i)));
    expect(c).toBe(6);
    const e = errorOf(() => estimatePilot(t, { ...mapping, pretest: { kind: 'total', column: 'flat' }, retest: undefined, posttest: undefined }));
    expect(e.code).toBe('constant-column');
    expect(e.message).toMatch(/pretest column "flat" has the same value \(7\) in every used row of the comparison group \("comparison"\)/);
  });
  it('a constant posttest', () => {
    const t = base();
    for (const r of t.rows) r[5] = '50';
    expect(errorOf(() => estimatePilot(t, mapping)).message).toMatch(/posttest column "posttest" has the same value/);
  });
  it('fewer than two usable rows in a group', () => {
    const t = base();
    t.rows = t.rows.filter((r, i) => r[0] === 'programme' || i < 41);
    const e = errorOf(() => estimatePilot(t, mapping));
    expect(e.code).toBe('too-few-rows');
    expect(e.message).toMatch(/^The comparison group \("comparison"\) has 1 row with a complete pretest \(of 1 in the file\)/);
  });
  it('a column mapped twice, and no programme value', () => {
    expect(errorOf(() => estimatePilot(base(), { ...mapping, posttest: 'q2' })).message).toBe(
      'The column "q2" is mapped both as item 2 of 3 and as the posttest; each column can have one role only.',
    );
    expect(errorOf(() => estimatePilot(base(), { ...mapping, programmeValue: ' ' })).code).toBe('bad-mapping');
    expect(errorOf(() => estimatePilot(base(), { ...mapping, group: '' })).message).toBe('Choose the group column; none was given.');
  });
  it('an empty retest or posttest name means "not mapped"', () => {
    const est = estimatePilot(base(), { ...mapping, retest: '', posttest: '' });
    expect(est.reliability.testRetest).toBeUndefined();
    expect(est.prePostCorrelation).toBeUndefined();
    expect(est.mapping).toEqual({ group: 'group', programmeValue: 'programme', pretest: mapping.pretest });
  });
});

describe('estimatePilot: warnings in plain words', () => {
  const codes = (m: PilotMapping, t: ParsedTable) => estimatePilot(t, m).warnings.map((w) => w.code);

  it('none for a large clean file with a reliable pretest', () => {
    const f: PilotFixture = { seed: 1, nProgramme: 120, nComparison: 150, items: 8, interItem: 0.4, retest: true, posttest: true };
    expect(estimatePilot(pilotFixtureTable(f), pilotFixtureMapping(f)).warnings).toEqual([]);
  });
  it('alpha below .70 (common practice threshold)', () => {
    const f: PilotFixture = { seed: 2, nProgramme: 200, nComparison: 200, items: 3, interItem: 0.15 };
    const est = estimatePilot(pilotFixtureTable(f), pilotFixtureMapping(f));
    expect(est.reliability.alpha!.value).toBeLessThan(0.7);
    const w = est.warnings.find((x) => x.code === 'alpha-below-0.7')!;
    expect(w.message).toMatch(/^Cronbach's alpha is \.\d\d \(within groups\), below \.70, the usual floor for comparing groups \(common practice\)/);
  });
  it('fewer than 30 in a group, naming the group and its n', () => {
    const f: PilotFixture = { seed: 4, nProgramme: 25, nComparison: 80, items: 4, interItem: 0.5 };
    const est = estimatePilot(pilotFixtureTable(f), pilotFixtureMapping(f));
    expect(est.warnings.map((w) => w.code)).toEqual(['small-group']);
    expect(est.warnings[0]!.message).toMatch(/^The programme group \("programme"\) has 25 usable rows, fewer than 30/);
  });
  it('an item with a negative corrected item–total correlation: likely reverse-keyed', () => {
    const f: PilotFixture = { seed: 6, nProgramme: 100, nComparison: 100, items: 5, interItem: 0.4 };
    const t = pilotFixtureTable(f);
    for (const r of t.rows) r[4] = String(10 - Number(r[4])); // q4 scored the other way round
    const est = estimatePilot(t, pilotFixtureMapping(f));
    expect(est.itemTotal![3]!.correctedCorrelation).toBeLessThan(0);
    const w = est.warnings.find((x) => x.code === 'reverse-keyed-item')!;
    expect(w.message).toMatch(/^Item "q4" \(r = −\.\d\d\) correlates negatively with the rest of the items .* probably reverse-keyed/);
  });
  it('a group value with no usable rows, and several values pooled as the comparison group', () => {
    const f: PilotFixture = { seed: 7, nProgramme: 40, nComparison: 40, items: 3, interItem: 0.5 };
    const t = pilotFixtureTable(f);
    t.rows.push(['withdrawn', '', '1', '2'], ['withdrawn', '1', '', '2']);
    expect(codes(pilotFixtureMapping(f), t)).toEqual(['group-value-no-rows', 'several-comparison-values']);
    const est = estimatePilot(t, pilotFixtureMapping(f));
    expect(est.warnings[0]!.message).toBe(
      'The group value "withdrawn" has 2 rows in the file but none with a complete pretest, so it adds nothing to the comparison group.',
    );
    expect(est.groups.comparisonValue).toBe('comparison, withdrawn');
    expect(est.groups.comparison.n).toBe(40);
  });
});

describe('estimatePilot on 100,000 rows', () => {
  // Correctness at scale (the work is two linear passes; speed is not timed in unit tests).
  // Tolerance: 4 asymptotic SEs of alpha (van Zyl, Neudecker & Nel 2000; from memory).
  it('reads and estimates a 100,000-row file; alpha within 4 SEs of Spearman–Brown of r', () => {
    const f: PilotFixture = { seed: 99, nProgramme: 40_000, nComparison: 60_000, items: 8, interItem: 0.3, gap: -1, posttest: true, decimals: 3 };
    const text = toCsv(pilotFixtureTable(f));
    const est = estimatePilot(parseDelimitedText(text), pilotFixtureMapping(f), 'large.csv');
    expect(est.rowsUsed).toBe(100_000);
    const target = spearmanBrown(0.3, 8);
    const se = Math.sqrt((2 * 8 * (1 - target) ** 2) / (7 * 99_998));
    expect(Math.abs(est.reliability.alpha!.value - target)).toBeLessThan(4 * se + 1e-3); // + rounding to 3 decimals
  });
});
