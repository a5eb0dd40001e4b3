// @vitest-environment jsdom
import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { renderApp } from './renderApp';

// jsdom has no layout, so no scrollIntoView; the problem links call it after focusing.
Element.prototype.scrollIntoView ??= () => {};

describe('covariate editor', () => {
  it('starts with no covariates and no distance choice, as a plan without covariates always looked', () => {
    renderApp();
    expect(screen.getByText(/None yet: matching and adjustment use the pretest alone/)).toBeInTheDocument();
    expect(screen.queryByTestId('correlation-matrix')).toBeNull();
    expect(screen.queryByRole('combobox', { name: /^Match on/ })).toBeNull();
    expect(screen.getByRole('textbox', { name: /^Caliper/ }).closest('.field')).toHaveTextContent('SDs of the pooled pretest');
  });

  it('adds a covariate with labelled fields, focuses its name, and shows the matrix and the distance choice', async () => {
    const user = userEvent.setup();
    const { store } = renderApp();
    await user.click(screen.getByRole('button', { name: 'Add a covariate' }));
    const name = screen.getByRole('textbox', { name: 'Covariate 1: Name' });
    expect(name).toHaveValue('Covariate 1');
    await new Promise((r) => setTimeout(r, 5));
    expect(name).toHaveFocus();
    for (const label of ['Programme mean', 'Comparison mean', 'SD within a group', 'Reliability', 'Correlation with the outcome']) {
      const box = screen.getByRole('textbox', { name: `Covariate 1: ${label}` });
      const hint = document.getElementById(box.getAttribute('aria-describedby')!.split(' ').pop()!);
      expect(hint?.textContent?.length).toBeGreaterThan(5);
    }
    expect(screen.getByRole('checkbox', { name: /Covariate 1: Measured/ })).toBeChecked();
    expect(screen.getByRole('checkbox', { name: /Covariate 1: Match exactly/ })).not.toBeChecked();
    expect(screen.getByRole('textbox', { name: 'Correlation of Pretest and Covariate 1' })).toHaveValue('0');
    expect(screen.getByRole('combobox', { name: /^Match on/ })).toHaveValue('pretest');
    // A neutral covariate leaves the plan valid.
    expect(store.getState().problems).toEqual([]);
    await user.selectOptions(screen.getByRole('combobox', { name: /^Match on/ }), 'propensity');
    expect(screen.getByRole('textbox', { name: /^Caliper/ }).closest('.field')).toHaveTextContent('SDs of the logit of the propensity score');
    expect(store.getState().validPlan.matching.distance).toBe('propensity');
  });

  it('typing in a cell fills its mirror; an impossible value is kept, marked in both cells and explained beside the grid', async () => {
    const user = userEvent.setup();
    const { store } = renderApp();
    await user.click(screen.getByRole('button', { name: 'Add a covariate' }));
    const upper = screen.getByRole('textbox', { name: 'Correlation of Pretest and Covariate 1' });
    const lower = screen.getByRole('textbox', { name: 'Correlation of Covariate 1 and Pretest' });
    await user.clear(upper);
    await user.type(upper, '1.3');
    expect(upper).toHaveValue('1.3');
    expect(lower).toHaveValue('1.3');
    for (const cell of [upper, lower]) {
      expect(cell).toHaveAttribute('aria-invalid', 'true');
      expect(cell.closest('td')).toHaveClass('cell-invalid');
    }
    const messageId = upper.getAttribute('aria-describedby')!.split(' ')[0]!;
    const message = document.getElementById(messageId)!;
    expect(message).toHaveTextContent(/Pretest × Covariate 1:/);
    expect(message).toHaveTextContent('1.3');
    expect(lower.getAttribute('aria-describedby')).toContain(messageId);
    // Listed once in the form's summary, as a link to the cell.
    const summary = screen.getByText(/field needs attention|fields need attention/).closest('.form-summary') as HTMLElement;
    const link = within(summary).getByRole('button', { name: 'Correlation of Pretest and Covariate 1' });
    await user.click(link);
    expect(upper).toHaveFocus();
    expect(store.getState().analyticStale).toBe(true);
    // Fixing the cell clears both marks.
    await user.clear(lower);
    await user.type(lower, '0.3');
    expect(upper).toHaveValue('0.3');
    expect(upper).not.toHaveAttribute('aria-invalid');
    // The typed value becomes the plan when the cell is left (Tab).
    await user.tab();
    expect(store.getState().validPlan.covariateCorrelations).toEqual([
      [1, 0.3],
      [0.3, 1],
    ]);
  });

  it('steps a cell with the arrow keys and keeps the matrix symmetric', async () => {
    const user = userEvent.setup();
    const { store } = renderApp();
    await user.click(screen.getByRole('button', { name: 'Add a covariate' }));
    const cell = screen.getByRole('textbox', { name: 'Correlation of Covariate 1 and Pretest' });
    cell.focus();
    await user.keyboard('{ArrowUp}{ArrowUp}');
    expect(cell).toHaveValue('0.1');
    expect(store.getState().draft.covariateCorrelations[0]![1]).toBe('0.1');
  });

  it('shows a covariate field problem beside its box with the item number, and keeps the text', async () => {
    const user = userEvent.setup();
    renderApp();
    await user.click(screen.getByRole('button', { name: 'Add a covariate' }));
    const sd = screen.getByRole('textbox', { name: 'Covariate 1: SD within a group' });
    await user.clear(sd);
    await user.type(sd, '-4');
    expect(sd).toHaveValue('-4');
    expect(sd).toHaveAttribute('aria-invalid', 'true');
    const field = sd.closest('.field') as HTMLElement;
    expect(within(field).getByRole('alert')).toHaveTextContent('Covariate 1 SD must be a number from 0.000001 to 1000000; got -4.');
  });

  it('reorders and removes covariates with the keyboard; correlations move with their covariate', async () => {
    const user = userEvent.setup();
    const { store } = renderApp();
    await user.click(screen.getByRole('button', { name: 'Add a covariate' }));
    await user.click(screen.getByRole('button', { name: 'Add a covariate' }));
    await user.clear(screen.getByRole('textbox', { name: 'Covariate 1: Name' }));
    await user.type(screen.getByRole('textbox', { name: 'Covariate 1: Name' }), 'Attendance');
    await user.clear(screen.getByRole('textbox', { name: 'Correlation of Pretest and Attendance' }));
    await user.type(screen.getByRole('textbox', { name: 'Correlation of Pretest and Attendance' }), '0.4');
    const down = screen.getByRole('button', { name: 'Move covariate 1 (Attendance) down' });
    down.focus();
    await user.keyboard('{Enter}');
    await new Promise((r) => setTimeout(r, 5));
    expect(store.getState().draft.covariates.map((c) => c.name)).toEqual(['Covariate 2', 'Attendance']);
    expect(screen.getByRole('textbox', { name: 'Correlation of Pretest and Attendance' })).toHaveValue('0.4');
    expect(store.getState().validPlan.covariateCorrelations![0]).toEqual([1, 0, 0.4]);
    // Focus follows the moved covariate (now last, so onto its "Move up").
    expect(screen.getByRole('button', { name: 'Move covariate 2 (Attendance) up' })).toHaveFocus();
    await user.click(screen.getByRole('button', { name: 'Remove covariate 1 (Covariate 2)' }));
    expect(store.getState().draft.covariates.map((c) => c.name)).toEqual(['Attendance']);
    expect(store.getState().validPlan.covariateCorrelations).toEqual([
      [1, 0.4],
      [0.4, 1],
    ]);
    await user.click(screen.getByRole('button', { name: 'Remove covariate 1 (Attendance)' }));
    expect(screen.queryByTestId('correlation-matrix')).toBeNull();
    expect(store.getState().validPlan.covariates).toBeUndefined();
  });

  it('marks an unmeasured covariate on its card', async () => {
    const user = userEvent.setup();
    renderApp();
    await user.click(screen.getByRole('button', { name: 'Add a covariate' }));
    await user.click(screen.getByRole('checkbox', { name: /Covariate 1: Measured/ }));
    const card = screen.getByRole('group', { name: /Covariate 1: Covariate 1/ });
    expect(card).toHaveTextContent('not measured');
    expect(card.closest('li')).toHaveClass('is-unmeasured');
  });
});
