// @vitest-environment jsdom
import { act, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { fmtPct, fmtSigned } from '../../src/ui/format';
import { renderApp } from './renderApp';

/** An invented plan: the demo plus a measured covariate and a confounder never measured. */
function covariatePlan(measuredBoth = false): Plan {
  const plan = demoPlan();
  return {
    ...plan,
    matching: { ...plan.matching, distance: 'mahalanobis' },
    covariates: [
      { name: 'Attendance', programmeMean: 85, comparisonMean: 90, sd: 10, reliability: 0.7, outcomeCorrelation: 0.3, measured: true, exact: false },
      { name: 'Motivation', programmeMean: -0.5, comparisonMean: 0, sd: 1, reliability: 1, outcomeCorrelation: 0.3, measured: measuredBoth, exact: false },
    ],
    covariateCorrelations: [
      [1, 0.3, 0.2],
      [0.3, 1, 0.1],
      [0.2, 0.1, 1],
    ],
  };
}

describe('results with covariates', () => {
  it('a plan without covariates shows no unmeasured part and the pretest balance chart, as before', () => {
    renderApp();
    expect(screen.queryByTestId('verdict-unmeasured')).toBeNull();
    expect(screen.getByTestId('verdict-lead')).toHaveTextContent(/^Matching on the observed pretest is expected/);
    expect(document.querySelector('figure[data-chart="balance"]')).not.toBeNull();
    expect(document.querySelector('figure[data-chart="covariateBalance"]')).toBeNull();
  });

  it('says in plain words how much of the bias no analysis of the measured variables removes', () => {
    const { store } = renderApp();
    act(() => store.getState().replacePlan(covariatePlan()));
    const u = store.getState().analytic!.unmeasuredBias!;
    const box = screen.getByTestId('verdict-unmeasured');
    expect(box).toHaveTextContent(/^Not measured: Motivation\./);
    // The figures are core's unmeasuredBias, formatted only.
    expect(within(box).getByTestId('verdict-unmeasured-bias')).toHaveTextContent(`${fmtSigned(u.points)} points`);
    expect(box).toHaveTextContent(`${fmtSigned(u.sd)} posttest SD, ${fmtPct(Math.abs(u.share!), 0)} of the hoped-for effect`);
    expect(box).toHaveTextContent('only measuring it could');
    expect(screen.getByTestId('verdict-lead')).toHaveTextContent(/^Matching on the Mahalanobis distance is expected/);
  });

  it('says when every listed covariate is measured', () => {
    const { store } = renderApp();
    act(() => store.getState().replacePlan(covariatePlan(true)));
    expect(store.getState().analytic!.unmeasuredBias!.points).toBe(0);
    expect(screen.getByTestId('verdict-unmeasured')).toHaveTextContent(/^Every covariate you listed is measured/);
  });

  it('shows balance per covariate (closed form before a simulation) in place of the pretest-only chart, with a table alternative', async () => {
    const { store } = renderApp();
    act(() => store.getState().replacePlan(covariatePlan()));
    expect(document.querySelector('figure[data-chart="balance"]')).toBeNull();
    const card = document.querySelector('figure[data-chart="covariateBalance"]') as HTMLElement;
    expect(card).not.toBeNull();
    // The chart draws in its own task.
    await act(() => new Promise((r) => setTimeout(r, 10)));
    expect(card.querySelectorAll('svg [data-covariate]')).toHaveLength(3);
    const table = within(card).getByRole('table');
    expect(within(table).getAllByRole('row')).toHaveLength(4);
    expect(within(table).getByRole('rowheader', { name: 'Motivation (not measured)' })).toBeInTheDocument();
    expect(card).toHaveTextContent('closed-form values for exact matching');
  });
});
