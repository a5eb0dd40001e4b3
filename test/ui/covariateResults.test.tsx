// @vitest-environment jsdom
import { act, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { Plan } from '../../src/core/plan';
import { fmtPct, fmtSigned } from '../../src/ui/format';
import { inventedCovariatePlan } from '../inventedCovariatePlan';
import { renderApp } from './renderApp';

/** The shared invented plan (Mahalanobis distance); motivation is never measured unless `measuredBoth`. */
function covariatePlan(measuredBoth = false): Plan {
  return inventedCovariatePlan({ motivationMeasured: measuredBoth });
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
