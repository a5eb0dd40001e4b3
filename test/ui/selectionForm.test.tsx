// @vitest-environment jsdom
// "Who gets the programme" on screen: the form shows only the fields the
// chosen rule reads, the verdict names the rule and says what it means, and
// the table and charts follow the design's analyses. Figures on screen are
// compared with what core returns, formatted by the planner's formatters
// (tolerance: none, the formatting is deterministic).
import { act, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { fmtSigned } from '../../src/ui/format';
import { renderApp } from './renderApp';

describe('who gets the programme: the form', () => {
  it('shows the rule\u2019s fields only when a rule is chosen, and the population instead of the two groups', async () => {
    const user = userEvent.setup();
    renderApp();
    expect(screen.getByRole('group', { name: /^1\. Who gets the programme/ })).toBeInTheDocument();
    expect(screen.queryByRole('textbox', { name: /^Cut-off/ })).toBeNull();
    expect(screen.getByRole('group', { name: /The two groups/ })).toBeInTheDocument();
    await user.selectOptions(screen.getByRole('combobox', { name: /^How people got into the programme/ }), 'cut-off');
    expect(screen.getByRole('textbox', { name: /^Cut-off/ })).toBeInTheDocument();
    expect(screen.getByRole('combobox', { name: /^What the rule looked at/ })).toHaveValue('pretest');
    expect(screen.queryByRole('textbox', { name: /^Screener reliability/ })).toBeNull();
    expect(screen.queryByRole('textbox', { name: /^Spread of the chance/ })).toBeNull();
    expect(screen.queryByRole('group', { name: /The two groups/ })).toBeNull();
    expect(screen.getByRole('group', { name: /The population/ })).toBeInTheDocument();
    // Covariates cannot yet be combined with a rule: their section gives way.
    expect(screen.queryByRole('group', { name: /Other covariates/ })).toBeNull();
    await user.selectOptions(screen.getByRole('combobox', { name: /^What the rule looked at/ }), 'screener');
    expect(screen.getByRole('textbox', { name: /^Screener reliability/ })).toBeInTheDocument();
    await user.selectOptions(screen.getByRole('combobox', { name: /^How people got into the programme/ }), 'probability');
    expect(screen.getByRole('textbox', { name: /^Spread of the chance/ })).toBeInTheDocument();
    // Empty required fields are named in the problem list, in plain words.
    expect(screen.getByText(/fields need attention/)).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Population size' })).toBeInTheDocument();
  });

  it('hides the matching settings and the corrected ANCOVA\u2019s assumed reliability for a one-group study', async () => {
    const user = userEvent.setup();
    const { store } = renderApp();
    act(() => store.getState().loadExample('clinic-high-readings'));
    expect(screen.queryByRole('group', { name: /The matching plan/ })).toBeNull();
    expect(screen.queryByRole('textbox', { name: /^Assumed reliability/ })).toBeNull();
    expect(screen.getByRole('textbox', { name: /^Change everyone shows anyway/ })).toBeInTheDocument();
    await user.selectOptions(screen.getByRole('combobox', { name: /^Study design/ }), 'two-groups');
    expect(screen.getByRole('group', { name: /The matching plan/ })).toBeInTheDocument();
  });
});

describe('who gets the programme: the results', () => {
  it('a cut-off on a screener: the verdict names the rule and its meaning, the table lists five analyses with regression discontinuity\u2019s cost', () => {
    const { store, container } = renderApp();
    act(() => store.getState().loadExample('screened-reading-support'));
    const a = store.getState().analytic!;
    const verdict = screen.getByTestId('verdict');
    expect(within(verdict).getByTestId('verdict-rule')).toHaveTextContent(a.design.rule);
    expect(within(verdict).getByTestId('verdict-meaning')).toHaveTextContent(a.design.meaning);
    expect(within(verdict).getByRole('note')).toHaveTextContent(/statistician or review by an ethics board/);
    expect(screen.getByRole('heading', { name: 'The five analyses compared' })).toBeInTheDocument();
    const rows = container.querySelectorAll('[data-testid="comparison-table"] tbody tr');
    expect([...rows].map((r) => r.getAttribute('data-analysis'))).toEqual([
      'matchedDifference',
      'ancova',
      'gainScore',
      'correctedAncova',
      'regressionDiscontinuity',
    ]);
    const cost = screen.getByTestId('rd-variance-inflation');
    expect(cost).toHaveTextContent(`about ${a.analyses.regressionDiscontinuity!.varianceInflation!.toFixed(2)} times as much`);
    // Goldberger 1972 (from memory; REFERENCES computed 1/(1 − 2/π) = 2.7519): the central cut-off's figure.
    expect(cost).toHaveTextContent('about 2.75 times at a cut-off in the middle of the scores');
    // The sensitivity chart offers the cut-off and the screener's reliability, not the pretest gap.
    const vary = screen.getByRole('radiogroup', { name: 'Sensitivity chart: vary' });
    expect(within(vary).getAllByRole('radio').map((r) => r.parentElement?.textContent)).toEqual([
      'against reliability',
      'against the cut-off',
      'against the screener’s reliability',
    ]);
  });

  it('one group: the verdict sets the change expected with no programme beside the hoped-for effect; one analysis, no balance chart', async () => {
    const user = userEvent.setup();
    const { store, container } = renderApp();
    act(() => store.getState().loadExample('clinic-high-readings'));
    const a = store.getState().analytic!;
    const verdict = screen.getByTestId('verdict');
    expect(verdict).toHaveTextContent(/^Verdict: the pre–post change/);
    expect(within(verdict).getByTestId('verdict-rule')).toHaveTextContent(a.design.rule);
    expect(within(verdict).getByTestId('verdict-no-programme-change')).toHaveTextContent(`${fmtSigned(a.design.noProgrammeChange)} points`);
    expect(within(verdict).getByTestId('verdict-beside')).toHaveTextContent(`Hoped-for effect of the programme${fmtSigned(a.tau)} points`);
    expect(container.querySelectorAll('[data-testid="comparison-table"] tbody tr')).toHaveLength(1);
    expect(container.querySelector('figure[data-chart="balance"]')).toBeNull();
    // The pretest chart shows the population and the rule, with its text alternative.
    const pretest = container.querySelector('figure[data-chart="pretest"]') as HTMLElement;
    await user.click(within(pretest).getByText(/Read this chart as text/));
    expect(pretest).toHaveTextContent(/Everyone whose pretest score is above 150\.0 is selected/);
  });
});
