import { describe, expect, it } from 'vitest';
import { pretestChartData } from '../../src/charts/pretestChartData';
import { pretestChartText } from '../../src/charts/pretestChartText';
import { estimatesChartData } from '../../src/charts/estimatesChartData';
import { estimatesChartText } from '../../src/charts/estimatesChartText';
import { sensitivityChartData } from '../../src/charts/sensitivityChartData';
import { sensitivityChartText } from '../../src/charts/sensitivityChartText';
import { balanceChartData } from '../../src/charts/balanceChartData';
import { balanceChartText } from '../../src/charts/balanceChartText';
import type { ChartText } from '../../src/charts/chartTypes';
import { closedFormInput, simulatedInput } from './fixtures';

function wellFormed(t: ChartText): void {
  const all = [t.title, ...t.sentences, t.table.caption, ...t.table.columns, ...t.table.rows.flat()].join(' ');
  expect(all).not.toMatch(/NaN|Infinity|undefined|null/);
  for (const row of t.table.rows) expect(row).toHaveLength(t.table.columns.length);
}

describe('text alternatives', () => {
  it('pretest: states the hidden true-score gap (Kelley; demo -2.50 points)', () => {
    // Thorndike 1942 closed form (1 - rho) Delta = 0.25 × -10 = -2.5 (computed).
    const t = pretestChartText(pretestChartData(closedFormInput()));
    wellFormed(t);
    expect(t.sentences.join(' ')).toContain('a hidden gap of -2.50 points');
    expect(t.table.rows[1]).toEqual(['Comparison', '54.0', '0.75', '44.0', '46.5']);
    const s = pretestChartText(pretestChartData(simulatedInput()));
    wellFormed(s);
    expect(s.table.columns).toContain('Example study: true mean');
  });

  it('estimates: one sentence per analysis with expected estimate and 95% range', () => {
    const t = estimatesChartText(estimatesChartData(closedFormInput()));
    wellFormed(t);
    // Lord 1960 (computed): ANCOVA expected estimate 2.5 + 0.8 × 0.25 × (-10) = 0.50.
    expect(t.sentences.some((x) => x.includes('expected estimate 0.50 points'))).toBe(true);
    expect(t.table.rows).toHaveLength(4);
    const s = estimatesChartText(estimatesChartData(simulatedInput()));
    wellFormed(s);
    expect(s.table.columns).toContain('Monte Carlo SE');
    expect(s.table.rows.every((r) => r.at(-1) === '300')).toBe(true);
  });

  it('sensitivity: names the break-even reliability and tabulates the curves', () => {
    // Break-even on the reference-reliability axis 0.922 (computed in sensitivityChartData.test.ts).
    const t = sensitivityChartText(sensitivityChartData(closedFormInput(), 'reliability'));
    wellFormed(t);
    expect(t.sentences.join(' ')).toContain('pretest reliability 0.92');
    expect(t.table.rows[0]![0]).toBe('0.30');
    expect(t.table.rows.at(-1)![0]).toBe('1.00');
    wellFormed(sensitivityChartText(sensitivityChartData(closedFormInput(), 'pretestGap')));
  });

  it('balance: says the groups look balanced but are not (true SMD -0.29 beyond 0.25)', () => {
    // Stuart 2010 / Austin 2009 thresholds (common practice); closed form -0.289 (expectedBalance).
    const t = balanceChartText(balanceChartData(closedFormInput()));
    wellFormed(t);
    const text = t.sentences.join(' ');
    expect(text).toContain('-0.29 after (beyond the 0.25 threshold)');
    expect(text).toContain('look balanced on the pretest but remain unbalanced');
  });
});
