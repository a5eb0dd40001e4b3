// @vitest-environment jsdom
import { act, fireEvent, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { demoPlan } from '../../src/io/demoPlan';
import { TYPING_PAUSE_MS } from '../../src/state/draftSlice';
import { controlledRunner } from '../state/helpers';
import { renderApp } from './renderApp';

describe('results panel', () => {
  it('carries the planning-aid caution beside the verdict', () => {
    renderApp();
    expect(screen.getByRole('note')).toHaveTextContent(/not replace advice from a statistician or review by an ethics board/);
  });

  it('links table rows to the shared highlight and the charts', async () => {
    const user = userEvent.setup();
    const { store, container } = renderApp();
    const row = container.querySelector('tr[data-analysis="gainScore"]') as HTMLElement;
    await user.hover(row);
    expect(store.getState().highlight).toBe('gainScore');
    expect(row).toHaveClass('is-highlighted');
    // Every other analysis' marks are dimmed in the charts.
    // (charts redraw in their own task, hence waitFor).
    await waitFor(() => expect(container.querySelectorAll('[data-chart] svg [opacity="0.22"]').length).toBeGreaterThan(0));
    await user.unhover(row);
    expect(store.getState().highlight).toBeNull();
  });

  it('offers each chart as text and a table', async () => {
    const { container } = renderApp();
    const charts = container.querySelectorAll('figure[data-chart]');
    expect(charts).toHaveLength(4);
    await waitFor(() => expect(container.querySelectorAll('figure[data-chart] svg > *').length).toBeGreaterThan(0));
    for (const fig of charts) {
      const details = fig.querySelector('details');
      expect(details).not.toBeNull();
      expect(details!.querySelectorAll('tbody tr').length).toBeGreaterThan(0);
    }
  });

  it('shows progress, cancels, and marks a finished result stale when the plan changes', async () => {
    const user = userEvent.setup();
    const c = controlledRunner();
    const { store } = renderApp({ simulation: c.runner });
    await user.click(screen.getByRole('button', { name: /Run the simulation/ }));
    act(() => c.runs[0]!.progress(0.4));
    const bar = screen.getByRole('progressbar');
    expect(bar).toHaveAttribute('aria-valuenow', '40');
    await user.click(screen.getByRole('button', { name: 'Cancel' }));
    expect(screen.getByTestId('sim-status')).toHaveAttribute('data-status', 'cancelled');
    expect(screen.queryByRole('progressbar')).toBeNull();

    await user.click(screen.getByRole('button', { name: /Run the simulation/ }));
    const plan = store.getState().validPlan;
    await act(async () => {
      c.runs[1]!.resolve({ ...fakeResult(plan) });
    });
    expect(screen.getByTestId('sim-status')).toHaveAttribute('data-stale', 'false');
    const caliper = screen.getByRole('textbox', { name: /^Caliper/ });
    fireEvent.change(caliper, { target: { value: '0.1' } });
    fireEvent.focusOut(caliper); // leaving the field commits the typed value to the plan
    expect(screen.getByTestId('sim-status')).toHaveAttribute('data-stale', 'true');
    expect(screen.getByTestId('sim-status')).toHaveTextContent(/out of date/);
  });

  it('shows the reason for an analysis the simulation could not summarise, and the others as usual', async () => {
    const user = userEvent.setup();
    const c = controlledRunner();
    const { store, container } = renderApp({ simulation: c.runner });
    await user.click(screen.getByRole('button', { name: /Run the simulation/ }));
    const plan = store.getState().validPlan;
    const result = fakeResult(plan);
    const reason = 'The matched post-test difference could be computed in only 0 of 500 simulated studies, too few to summarise.';
    const infeasible = { id: 'matchedDifference' as const, sample: 'matched' as const, feasible: false as const, reason, replications: 0 };
    await act(async () => {
      c.runs[0]!.resolve({ ...result, analyses: { ...result.analyses, matchedDifference: infeasible }, ancovaMatchedSample: { ...infeasible, id: 'ancova' } });
    });
    const row = container.querySelector('tr[data-analysis="matchedDifference"]') as HTMLElement;
    expect(row).toHaveTextContent(/Not computed: The matched post-test difference could be computed in only 0 of 500/);
    const other = container.querySelector('tr[data-analysis="ancova"]') as HTMLElement;
    expect(other).not.toHaveTextContent(/Not computed/);
    expect(other.querySelectorAll('.sim-figure').length).toBeGreaterThan(0);
  });

  it('explains a bad plan file and keeps the current plan', async () => {
    const user = userEvent.setup();
    const { store } = renderApp();
    const before = store.getState().draft;
    const file = new File(['not json at all'], 'notes.json', { type: 'application/json' });
    await user.upload(screen.getByTestId('open-file-input'), file);
    const notice = await screen.findByTestId('notice');
    expect(notice).toHaveAttribute('data-kind', 'error');
    expect(within(notice).getByText(/The file "notes.json" could not be opened; your current plan is unchanged/)).toBeInTheDocument();
    expect(store.getState().draft).toBe(before);
  });
});

/** A simulation result carrying only what the panels read before drawing figures (no numbers are asserted from it). */
function fakeResult(plan: import('../../src/core/plan').Plan) {
  const zero = {
    meanEstimate: 0, meanEstimateMCSE: 0, bias: 0, biasMCSE: 0, empiricalSE: 0, empiricalSEMCSE: 0, meanModelSE: 0, meanModelSEMCSE: 0,
    rmse: 0, rmseMCSE: 0, coverage: 0, coverageMCSE: 0, rejectionRate: 0, rejectionRateMCSE: 0, wrongSignRate: 0, wrongSignRateMCSE: 0, replications: 0,
  };
  const a = (id: 'matchedDifference' | 'ancova' | 'gainScore' | 'correctedAncova') => ({ ...zero, id });
  return {
    plan,
    seed: plan.simulation.seed,
    replications: plan.simulation.replications,
    tau: 2.5,
    analyses: { matchedDifference: a('matchedDifference'), ancova: a('ancova'), gainScore: a('gainScore'), correctedAncova: a('correctedAncova') },
    ancovaMatchedSample: a('ancova'),
    matching: {
      meanMatchedProgramme: 0, meanMatchedProgrammeMCSE: 0, discardedProgrammeShare: 0, discardedProgrammeShareMCSE: 0,
      observedDifferenceBefore: 0, observedDifferenceAfter: 0, observedDifferenceAfterMCSE: 0, observedSMDBefore: 0, observedSMDAfter: 0,
      trueDifferenceBefore: 0, trueDifferenceAfter: 0, trueDifferenceAfterMCSE: 0, trueSMDBefore: 0, trueSMDAfter: 0, varianceRatioAfter: 1,
    },
    estimates: { matchedDifference: [0], ancova: [0], gainScore: [0], correctedAncova: [0] },
    example: { pairs: [], discarded: [] },
  };
}

describe('auto-run', () => {
  it('starts a run two seconds after the plan stops changing, only when switched on (a typed value becomes the plan once typing pauses)', async () => {
    vi.useFakeTimers();
    try {
      const c = controlledRunner();
      renderApp({ simulation: c.runner });
      const caliper = screen.getByRole('textbox', { name: /^Caliper/ });
      fireEvent.change(caliper, { target: { value: '0.15' } });
      act(() => vi.advanceTimersByTime(3000));
      expect(c.runs).toHaveLength(0);
      fireEvent.click(screen.getByRole('checkbox', { name: /Re-run automatically/ }));
      fireEvent.change(caliper, { target: { value: '0.1' } });
      act(() => vi.advanceTimersByTime(1500));
      fireEvent.change(caliper, { target: { value: '0.12' } });
      // 0.12 becomes the plan once typing has paused (TYPING_PAUSE_MS); the run starts 2 s after that,
      // and the timer 0.1 started is gone (it would have fired 2 s after 0.1 became the plan).
      act(() => vi.advanceTimersByTime(TYPING_PAUSE_MS));
      act(() => vi.advanceTimersByTime(1999));
      expect(c.runs).toHaveLength(0); // still waiting: the pause restarted
      act(() => vi.advanceTimersByTime(1));
      expect(c.runs).toHaveLength(1);
      expect(c.runs[0]!.plan.matching.caliper).toBe(0.12);
    } finally {
      vi.useRealTimers();
    }
  });
});

describe('results panel with a matching nobody survives', () => {
  it('shows the reason in the verdict and dashes for the matched difference in the table (invented plan: groups 6 SDs apart, caliper 0.05)', () => {
    const { store, container } = renderApp();
    const plan = demoPlan();
    plan.groups.programme.pretestMean = 20;
    plan.groups.comparison.pretestMean = 80;
    plan.matching.caliper = 0.05;
    act(() => store.getState().replacePlan(plan));
    expect(screen.getByTestId('verdict-infeasible')).toHaveTextContent(/not feasible.*widen the caliper/);
    expect(screen.queryByTestId('verdict-power')).toBeNull();
    const row = container.querySelector('tr[data-analysis="matchedDifference"]') as HTMLElement;
    expect(within(row).getByTestId('infeasible-matchedDifference')).toHaveTextContent(/^Not feasible: /);
    const cells = row.querySelectorAll('td');
    // False-positive rate, power and wrong-sign rate columns show a dash; the n column says the analysis is biased.
    expect([...cells].slice(-4, -1).map((c) => c.textContent)).toEqual(['—', '—', '—']);
    expect(cells[cells.length - 1]!.textContent).toBe('biased: more people do not help');
  });
});
