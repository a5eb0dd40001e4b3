// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import type { ChartInput } from '../../src/charts/chartTypes';
import {
  covariateBalanceChartData,
  covariateBalanceStatus,
  hasCovariateBalance,
  SMD_THRESHOLDS,
  VARIANCE_RATIO_RANGE,
} from '../../src/charts/covariateBalanceChartData';
import { covariateBalanceChartHeight, covariateBalanceChartSvgString } from '../../src/charts/covariateBalanceChartRender';
import { covariateBalanceChartText } from '../../src/charts/covariateBalanceChartText';
import { fmt } from '../../src/charts/svgHelpers';
import { analysePlan } from '../../src/core/analysePlan';
import type { Plan } from '../../src/core/plan';
import { simulatePlan } from '../../src/sim/simulatePlan';
import type { SimulationResult } from '../../src/sim/types';
import { inventedCovariatePlan } from '../inventedCovariatePlan';
import { closedFormInput } from './fixtures';

/** A drawn row's text, one space between its text elements (wrapped lines read as one). */
function linesOf(node: Element): string {
  return [...node.querySelectorAll('text')].map((t) => t.textContent).join(' ');
}

/** The shared invented plan, matched on the pretest alone unless told (so the covariates are not matched on). */
function covariatePlan(distance: 'pretest' | 'mahalanobis' = 'pretest'): Plan {
  return inventedCovariatePlan({ distance });
}

function closedForm(plan = covariatePlan()): ChartInput {
  return { plan, analytic: analysePlan(plan), simulation: null };
}

let cachedSim: SimulationResult | null = null;
/** 400 seeded replications of the Mahalanobis variant: Monte Carlo SEs of about 0.004 SMD. */
function simulated(): ChartInput & { simulation: SimulationResult } {
  const plan = covariatePlan('mahalanobis');
  cachedSim ??= simulatePlan(plan, { replications: 400, seed: 20261202 });
  return { plan, analytic: analysePlan(plan), simulation: cachedSim };
}

describe('covariateBalanceChartData', () => {
  it('applies only when core or the engine reports balance per covariate (never for a one-pretest plan)', () => {
    expect(hasCovariateBalance(closedFormInput())).toBe(false);
    expect(() => covariateBalanceChartData(closedFormInput())).toThrow(/no balance per covariate/);
    expect(hasCovariateBalance(closedForm())).toBe(true);
  });

  it("closed form: passes core's figures through unchanged, pretest first, unmeasured covariates included", () => {
    const input = closedForm();
    const d = covariateBalanceChartData(input);
    const expected = input.analytic.covariateBalance!;
    expect(d.source).toBe('closed-form');
    expect(d.replications).toBeNull();
    expect(d.rows.map((r) => r.name)).toEqual(['Pretest', 'Attendance', 'Motivation']);
    d.rows.forEach((r, i) => {
      const e = expected[i]!;
      // Exactly the same numbers (tolerance: none; no arithmetic in the transform).
      expect([r.observedBefore, r.observedAfter, r.trueBefore, r.trueAfter, r.varianceRatio]).toEqual([
        e.observedSMDBefore,
        e.observedSMDAfter,
        e.trueSMDBefore,
        e.trueSMDAfter,
        e.varianceRatioAfter,
      ]);
      expect(r.mcse).toBeNull();
    });
    expect(d.rows[2]).toMatchObject({ measured: false, exact: false });
    // Matching on the pretest leaves its observed SMD at 0 and its true SMD at
    // (1 − rho)·Delta / SD_T: demo rho .75, Delta −10, SD_T sqrt(75) → −0.28868
    // (Thorndike 1942; Kelley 1947; computed, as in balanceChartData.test). Tolerance 1e-4.
    expect(d.rows[0]!.observedAfter).toBe(0);
    expect(d.rows[0]!.trueAfter).toBeCloseTo(-0.28868, 4);
    // Observed SMD before = gap / SD (Stuart 2010): Attendance −5/10 = −0.5, Motivation −0.5/1 (computed). Tolerance 1e-12.
    expect(Math.abs(d.rows[1]!.observedBefore - -0.5)).toBeLessThan(1e-12);
    expect(Math.abs(d.rows[2]!.observedBefore - -0.5)).toBeLessThan(1e-12);
  });

  it('flags variance ratios outside 0.5 to 2 in the text, the table and the row, not as a column (Rubin 2001; Stuart 2010)', () => {
    expect(SMD_THRESHOLDS).toEqual([0.1, 0.25]);
    expect(VARIANCE_RATIO_RANGE).toEqual([0.5, 2]);
    const input = closedForm();
    const base = input.analytic.covariateBalance!;
    // Boundary cases of the rule (common practice: 0.5 and 2 themselves are acceptable).
    const ratios = [0.49, 0.5, 2.01];
    const analytic = { ...input.analytic, covariateBalance: base.map((b, i) => ({ ...b, varianceRatioAfter: ratios[i]! })) };
    const d = covariateBalanceChartData({ ...input, analytic });
    expect(d.rows.map((r) => r.varianceRatioOutside)).toEqual([true, false, true]);
    const text = covariateBalanceChartText(d);
    expect(text.sentences.join(' ')).toContain('Spread differs after matching (variance ratio outside 0.5–2): Pretest (0.49) and Motivation (2.01).');
    expect(text.table.columns.at(-1)).toBe('Variance ratio after');
    expect(text.table.rows.map((r) => r.at(-1))).toEqual(['0.49 (outside 0.5–2)', '0.50', '2.01 (outside 0.5–2)']);
    // The drawn chart notes the spread in the flagged rows only, in plain words with the trade's term.
    const svg = new DOMParser().parseFromString(covariateBalanceChartSvgString(d, 760), 'image/svg+xml');
    const rowText = (name: string) => linesOf(svg.querySelector(`[data-covariate="${name}"]`)!);
    expect(rowText('Pretest')).toContain('spread differs: variance ratio 0.49');
    expect(rowText('Attendance')).not.toContain('spread differs');
    expect(rowText('Motivation')).toContain('spread differs: variance ratio 2.01');
  });

  it('names what each row amounts to on the 0.1 convention (common practice: Austin 2009), including the boundary', () => {
    // |SMD| below 0.1 counts as balanced; 0.1 itself does not (Austin 2009: "less than 0.1").
    expect(covariateBalanceStatus({ measured: true, observedAfter: 0.0999, trueAfter: 0.1 })).toBe('hidden');
    expect(covariateBalanceStatus({ measured: true, observedAfter: -0.05, trueAfter: -0.0999 })).toBe('balanced');
    expect(covariateBalanceStatus({ measured: true, observedAfter: -0.1, trueAfter: 0 })).toBe('apart');
    expect(covariateBalanceStatus({ measured: false, observedAfter: 0, trueAfter: 0 })).toBe('unmeasured');
    // The invented plan matched on the pretest alone: the pretest looks balanced (observed 0) but its
    // true scores still differ by (1 − rho)·Delta / SD_T = −0.29 (Thorndike 1942; Kelley 1947, computed
    // above); Attendance is not matched on and stays apart; Motivation is never measured.
    const d = covariateBalanceChartData(closedForm());
    expect(d.rows.map((r) => r.status)).toEqual(['hidden', 'apart', 'unmeasured']);
    const t = covariateBalanceChartText(d);
    expect(t.table.rows.map((r) => r[1])).toEqual(['looks balanced, is not', 'still apart as measured', "out of matching's reach"]);
    const svg = new DOMParser().parseFromString(covariateBalanceChartSvgString(d, 760), 'image/svg+xml');
    expect(svg.querySelector('[data-covariate="Pretest"]')!.getAttribute('data-status')).toBe('hidden');
    expect(linesOf(svg.querySelector('[data-covariate="Pretest"]')!)).toContain('looks balanced, is not');
  });

  it('draws each variable as two lanes, as measured and true score, with the figures before and after matching', () => {
    const d = covariateBalanceChartData(closedForm());
    // The signed axis holds every figure and the ±0.2 around zero, in round tenths.
    const all = d.rows.flatMap((r) => [r.observedBefore, r.observedAfter, r.trueBefore, r.trueAfter]);
    expect(d.xMin).toBeLessThanOrEqual(Math.min(-0.2, ...all));
    expect(d.xMax).toBeGreaterThanOrEqual(Math.max(0.2, ...all));
    expect(Math.abs(d.xMin * 10 - Math.round(d.xMin * 10))).toBeLessThan(1e-9);
    for (const width of [320, 760]) {
      const svg = new DOMParser().parseFromString(covariateBalanceChartSvgString(d, width), 'image/svg+xml');
      for (const r of d.rows) {
        const row = svg.querySelector(`[data-covariate="${r.name}"]`)!;
        const content = linesOf(row);
        expect(content).toContain('as measured');
        expect(content).toContain('true score');
        // The same figures as the table, before and after, in each lane.
        expect(content).toContain(`${fmt(r.observedAfter, 2)} (was ${fmt(r.observedBefore, 2)})`);
        expect(content).toContain(`${fmt(r.trueAfter, 2)} (was ${fmt(r.trueBefore, 2)})`);
        // Two bars per lane (pale before, solid after).
        expect(row.querySelectorAll('rect')).toHaveLength(4);
      }
    }
  });

  it("with a simulation: uses the engine's balance, which agrees with core's closed form", () => {
    const input = simulated();
    const d = covariateBalanceChartData(input);
    const sim = input.simulation.balance!;
    const cf = input.analytic.covariateBalance!;
    expect(d.source).toBe('simulation');
    expect(d.replications).toBe(400);
    d.rows.forEach((r, i) => {
      expect(r.observedAfter).toBe(sim[i]!.observedSMDAfter);
      expect(r.trueAfter).toBe(sim[i]!.trueSMDAfter);
      expect(r.varianceRatio).toBe(sim[i]!.varianceRatioAfter);
      expect(r.mcse).toEqual({
        observedAfter: sim[i]!.observedSMDAfterMCSE,
        trueAfter: sim[i]!.trueSMDAfterMCSE,
        varianceRatio: sim[i]!.varianceRatioAfterMCSE,
      });
      // Simulated true-score SMD after matching within 4 Monte Carlo SEs of the
      // closed form (exact matching, unlimited pool) plus 0.03 for the finite
      // caliper and pools (Cochran & Rubin 1973: a caliper leaves a few per cent
      // of the matched variables' gap). A 4-MCSE miss has probability < 1e-4.
      expect(Math.abs(r.trueAfter - cf[i]!.trueSMDAfter)).toBeLessThan(4 * (r.mcse?.trueAfter ?? 0) + 0.03);
    });
    // The unmeasured confounder is not matched on: its observed gap keeps the
    // part the matched-on variables do not account for (closed form, same
    // tolerance as above), well away from 0 (it starts at −0.5).
    const motivation = d.rows[2]!;
    expect(Math.abs(motivation.observedAfter - cf[2]!.observedSMDAfter)).toBeLessThan(4 * (motivation.mcse?.observedAfter ?? 0) + 0.03);
    expect(motivation.observedAfter).toBeLessThan(-0.2);
  });

  it('text alternative names the hidden imbalance, the unmeasured confounder and the source', () => {
    const d = covariateBalanceChartData(closedForm());
    const t = covariateBalanceChartText(d);
    const all = t.sentences.join(' ');
    expect(all).toMatch(/Looks balanced, is not: after matching, Pretest \(observed SMD 0\.00, true-score SMD -0\.29\) is within 0\.10 as measured but not on the true scores/);
    expect(all).toContain('Not measured, so matching cannot reach it: Motivation');
    expect(all).toContain('closed-form values for exact matching');
    expect(t.table.columns).toEqual([
      'Variable',
      'After matching',
      'Observed SMD before',
      'Observed SMD after',
      'True-score SMD before',
      'True-score SMD after',
      'Variance ratio after',
    ]);
    expect(t.table.rows.map((r) => r[0])).toEqual(['Pretest', 'Attendance', 'Motivation (not measured)']);
    expect(all).not.toMatch(/NaN|Infinity/);
  });

  it('renders a standalone, accessible, deterministic SVG with one row per variable', () => {
    const d = covariateBalanceChartData(closedForm());
    const text = covariateBalanceChartSvgString(d, 760);
    expect(covariateBalanceChartSvgString(covariateBalanceChartData(closedForm()), 760)).toBe(text);
    const svg = new DOMParser().parseFromString(text, 'image/svg+xml').documentElement;
    expect(svg.getAttribute('xmlns')).toBe('http://www.w3.org/2000/svg');
    expect(svg.getAttribute('viewBox')).toBe(`0 0 760 ${covariateBalanceChartHeight(d, 760)}`);
    expect(svg.getAttribute('role')).toBe('img');
    expect(svg.querySelector('desc')!.textContent).toContain('Motivation');
    expect(svg.querySelectorAll('[data-covariate]')).toHaveLength(3);
    // The band's legend and the unmeasured tag are drawn as text (vector, readable in the PDF);
    // no dashed reference lines any more (our own look: a shaded band around zero).
    expect(svg.textContent).toContain('within 0.1 either way: looks balanced');
    expect(svg.querySelectorAll('[stroke-dasharray]')).toHaveLength(0);
    expect(svg.querySelector('[data-covariate="Motivation"]')!.textContent).toContain('not measured');
    // PDF-safe: no NaN, no Unicode minus (the chart font is Latin-1), no interactive attributes in exports.
    expect(text).not.toMatch(/NaN|Infinity|\u2212|tabindex/);
  });
});
