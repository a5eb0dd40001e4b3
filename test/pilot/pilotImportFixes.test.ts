import stdFQuantile from '@stdlib/stats-base-dists-f-quantile';
import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { estimatePilot } from '../../src/pilot/estimatePilot';
import { parseDelimitedText } from '../../src/pilot/parseDelimitedText';
import { applyPilotOffer, pilotPlanUpdate, pilotReliabilityOptions } from '../../src/pilot/pilotPlanUpdate';
import type { ParsedTable, PilotMapping } from '../../src/pilot/types';
import { guessProgrammeValue, mappingFromDraft, parseScale } from '../../src/state/pilotSlice';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';
import { errorOf } from './errorOf';
import { pilotFixtureMapping, pilotFixtureTable, type PilotFixture } from './pilotFixtures';

// Invented data only. Each number is checked against a computation written out here, from the
// published formula named beside it, or against an independent library (simple-statistics, @stdlib).

/** A seeded invented Likert file: k items scored 1–6, the items in `reversed` keyed the other way. */
function likertTable(seed: number, n: number, k: number, reversed: number[]): { table: ParsedTable; keyed: number[][]; groups: string[] } {
  const rng = Xoshiro128StarStar.forReplication(seed, 0);
  const u = () => (rng.nextUint32() + 0.5) / 4294967296;
  const columns = ['id', 'grp', ...Array.from({ length: k }, (_, j) => `A${j + 1}`)];
  const rows: string[][] = [];
  const keyed: number[][] = Array.from({ length: k }, () => []);
  const groups: string[] = [];
  for (let i = 0; i < n; i++) {
    const g = i % 3 === 0 ? 'course' : 'comparison';
    const trait = u() * 4 + (g === 'course' ? 0.5 : 0); // a person's level, 0–4.5
    const row = [String(i + 1), g];
    for (let j = 0; j < k; j++) {
      const score = Math.max(1, Math.min(6, Math.round(1 + trait + (u() - 0.5) * 2.5))); // agreeing direction, 1–6
      keyed[j]!.push(score);
      row.push(String(reversed.includes(j) ? 7 - score : score)); // as written in the file
    }
    rows.push(row);
    groups.push(g);
  }
  return { table: { columns, rows, delimiter: ',', hasHeader: true }, keyed, groups };
}

/** Cronbach's (1951) alpha, eq. 2: k/(k−1)·(1 − Σ var(item)/var(total)), on scores centred within their group (computed here). */
function pooledWithinAlpha(items: number[][], groups: string[]): number {
  const centre = (x: number[]) => {
    const means = new Map<string, number>();
    for (const g of new Set(groups)) means.set(g, ss.mean(x.filter((_, i) => groups[i] === g)));
    return x.map((v, i) => v - means.get(groups[i]!)!);
  };
  const c = items.map(centre);
  const total = c[0]!.map((_, i) => c.reduce((s, x) => s + x[i]!, 0));
  const k = items.length;
  const sq = (x: number[]) => x.reduce((s, v) => s + v * v, 0);
  return (k / (k - 1)) * (1 - c.reduce((s, x) => s + sq(x), 0) / sq(total));
}

describe('reverse-keyed items (maximum + minimum − score)', () => {
  const { table, keyed, groups } = likertTable(11, 60, 5, [1, 3]);
  const base: PilotMapping = { group: 'grp', programmeValue: 'course', pretest: { kind: 'items', columns: ['A1', 'A2', 'A3', 'A4', 'A5'], combine: 'sum' } };
  const reversedMapping: PilotMapping = {
    ...base,
    pretest: { kind: 'items', columns: ['A1', 'A2', 'A3', 'A4', 'A5'], combine: 'sum', reverse: { columns: ['A2', 'A4'], minimum: 1, maximum: 6 } },
  };

  it('alpha on the reversed items equals Cronbach (1951) eq. 2 computed here on the items keyed one way', () => {
    const est = estimatePilot(table, reversedMapping);
    const expected = pooledWithinAlpha(keyed, groups);
    expect(expected).toBeGreaterThan(0.6); // the invented items do agree once keyed one way
    expect(Math.abs(est.reliability.alpha!.value - expected)).toBeLessThan(1e-12);
    // Without reversing, the two reverse-keyed items pull alpha down and are flagged.
    const raw = estimatePilot(table, base);
    expect(raw.reliability.alpha!.value).toBeLessThan(expected - 0.3);
    expect(raw.warnings.map((w) => w.code)).toContain('reverse-keyed-item');
    expect(est.warnings.map((w) => w.code)).not.toContain('reverse-keyed-item');
  });

  it("the interval is Feldt's (1965): 1 − (1 − α)·F(.975 and .025; d, d(k − 1)), d = N − 2, F quantiles from @stdlib", () => {
    const a = estimatePilot(table, reversedMapping).reliability.alpha!;
    const d = 60 - 2;
    const k = 5;
    expect(a.lower).toBeCloseTo(1 - (1 - a.value) * stdFQuantile(0.975, d, d * (k - 1)), 6);
    expect(a.upper).toBeCloseTo(1 - (1 - a.value) * stdFQuantile(0.025, d, d * (k - 1)), 6);
  });

  it('the pretest mean is that of the reversed scores (a hand-reversed file gives the same estimates)', () => {
    const byHand: ParsedTable = { ...table, rows: table.rows.map((r) => r.map((c, j) => (j === 3 || j === 5 ? String(7 - Number(c)) : c))) };
    const a = estimatePilot(table, reversedMapping);
    const b = estimatePilot(byHand, base);
    expect(a.groups).toEqual(b.groups);
    expect(a.reliability).toEqual(b.reliability);
    expect(a.mapping!.pretest).toEqual(reversedMapping.pretest); // the reversal is recorded with the estimates
  });

  it('refuses, naming the column and row: a score outside the scale, an item to reverse that is not an item, a scale upside down', () => {
    const bad: ParsedTable = { ...table, rows: table.rows.map((r, i) => (i === 4 ? r.map((c, j) => (j === 3 ? '9' : c)) : r)) };
    const e1 = errorOf(() => estimatePilot(bad, reversedMapping));
    expect(e1).toMatchObject({ code: 'out-of-scale', column: 'A2', row: 6 });
    expect(e1.message).toBe('Item "A2" is to be reversed on the scale 1 to 6, but row 6 holds 9, outside that scale. Check the scale\'s lowest and highest possible scores, or the cell.');
    const e2 = errorOf(() => estimatePilot(table, { ...base, pretest: { kind: 'items', columns: ['A1', 'A2'], combine: 'sum', reverse: { columns: ['A3'], minimum: 1, maximum: 6 } } }));
    expect(e2).toMatchObject({ code: 'bad-mapping', column: 'A3' });
    expect(e2.message).toMatch(/Only pretest items can be reversed, and "A3" is not one of them/);
    const e3 = errorOf(() => estimatePilot(table, { ...base, pretest: { kind: 'items', columns: ['A1', 'A2'], combine: 'sum', reverse: { columns: ['A2'], minimum: 6, maximum: 1 } } }));
    expect(e3.message).toMatch(/lowest possible and highest possible|lowest first and below the highest.*got 6 to 1/);
  });

  it('the planner reads the scale as typed and says plainly what is wrong, keeping the text', () => {
    expect(parseScale('1', '6')).toEqual({ minimum: 1, maximum: 6 });
    expect(parseScale('', '6')).toEqual({ message: 'To reverse items, give the lowest and highest possible score of an item (e.g. 1 and 6).' });
    expect(parseScale('one', '6')).toEqual({ message: 'The lowest possible score must be a number, e.g. 1; got “one”.' });
    expect(parseScale('6', '1')).toEqual({ message: 'The lowest possible score (6) must be below the highest (1).' });
  });
});

describe('long files: one row per person per occasion', () => {
  const f: PilotFixture = { seed: 31, nProgramme: 70, nComparison: 90, items: 0, interItem: 0.5, gap: -0.5, retest: true, posttest: true };
  const wide = pilotFixtureTable(f);
  const col = (name: string) => wide.columns.indexOf(name);
  /** The same people written long: three rows each, occasions in a scrambled order, people kept in order. */
  const longTable = (): ParsedTable => {
    const rows: string[][] = [];
    wide.rows.forEach((r, i) => {
      const occ: Array<[string, string]> = [
        ['before', r[col('score')]!],
        ['again', r[col('retest')]!],
        ['after', r[col('posttest')]!],
      ];
      const order = i % 3 === 0 ? [2, 0, 1] : i % 3 === 1 ? [1, 2, 0] : [0, 1, 2];
      for (const o of order) rows.push([`P${i + 1}`, r[0]!, occ[o]![0], occ[o]![1]]);
    });
    return { columns: ['person', 'group', 'wave', 'score'], rows, delimiter: ',', hasHeader: true };
  };
  const longMapping: PilotMapping = {
    group: 'group',
    programmeValue: 'programme',
    pretest: { kind: 'total', column: 'score' },
    layout: { kind: 'long', id: 'person', occasion: 'wave', pretestOccasion: 'before', retestOccasion: 'again', posttestOccasion: 'after' },
  };

  it('gives the same estimates as the same people written one row each', () => {
    const a = estimatePilot(longTable(), longMapping);
    const b = estimatePilot(wide, pilotFixtureMapping(f));
    expect(a.groups).toEqual(b.groups);
    expect(a.gap).toEqual(b.gap);
    expect(a.reliability.testRetest).toEqual(b.reliability.testRetest);
    expect(a.prePostCorrelation).toEqual(b.prePostCorrelation);
    expect(a.longFile).toEqual({ rows: 480, people: 160 });
    expect(a.droppedReason).toMatch(/^Long file: 480 rows gathered into 160 people by "person"/);
    expect(a.mapping!.layout).toEqual(longMapping.layout);
  });

  it('a person with two pretest rows, or two group labels, or an occasion not in the file: refused, naming rows and values', () => {
    const dup = longTable();
    dup.rows.push(['P1', 'programme', 'before', '3']);
    expect(errorOf(() => estimatePilot(dup, longMapping)).message).toMatch(/^Person "P1" has two rows for the pretest occasion "before": rows \d+ and 482\./);
    const clash = longTable();
    clash.rows[1] = [clash.rows[1]![0]!, 'comparison', clash.rows[1]![2]!, clash.rows[1]![3]!];
    expect(errorOf(() => estimatePilot(clash, longMapping)).message).toMatch(/^Person "P1" has the group "programme" in row 2 but "comparison" in row 3/);
    const e = errorOf(() => estimatePilot(longTable(), { ...longMapping, layout: { ...longMapping.layout!, posttestOccasion: 'end' } }));
    expect(e).toMatchObject({ code: 'long-layout', column: 'wave' });
    expect(e.message).toBe('The posttest occasion "end" does not occur in the occasion column "wave". The values found are "after" (160 rows), "before" (160 rows), "again" (160 rows).');
  });

  it('items in a long file: alpha from the pretest rows, the posttest is the items combined at the posttest occasion', () => {
    const g = pilotFixtureTable({ seed: 32, nProgramme: 40, nComparison: 50, items: 4, interItem: 0.4 });
    const rows: string[][] = [];
    g.rows.forEach((r, i) => {
      rows.push([`id${i}`, r[0]!, 'pre', ...r.slice(1, 5)]);
      rows.push([`id${i}`, r[0]!, 'post', ...r.slice(1, 5).map((c) => String(Number(c) + 1))]);
    });
    const t: ParsedTable = { columns: ['id', 'group', 'when', 'q1', 'q2', 'q3', 'q4'], rows, delimiter: ',', hasHeader: true };
    const est = estimatePilot(t, {
      group: 'group',
      programmeValue: 'programme',
      pretest: { kind: 'items', columns: ['q1', 'q2', 'q3', 'q4'], combine: 'sum' },
      layout: { kind: 'long', id: 'id', occasion: 'when', pretestOccasion: 'pre', posttestOccasion: 'post' },
    });
    const wideEst = estimatePilot(g, pilotFixtureMapping({ seed: 32, nProgramme: 40, nComparison: 50, items: 4, interItem: 0.4 }));
    expect(est.reliability.alpha!.value).toBeCloseTo(wideEst.reliability.alpha!.value, 12);
    // posttest = pretest sum + 4 exactly (up to rounding of the written cells): r = 1, same SD.
    expect(est.prePostCorrelation!.value).toBeCloseTo(1, 9);
    expect(est.groups.comparison.posttestSD!).toBeCloseTo(est.groups.comparison.pretestSD, 9);
  });

  it('the planner asks for what a long file needs before estimating', () => {
    const draft = {
      group: 'group', programmeValue: 'programme', pretestKind: 'total' as const, pretestColumn: 'score', itemColumns: [], combine: 'sum' as const,
      retest: '', posttest: '', reverseColumns: [], scaleMin: '', scaleMax: '', layout: 'long' as const,
      idColumn: 'person', occasionColumn: '', pretestOccasion: '', retestOccasion: '', posttestOccasion: '',
    };
    expect(mappingFromDraft(draft)).toEqual({ message: 'Choose the column that says which occasion each row holds.' });
    expect(mappingFromDraft({ ...draft, occasionColumn: 'wave', pretestOccasion: 'before', posttestOccasion: 'after' })).toEqual({
      mapping: { ...longMapping, layout: { kind: 'long', id: 'person', occasion: 'wave', pretestOccasion: 'before', posttestOccasion: 'after' } },
    });
  });
});

describe("the two groups' pre–post correlations are shown side by side, not silently merged", () => {
  it("Fisher's (1921) z for two independent correlations, computed here from simple-statistics' correlations", () => {
    const f: PilotFixture = { seed: 41, nProgramme: 120, nComparison: 150, items: 0, interItem: 0.5, posttest: true };
    const t = pilotFixtureTable(f);
    const est = estimatePilot(t, pilotFixtureMapping(f));
    const r = (g: string) => {
      const rows = t.rows.filter((x) => x[0] === g);
      return ss.sampleCorrelation(rows.map((x) => Number(x[1])), rows.map((x) => Number(x[2])));
    };
    const rp = r('programme');
    const rc = r('comparison');
    const z = (Math.atanh(rp) - Math.atanh(rc)) / Math.sqrt(1 / (120 - 3) + 1 / (150 - 3));
    const b = est.prePostByGroup!;
    expect(b.programme.value).toBeCloseTo(rp, 12);
    expect(b.comparison.value).toBeCloseTo(rc, 12);
    expect(b.z).toBeCloseTo(z, 10);
    // simple-statistics looks Φ up in a table at z to 2 decimals: agreement to about .005.
    expect(b.p).toBeCloseTo(2 * (1 - ss.cumulativeStdNormalProbability(Math.abs(z))), 2);
    expect(b.used).toBe('comparison');
  });

  it('.78 against .64 (n = 104 and 136): said to differ, both shown, the comparison group’s used', () => {
    // Build groups whose correlations are close to .78 and .64: y = r·x + √(1 − r²)·e on centred, orthogonalised draws.
    const rng = Xoshiro128StarStar.forReplication(7, 0);
    const u = () => (rng.nextUint32() + 0.5) / 4294967296;
    const normal = () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
    const rows: string[][] = [];
    for (const [g, n, r] of [['support', 104, 0.78], ['comparison', 136, 0.64]] as const) {
      for (let i = 0; i < n; i++) {
        const x = normal();
        rows.push([g, String(50 + 10 * x), String(50 + 10 * (r * x + Math.sqrt(1 - r * r) * normal()))]);
      }
    }
    const est = estimatePilot({ columns: ['g', 'pre', 'post'], rows, delimiter: ',', hasHeader: true }, {
      group: 'g', programmeValue: 'support', pretest: { kind: 'total', column: 'pre' }, posttest: 'post',
    });
    const b = est.prePostByGroup!;
    expect(Math.abs(b.difference)).toBeGreaterThan(0.1);
    expect(b.differ).toBe(true);
    expect(b.message).toMatch(/in the programme group \(n = 104\) and .* in the comparison group \(n = 136\)/);
    expect(b.message).toMatch(/They differ, so one slope does not fit both groups/);
    expect(b.message).toMatch(/The plan uses the comparison group's/);
    // And into the plan: the comparison group's value, with the other group's in the note.
    const { plan } = pilotPlanUpdate(demoPlan(), est);
    expect(plan.outcome.prePostCorrelation).toBe(est.groups.comparison.prePostCorrelation);
    expect(plan.provenance!['outcome.prePostCorrelation']!.note).toMatch(/programme group's \.\d\d differs; not merged/);
  });
});

describe('which reliability goes into the plan, and the corrected ANCOVA asked about', () => {
  const f: PilotFixture = { seed: 21, nProgramme: 110, nComparison: 130, items: 8, interItem: 0.35, gap: -0.6, retest: true, posttest: true };
  const est = estimatePilot(pilotFixtureTable(f), pilotFixtureMapping(f), 'cohort.csv');

  it('offers alpha and test–retest, suggests test–retest (day-to-day error is what regresses; common practice), each saying why', () => {
    const options = pilotReliabilityOptions(est);
    expect(options.map((o) => [o.source, o.value, o.recommended])).toEqual([
      ['alpha', est.reliability.alpha!.value, false],
      ['test-retest', est.reliability.testRetest!.value, true],
    ]);
    expect(options[1]!.why).toMatch(/day-to-day ups and downs/);
    // Without a retest, alpha is the one suggested, and says what it leaves out.
    const noRetest = estimatePilot(pilotFixtureTable({ ...f, retest: false }), pilotFixtureMapping({ ...f, retest: false }));
    expect(pilotReliabilityOptions(noRetest).map((o) => [o.source, o.recommended])).toEqual([['alpha', true]]);
  });

  it('writes the chosen one, with its own note and interval', () => {
    const { plan, reliabilitySource } = pilotPlanUpdate(demoPlan(), est, { reliability: 'test-retest' });
    expect(reliabilitySource).toBe('test-retest');
    expect(plan.pretest.reliability).toBe(est.reliability.testRetest!.value);
    expect(plan.provenance!['pretest.reliability']!.note).toMatch(/test–retest correlation within groups = \.\d\d \(95% CI .* Fisher z\)/);
    expect(plan.provenance!['pretest.reliability']!.interval).toEqual({
      lower: est.reliability.testRetest!.lower,
      upper: est.reliability.testRetest!.upper,
      level: 0.95,
    });
    expect(pilotPlanUpdate(demoPlan(), est, { reliability: 'alpha' }).plan.pretest.reliability).toBe(est.reliability.alpha!.value);
  });

  it('never changes the corrected ANCOVA silently: it asks, and applyPilotOffer writes that one value', () => {
    const before = demoPlan();
    const update = pilotPlanUpdate(before, est, { reliability: 'alpha' });
    expect(update.plan.analysis).toEqual(before.analysis);
    expect(update.offers).toHaveLength(1);
    const offer = update.offers[0]!;
    expect(offer).toMatchObject({ path: 'analysis.assumedReliability', current: before.analysis.assumedReliability, proposed: est.reliability.alpha!.value });
    expect(offer.message).toMatch(/^The corrected ANCOVA still assumes a reliability of \.\d{3}, but the pretest reliability is now \.\d{3} from the pilot\./);
    const accepted = applyPilotOffer(update.plan, offer);
    expect(accepted.analysis.assumedReliability).toBe(est.reliability.alpha!.value);
    expect(accepted.provenance!['analysis.assumedReliability']!.note).toMatch(/also assumed by the corrected ANCOVA/);
    expect(validatePlan(accepted).ok).toBe(true);
    // Nothing to ask when the two already agree.
    const same = structuredClone(before);
    same.analysis.assumedReliability = est.reliability.alpha!.value;
    expect(pilotPlanUpdate(same, est, { reliability: 'alpha' }).offers).toEqual([]);
  });
});

describe('the programme value is never guessed as the comparison group', () => {
  it('picks a value that reads like a programme, else none (the researcher chooses)', () => {
    expect(guessProgrammeValue(['comparison', 'reading support'])).toBe('reading support');
    expect(guessProgrammeValue(['control', 'treatment'])).toBe('treatment');
    expect(guessProgrammeValue(['no programme', 'programme'])).toBe('programme');
    expect(guessProgrammeValue(['A', 'B'])).toBe('');
    expect(guessProgrammeValue(['comparison', 'usual teaching'])).toBe('');
  });
});

describe('meanward pilot --reverse … --scale …', () => {
  const csv = 'id,grp,A1,A2,A3,A4\n1,course,2,5,1,6\n2,course,3,4,2,5\n3,course,5,2,4,3\n4,comparison,1,6,2,5\n5,comparison,4,3,3,4\n6,comparison,6,1,5,2\n';
  async function run(argv: string[]) {
    let stdout = '';
    let stderr = '';
    const code = await main(argv, { stdout: { write: (s: string) => (stdout += s) }, stderr: { write: (s: string) => (stderr += s) } });
    return { code, stdout, stderr };
  }
  it('reverses the named items and gives the estimates of the reversed file', async () => {
    const { mkdtempSync, writeFileSync } = await import('node:fs');
    const { join } = await import('node:path');
    const { tmpdir } = await import('node:os');
    const dir = mkdtempSync(join(tmpdir(), 'meanward-rev-'));
    writeFileSync(join(dir, 'rev.csv'), csv);
    const r = await run(['pilot', join(dir, 'rev.csv'), '--group', 'grp', '--programme', 'course', '--items', 'A1,A2,A3,A4', '--reverse', 'A2,A4', '--scale', '1-6', '--json']);
    expect(r.code).toBe(0);
    const got = JSON.parse(r.stdout);
    const byHand = csv.split('\n').map((line, i) => (i === 0 || line === '' ? line : line.split(',').map((c, j) => (j === 3 || j === 5 ? String(7 - Number(c)) : c)).join(',')));
    const expected = estimatePilot(parseDelimitedText(byHand.join('\n')), { group: 'grp', programmeValue: 'course', pretest: { kind: 'items', columns: ['A1', 'A2', 'A3', 'A4'], combine: 'sum' } });
    expect(got.reliability.alpha.value).toBe(expected.reliability.alpha!.value);
    expect(got.groups.programme.pretestMean).toBe(expected.groups.programme.pretestMean);
  });
  it('plain errors for bad values, exit 2', async () => {
    const base = ['pilot', 'x.csv', '--group', 'grp', '--programme', 'course', '--items', 'A1,A2,A3'];
    const a = await run([...base, '--reverse', 'A1,A3', '--scale', '6-1']);
    expect(a.code).toBe(2);
    expect(a.stderr).toMatch(/--scale: the lowest possible score \(6\) must be below the highest \(1\)/);
    const b = await run([...base, '--reverse', 'A1,A9', '--scale', '1-6']);
    expect(b.stderr).toMatch(/--reverse names "A9", not among the --items columns \(A1, A2, A3\)/);
    const c = await run([...base, '--reverse', 'A1']);
    expect(c.stderr).toMatch(/--reverse needs --scale MIN-MAX/);
    const d = await run([...base, '--reverse', 'A1', '--scale', 'one to six']);
    expect(d.stderr).toMatch(/--scale must be the lowest and highest possible item scores, e.g. "--scale 1-6"; got "one to six"/);
    const e = await run([...base, '--id', 'person']);
    expect(e.stderr).toMatch(/A long file needs --occasion COLUMN/);
  });
});
