// The estimates CSV. Checked against RFC 4180 text read back by papaparse's
// parser, against the simulation's own estimates (exact: a JavaScript number
// written with String() reads back to the same double), and against the OWASP
// CSV-injection guidance for text cells (common practice).
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { TWO_GROUP_ANALYSIS_IDS } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { ESTIMATE_COLUMNS, estimatesCsv, neutraliseCsvText } from '../../src/io/csvExport';
import { simulatePlan } from '../../src/sim/simulatePlan';
import type { SimulationResult } from '../../src/sim/types';

describe('neutraliseCsvText (OWASP CSV injection guidance; common practice)', () => {
  it.each([
    ['=SUM(A1:A9)', "'=SUM(A1:A9)"],
    ['+1+2', "'+1+2"],
    ['-2+3', "'-2+3"],
    ['@cmd', "'@cmd"],
    ['\tTAB', "'\tTAB"],
    ['\rCR', "'\rCR"],
  ])('prefixes %j with an apostrophe', (input, expected) => {
    expect(neutraliseCsvText(input)).toBe(expected);
  });

  it.each(['Falls study', 'a=b', '3 - 2', ''])('leaves ordinary text %j alone', (input) => {
    expect(neutraliseCsvText(input)).toBe(input);
  });
});

describe('estimatesCsv', () => {
  let sim: SimulationResult;
  let rows: Record<string, string>[];
  let text: string;

  beforeAll(() => {
    const plan = demoPlan();
    plan.title = '=HYPERLINK("http://example.invalid","click"), "quoted", and more';
    sim = simulatePlan(plan, { replications: 120, seed: 11 });
    text = estimatesCsv(sim);
    rows = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true }).data;
  });

  it('has one row per replication with the documented columns', () => {
    expect(rows).toHaveLength(120);
    expect(Object.keys(rows[0]!)).toEqual(['replication', 'seed', ...TWO_GROUP_ANALYSIS_IDS.map((id) => ESTIMATE_COLUMNS[id]), 'plan_title']);
    expect(rows.map((r) => Number(r.replication))).toEqual(Array.from({ length: 120 }, (_, i) => i + 1));
    expect(rows.every((r) => r.seed === '11')).toBe(true);
  });

  it('writes every estimate as a plain number equal to the simulated one (negative ones unprefixed)', () => {
    let negatives = 0;
    for (const id of TWO_GROUP_ANALYSIS_IDS) {
      rows.forEach((r, i) => {
        const cell = r[ESTIMATE_COLUMNS[id]]!;
        const v = sim.estimates[id]![i]!;
        // Tolerance: none, String(x) round-trips doubles exactly (ECMAScript Number::toString).
        expect(Number(cell)).toBe(v);
        expect(cell.startsWith("'")).toBe(false);
        if (v < 0) negatives++;
      });
    }
    // The demo plan's matched difference is biased downward, so negative estimates do occur here.
    expect(negatives).toBeGreaterThan(0);
  });

  it('neutralises the user-typed title and quotes it per RFC 4180', () => {
    expect(rows[0]!.plan_title).toBe(`'${sim.plan.title}`);
    // The raw line holds the title quoted, with inner quotes doubled (RFC 4180, section 2.7).
    expect(text.split('\r\n')[1]).toContain('"\'=HYPERLINK(""http://example.invalid"",""click""), ""quoted"", and more"');
  });

  it('leaves a cell empty where an analysis has no estimate (never NaN)', () => {
    const broken: SimulationResult = {
      ...sim,
      estimates: { ...sim.estimates, gainScore: [Number.NaN, ...sim.estimates.gainScore!.slice(1)] },
    };
    const out = estimatesCsv(broken);
    expect(out).not.toMatch(/NaN|Infinity/);
    const first = Papa.parse<Record<string, string>>(out, { header: true }).data[0]!;
    expect(first.gain_score).toBe('');
  });
});
