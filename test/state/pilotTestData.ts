/**
 * Invented pilot files for the pilot-panel tests (no real people): a seeded
 * two-group sample from the classical test theory model, written as CSV text.
 * Each person has a true pretest score T ~ N(mu_g, 8²); each of k items is
 * T / k + N(0, 2²) error; the retest repeats the items with fresh error; the
 * posttest is 0.8 T + growth + N(0, 6²). Same options → the same text.
 */
import { NormalSampler } from '../../src/sim/normalSampler';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';

export interface InventedPilotOptions {
  seed: number;
  programme: number;
  comparison: number;
  /** Number of item columns (item1 … itemK); 0 for a total-score column only. */
  items: number;
  retest?: boolean;
  posttest?: boolean;
  /** Put this text into one cell (1-based data row, column name) to make a bad file. */
  badCell?: { row: number; column: string; text: string };
  /** Separator, default ','. */
  delimiter?: ',' | '\t';
}

export interface InventedPilot {
  text: string;
  columns: string[];
  /** The data rows as numbers and labels (for independent reference computations). */
  rows: { group: 'programme' | 'comparison'; items: number[]; total: number; retest: number; posttest: number }[];
}

const round2 = (x: number) => Math.round(x * 100) / 100;

/** An invented pilot file. The first line says it is invented (a '#' comment line). */
export function inventedPilot(o: InventedPilotOptions): InventedPilot {
  const z = new NormalSampler(Xoshiro128StarStar.forReplication(o.seed, 0));
  const k = Math.max(o.items, 1);
  const rows: InventedPilot['rows'] = [];
  const draw = (group: 'programme' | 'comparison', mu: number, growth: number) => {
    const t = mu + 8 * z.next();
    const items = Array.from({ length: k }, () => round2(t / k + 2 * z.next()));
    const total = round2(items.reduce((s, x) => s + x, 0));
    const retest = round2(Array.from({ length: k }, () => t / k + 2 * z.next()).reduce((s, x) => s + x, 0));
    const posttest = round2(0.8 * t + growth + 6 * z.next());
    rows.push({ group, items, total, retest, posttest });
  };
  for (let i = 0; i < o.programme; i++) draw('programme', 44, 12);
  for (let i = 0; i < o.comparison; i++) draw('comparison', 52, 10);
  const columns = [
    'id',
    'group',
    ...(o.items > 0 ? Array.from({ length: o.items }, (_, j) => `item${j + 1}`) : ['pretest']),
    ...(o.retest ? ['retest'] : []),
    ...(o.posttest ? ['posttest'] : []),
  ];
  const sep = o.delimiter ?? ',';
  const lines = [`# Invented pilot data for Meanward's tests (seed ${o.seed}); not real people.`, columns.join(sep)];
  rows.forEach((r, i) => {
    const cells: Record<string, string> = { id: String(i + 1), group: r.group, pretest: String(r.total) };
    r.items.forEach((x, j) => (cells[`item${j + 1}`] = String(x)));
    cells.retest = String(r.retest);
    cells.posttest = String(r.posttest);
    if (o.badCell && o.badCell.row === i + 1) cells[o.badCell.column] = o.badCell.text;
    lines.push(columns.map((c) => cells[c]).join(sep));
  });
  return { text: `${lines.join('\n')}\n`, columns, rows };
}
