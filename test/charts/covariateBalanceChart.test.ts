// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import type { ChartInput } from '../../src/charts/chartTypes';
import {
  covariateBalanceChartData,
  hasCovariateBalance,
  SMD_THRESHOLDS,
  VARIANCE_RATIO_RANGE,
} from '../../src/charts/covariateBalanceChartData';
import { covariateBalanceChartHeight, covariateBalanceChartSvgString } from '../../src/charts/covariateBalanceChartRender';
import { covariateBalanceChartText } from '../../src/charts/covariateBalanceChartText';
import { analysePlan } from '../../src/core/analysePlan';
import type { Plan } from '../../src/core/plan';
import { simulatePlan } from '../../src/sim/simulatePlan';
import type { SimulationResult } from '../../src/sim/types';
import { inventedCovariatePlan } from '../inventedCovariatePlan';
import { closedFormInput } from './fixtures';

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

  it('draws reference lines at 0.1 and 0.25 and flags variance ratios outside 0.5 to 2 (Rubin 2001; Stuart 2010)', () => {
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
    expect(text.sentences.join(' ')).toContain('Variance ratio after matching outside 0.5–2 (poor balance of spread): Pretest (0.49) and Motivation (2.01).');
    expect(text.table.rows.map((r) => r[4])).toEqual(['0.49 (outside 0.5–2)', '0.50', '2.01 (outside 0.5–2)']);
    // The drawn chart shows the flag beside the flagged rows only.
    const svg = new DOMParser().parseFromString(covariateBalanceChartSvgString(d, 760), 'image/svg+xml');
    const rowText = (name: string) => svg.querySelector(`[data-covariate="${name}"]`)!.textContent!;
    expect(rowText('Pretest')).toContain('0.49  outside!');
    expect(rowText('Attendance')).not.toContain('outside');
    expect(rowText('Motivation')).toContain('2.01  outside!');
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
    expect(all).toMatch(/Pretest \(observed 0\.00, true -0\.29\) looks balanced on the observed values but not on the true scores/);
    expect(all).toContain('Not measured, so matching cannot balance it: Motivation');
    expect(all).toContain('closed-form values for exact matching');
    expect(t.table.columns).toEqual(['Variable', 'Observed SMD before', 'Observed SMD after', 'True-score SMD after', 'Variance ratio after']);
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
    // Reference-line labels and the unmeasured tag are drawn as text (vector, readable in the PDF).
    expect(svg.textContent).toContain('0.10 strict');
    expect(svg.textContent).toContain('0.25 lenient');
    expect(svg.querySelector('[data-covariate="Motivation"]')!.textContent).toContain('not measured');
    // PDF-safe: no NaN, no Unicode minus (the chart font is Latin-1), no interactive attributes in exports.
    expect(text).not.toMatch(/NaN|Infinity|\u2212|tabindex/);
  });
});
