import fc from 'fast-check';
import type { PilotMapping } from '../../src/pilot/types';

/** One generated pilot file (invented numbers) and the mapping to read it with. */
export interface PilotCase {
  text: string;
  mapping: PilotMapping;
  describe: string;
}

/**
 * Seeded pilot files for the fuzz suites: two groups of 1 to 25 rows, 1 to 5
 * item columns (a common person factor plus noise), an optional retest and
 * posttest, scores scaled from 1e-320 to 1e300 around offsets up to 1e15, with
 * a few cells replaced by missing codes, text, numbers beyond the 1e15 limit
 * or decimal commas, and now and then a column mapped twice.
 */
export const pilotCase: fc.Arbitrary<PilotCase> = fc
  .record({
    nP: fc.integer({ min: 1, max: 25 }),
    nC: fc.integer({ min: 1, max: 25 }),
    k: fc.integer({ min: 1, max: 5 }),
    magnitude: fc.oneof(
      fc.constantFrom(5e-324, 1e-320, 1e-300, 1e-160, 1e-100, 1e-20, 1e-6, 1e12, 1e15, 1e16, 1e300),
      fc.constantFrom(0.01, 1, 3, 10, 100, 1e6),
    ),
    offset: fc.constantFrom(0, 1, 50, 1e6, 1e15, -1e15),
    noise: fc.array(fc.double({ min: -3, max: 3, noNaN: true }), { minLength: 97, maxLength: 97 }),
    bad: fc.oneof(
      fc.constant([]),
      fc.array(fc.record({ at: fc.nat(), cell: fc.constantFrom('', 'NA', 'abc', '1e400', '-', '1,5', ' 3 ', '2e15', '\u001b[2J') }), {
        maxLength: 4,
      }),
    ),
    pretest: fc.constantFrom('items', 'items-mean', 'total'),
    retest: fc.boolean(),
    posttest: fc.boolean(),
    twice: fc.boolean(),
  })
  .map((v) => {
    const items = Array.from({ length: v.k }, (_, j) => `q${j + 1}`);
    const header = ['group', ...items, 'retest', 'post'];
    const rows: string[][] = [];
    const n = v.nP + v.nC;
    for (let i = 0; i < n; i++) {
      const person = v.noise[i % 97]!;
      const score = (j: number) => String(v.offset + v.magnitude * (person + 0.7 * v.noise[(i * 5 + j * 3 + 11) % 97]!));
      rows.push([i < v.nP ? 'club' : 'rest', ...items.map((_, j) => score(j)), score(17), score(23)]);
    }
    for (const { at, cell } of v.bad) {
      if (rows.length === 0) break;
      const r = rows[at % rows.length]!;
      r[1 + (at % (r.length - 1))] = cell;
    }
    const quote = (c: string) => (/[",\n]/.test(c) ? `"${c.replace(/"/g, '""')}"` : c);
    const text = `${[header, ...rows].map((r) => r.map(quote).join(',')).join('\n')}\n`;
    const pretest: PilotMapping['pretest'] =
      v.pretest === 'total'
        ? { kind: 'total', column: 'q1' }
        : { kind: 'items', columns: v.twice && v.k >= 2 ? [...items, 'q1'] : items, combine: v.pretest === 'items-mean' ? 'mean' : 'sum' };
    const mapping: PilotMapping = {
      group: 'group',
      programmeValue: 'club',
      pretest,
      ...(v.retest ? { retest: 'retest' } : {}),
      ...(v.posttest ? { posttest: v.twice && v.pretest === 'total' ? 'q1' : 'post' } : {}),
    };
    return { text, mapping, describe: `n=${v.nP}+${v.nC}, k=${v.k}, scale=${v.magnitude}, offset=${v.offset}, ${v.pretest}, bad=${JSON.stringify(v.bad)}` };
  });
