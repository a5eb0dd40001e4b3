import { normalQuantile } from '../../src/core/distributions';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';
import type { ParsedTable, PilotMapping } from '../../src/pilot/types';

/** Settings of a generated pilot table (seeded: same settings, same cells). */
export interface PilotFixture {
  seed: number;
  nProgramme: number;
  nComparison: number;
  /** Number of parallel items (≥ 2), or 0 for a single total-score column. */
  items: number;
  /** Within-group correlation between any two items (compound symmetry), in (0, 1). */
  interItem: number;
  /** Programme minus comparison, in within-group SDs of the common factor (added to every item). */
  gap?: number;
  /** Add a retest: the sum of k fresh parallel items on the same factor. */
  retest?: boolean;
  /** Add a posttest: factor + N(0, 1) noise. */
  posttest?: boolean;
  /** Round cells to this many decimals (default: full precision). */
  decimals?: number;
}

/**
 * A table of parallel items: item = √r·F + √(1−r)·E with F, E standard
 * normal within each group, so the within-group item covariance matrix is
 * compound symmetric with correlation r, and alpha's population value is
 * k r / (1 + (k − 1) r) (Cronbach 1951; Spearman–Brown). Cells are written
 * with String(x), which reads back to the same double (or rounded to `decimals`).
 */
export function pilotFixtureTable(f: PilotFixture): ParsedTable {
  // Normals by inversion of the engine's uniform generator (stable when the engine's sampler is tuned).
  const rng = Xoshiro128StarStar.forReplication(f.seed, 0);
  const z = { next: (): number => normalQuantile((rng.nextUint32() + 0.5) / 4294967296) };
  const k = f.items;
  const itemCols = Array.from({ length: Math.max(k, 1) }, (_, j) => (k === 0 ? 'score' : `q${j + 1}`));
  const columns = ['group', ...itemCols, ...(f.retest ? ['retest'] : []), ...(f.posttest ? ['posttest'] : [])];
  const rows: string[][] = [];
  const a = Math.sqrt(f.interItem);
  const b = Math.sqrt(1 - f.interItem);
  const cell = f.decimals === undefined ? String : (x: number) => x.toFixed(f.decimals);
  for (let i = 0; i < f.nProgramme + f.nComparison; i++) {
    const programme = i < f.nProgramme;
    const shift = programme ? (f.gap ?? 0) : 0;
    const factor = z.next();
    const row = [programme ? 'programme' : 'comparison'];
    for (let j = 0; j < Math.max(k, 1); j++) row.push(cell(shift + a * factor + b * z.next()));
    if (f.retest) {
      let s = 0;
      for (let j = 0; j < Math.max(k, 1); j++) s += shift + a * factor + b * z.next();
      row.push(cell(s));
    }
    if (f.posttest) row.push(cell(10 + 2 * shift + 3 * factor + 2 * z.next()));
    rows.push(row);
  }
  return { columns, rows, delimiter: ',', hasHeader: true };
}

/** The mapping matching pilotFixtureTable's columns. */
export function pilotFixtureMapping(f: PilotFixture, combine: 'sum' | 'mean' = 'sum'): PilotMapping {
  const k = f.items;
  return {
    group: 'group',
    programmeValue: 'programme',
    pretest: k === 0 ? { kind: 'total', column: 'score' } : { kind: 'items', columns: Array.from({ length: k }, (_, j) => `q${j + 1}`), combine },
    ...(f.retest ? { retest: 'retest' } : {}),
    ...(f.posttest ? { posttest: 'posttest' } : {}),
  };
}

/** The table as CSV text (header first). */
export function toCsv(t: ParsedTable, delimiter = ','): string {
  return [t.columns, ...t.rows].map((r) => r.join(delimiter)).join('\n');
}

/** A column of a table as numbers (NaN for empty cells). */
export function numbers(t: ParsedTable, column: string): number[] {
  const c = t.columns.indexOf(column);
  return t.rows.map((r) => (r[c]!.trim() === '' ? Number.NaN : Number(r[c])));
}
