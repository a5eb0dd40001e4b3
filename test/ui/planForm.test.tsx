// @vitest-environment jsdom
import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { renderApp } from './renderApp';

describe('plan form', () => {
  it('has a real labelled input for each trade term the researcher looks for', async () => {
    const user = userEvent.setup();
    renderApp();
    for (const name of [/^Reliability/, /^Caliper/, /^Ratio/, /^Pre–post correlation/, /^Hypothesised effect/]) {
      const box = screen.getByRole('textbox', { name });
      expect(box).toBeInstanceOf(HTMLInputElement);
      // Each input has a hint linked by aria-describedby.
      const hintId = box.getAttribute('aria-describedby')!;
      expect(document.getElementById(hintId)?.textContent?.length).toBeGreaterThan(5);
    }
    // The en dash is part of the label (common practice in typeset statistics).
    expect(screen.getByText('Pre–post correlation')).toBeInTheDocument();
    await user.click(screen.getByRole('radio', { name: /^SEM/ }));
    expect(screen.getByRole('textbox', { name: /^SEM/ })).toHaveValue('');
  });

  it('keeps an invalid reliability as typed, explains it beside the field, and marks the results stale', async () => {
    const user = userEvent.setup();
    renderApp();
    const verdict = screen.getByTestId('verdict');
    // Demo plan: bias = beta(1 − rho)·Delta = 0.8 × 0.25 × (−10) = −2 points
    // (Thorndike 1942 closed form; computed). Shown to 2 decimals.
    expect(within(verdict).getByTestId('verdict-bias')).toHaveTextContent('−2.00 points');
    const box = screen.getByRole('textbox', { name: /^Reliability/ });
    await user.clear(box);
    await user.type(box, '1.4');
    expect(box).toHaveValue('1.4');
    expect(box).toHaveAttribute('aria-invalid', 'true');
    const describedBy = box.getAttribute('aria-describedby')!.split(' ');
    const messages = describedBy.map((id) => document.getElementById(id)?.textContent ?? '').join(' ');
    expect(messages).toMatch(/between 0 and 1/);
    expect(messages).toContain('1.4');
    // The last valid results stay, visibly marked as out of date.
    expect(within(verdict).getByTestId('verdict-bias')).toHaveTextContent('−2.00 points');
    expect(within(verdict).getByText(/Out of date/)).toBeInTheDocument();
    expect(verdict).toHaveClass('is-stale');
  });

  it('updates the verdict when the reliability is corrected', async () => {
    const user = userEvent.setup();
    renderApp();
    const box = screen.getByRole('textbox', { name: /^Reliability/ });
    await user.clear(box);
    await user.type(box, '0.9{Enter}'); // Enter commits the typed value to the plan
    // rho .9: beta = .6·10/(10·.9) = 2/3; bias = (2/3)(.1)(−10) = −0.67 (same closed form, computed).
    expect(screen.getByTestId('verdict-bias')).toHaveTextContent('−0.67 points');
    expect(screen.queryByText(/Out of date/)).toBeNull();
    expect(box).not.toHaveAttribute('aria-invalid');
  });

  it('shows every problem at once and counts them', async () => {
    const user = userEvent.setup();
    renderApp();
    await user.clear(screen.getByRole('textbox', { name: /^Caliper/ }));
    await user.type(screen.getByRole('textbox', { name: /^Caliper/ }), 'wide');
    await user.clear(screen.getByRole('textbox', { name: /^Ratio/ }));
    await user.type(screen.getByRole('textbox', { name: /^Ratio/ }), '9');
    expect(screen.getByText('Caliper must be a number; got "wide".')).toBeInTheDocument();
    expect(screen.getByRole('textbox', { name: /^Ratio/ })).toHaveAttribute('aria-invalid', 'true');
    expect(screen.getByText(/2 fields need attention/)).toBeInTheDocument();
  });

  it('shows the within-group reliabilities and SEM that follow from an SEM (Lord & Novick 1968)', async () => {
    const user = userEvent.setup();
    renderApp();
    await user.click(screen.getByRole('radio', { name: /^SEM/ }));
    const sem = screen.getByRole('textbox', { name: /^SEM/ });
    await user.type(sem, '3{Enter}');
    // rho = 1 − SEM²/SD² = 1 − 9/100 = .91 in both groups (SD 10); shown to 3 decimals.
    expect(screen.getByTestId('derived-reliability-programme')).toHaveTextContent('.910');
    expect(screen.getByTestId('derived-reliability-comparison')).toHaveTextContent('.910');
    expect(screen.getByTestId('derived-sem')).toHaveTextContent('3.00 points');
  });

  it('steps a value with the arrow keys', async () => {
    const user = userEvent.setup();
    renderApp();
    const box = screen.getByRole('textbox', { name: /^Caliper/ });
    box.focus();
    await user.keyboard('{ArrowUp}');
    expect(box).toHaveValue('0.25');
  });
});
