// @vitest-environment jsdom
import { act, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { demoPlan } from '../../src/io/demoPlan';
import { renderApp } from './renderApp';

/*
 * The verdict shows what core decides (test/core/honestVerdicts.test.ts checks
 * the figures against published formulas): these tests check the screen says it.
 */
describe('the verdict on screen', () => {
  it('demo + growth gap 1.5: reports the regression artefact and the growth gap apart, says the gap offsets it, and is not tolerable', async () => {
    const { store } = renderApp();
    const plan = demoPlan();
    plan.outcome.growthGap = 1.5;
    await act(async () => store.getState().replacePlan(plan));
    const verdict = screen.getByTestId('verdict');
    expect(verdict).toHaveAttribute('data-verdict', 'hides');
    expect(within(verdict).getByTestId('verdict-bias')).toHaveTextContent('−2.00 points');
    expect(within(verdict).getByTestId('verdict-growth')).toHaveTextContent(/growth gap you assumed adds \+1\.50 points \(60% of the effect\)/);
    expect(within(verdict).getByTestId('verdict-net')).toHaveTextContent('−0.50 points');
    expect(within(verdict).getByTestId('verdict-offset')).toHaveTextContent(/judged on the regression artefact alone/);
    expect(within(verdict).getByTestId('verdict-tolerability')).toHaveTextContent(/^Not tolerable \(artefact too large/);
    expect(verdict).not.toHaveTextContent('leaves only a tolerable artefact');
  });

  it('demo at reliability .95: names the failed condition', async () => {
    const { store } = renderApp();
    const plan = demoPlan();
    plan.pretest = { reliability: 0.95, referenceSD: 10 };
    await act(async () => store.getState().replacePlan(plan));
    const t = screen.getByTestId('verdict-tolerability');
    expect(t).toHaveAttribute('data-tolerable', 'false');
    expect(t).toHaveTextContent(/power falls too far/);
  });

  it('shows the required n beside the target power, and changing the target power changes it', async () => {
    const { store } = renderApp();
    const plan = demoPlan();
    plan.pretest = { reliability: 0.99, referenceSD: 10 };
    plan.analysis.targetPower = 0.8;
    await act(async () => store.getState().replacePlan(plan));
    const before = screen.getByTestId('verdict-required-n').textContent;
    expect(before).toMatch(/At the target power of 80%: \d[\d,]* per group needed/);
    expect(before).toMatch(/Per group counts people analysed in each group/);
    await act(async () => store.getState().replacePlan({ ...plan, analysis: { ...plan.analysis, targetPower: 0.9 } }));
    const after = screen.getByTestId('verdict-required-n').textContent;
    expect(after).toMatch(/At the target power of 90%/);
    const n = (s: string | null) => Number(/(\d[\d,]*) per group/.exec(s ?? '')![1]!.replace(/,/g, ''));
    expect(n(after)).toBeGreaterThan(n(before));
  });

  it('a biased analysis says more people do not help instead of a sample size', async () => {
    renderApp();
    expect(screen.getByTestId('verdict-required-n-value')).toHaveTextContent('biased: more people do not help');
  });

  it('with Mahalanobis matching the Why bullet does not say matched on the observed score', async () => {
    const { store } = renderApp();
    const plan = demoPlan();
    plan.matching.distance = 'mahalanobis';
    await act(async () => store.getState().replacePlan(plan));
    const why = screen.getByTestId('verdict-why');
    expect(why).toHaveTextContent(/close on the Mahalanobis distance/);
    expect(why).not.toHaveTextContent(/share an observed score/);
  });
});
