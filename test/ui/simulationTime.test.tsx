// @vitest-environment jsdom
import { act, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { controlledRunner, LONG_RUN_ESTIMATE } from '../state/helpers';
import { renderApp } from './renderApp';

/** The simulation panel's run-time estimate, its prompt for long runs and its word on a silent worker. */
describe('simulation panel: how long a run takes, and a run that went silent', () => {
  const estimate = LONG_RUN_ESTIMATE;

  it('shows the estimate while running, then asks before a run past 10 minutes, and runs it on "Run it anyway"', async () => {
    const user = userEvent.setup();
    const c = controlledRunner();
    renderApp({ simulation: c.runner });
    await user.click(screen.getByRole('button', { name: /Run the simulation/ }));
    act(() => c.runs[0]!.options?.onEstimate?.({ ...estimate, seconds: 42 }));
    expect(screen.getByTestId('sim-status')).toHaveTextContent(
      'Running in the background; you can keep editing. Estimated time: about 42 s in all (timed the first 4 of 2000 replications',
    );
    await act(async () => c.runs[0]!.reject(Object.assign(new Error('too long'), { reason: 'too-long', estimate })));
    expect(screen.getByTestId('sim-status')).toHaveAttribute('data-status', 'too-long');
    expect(screen.getByTestId('sim-status')).toHaveTextContent('This run would take about 25 min');
    expect(screen.getByTestId('sim-status')).toHaveTextContent('longer than the 10 min a run in the page may take without asking');
    await user.click(screen.getByRole('button', { name: 'Run it anyway' }));
    expect(c.runs).toHaveLength(2);
    expect(c.runs[1]!.options?.maxSeconds).toBeUndefined();
    expect(screen.getByTestId('sim-status')).toHaveAttribute('data-status', 'running');
  });

  it('says the run stopped responding instead of "Running" for ever, and offers to run it again', async () => {
    const user = userEvent.setup();
    const c = controlledRunner();
    renderApp({ simulation: c.runner });
    await user.click(screen.getByRole('button', { name: /Run the simulation/ }));
    act(() => c.runs[0]!.progress(0.01));
    const message = 'The simulation stopped responding: nothing was heard from it for 120 s, so the browser has most likely ended it.';
    await act(async () => c.runs[0]!.reject(Object.assign(new Error(message), { reason: 'stalled' })));
    expect(screen.getByTestId('sim-status')).toHaveTextContent(message);
    expect(screen.getByTestId('sim-status')).not.toHaveTextContent('Running');
    await user.click(screen.getByRole('button', { name: 'Run it again' }));
    expect(c.runs).toHaveLength(2);
  });
});
