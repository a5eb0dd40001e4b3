// @vitest-environment jsdom
import { act, cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { exploreInputs } from '../../src/core/explore';
import { demoPlan } from '../../src/io/demoPlan';
import type { GridJob, GridRunner } from '../../src/state/deps';
import { MeanwardStoreContext } from '../../src/state/store';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { ExplorerPanel } from '../../src/ui/ExplorerPanel';
import { fmtPct } from '../../src/ui/format';
import { makeStore } from '../state/helpers';

afterEach(cleanup);

/** A grid runner that simulates every job at once, in reverse order (cells arrive out of order), with the real engine. */
function immediateGrid(): GridRunner {
  return {
    runGrid: (jobs: readonly GridJob[], h) => {
      for (let j = jobs.length - 1; j >= 0; j--) {
        const job = jobs[j]!;
        h.onCellResult(j, simulatePlan(job.plan, { replications: job.replications, seed: job.seed }));
      }
      h.onProgress(1);
      return { done: Promise.resolve(), cancel: () => {} };
    },
  };
}

function renderPanel(grid: GridRunner | null = immediateGrid()) {
  const store = makeStore({ grid });
  render(
    <MeanwardStoreContext.Provider value={store}>
      <ExplorerPanel />
    </MeanwardStoreContext.Provider>,
  );
  return store;
}

describe('the design explorer panel', () => {
  it('starts from the first input that applies with its first grid, and says why others are not offered', () => {
    renderPanel();
    const first = screen.getByRole('group', { name: 'First input to vary' });
    const info = exploreInputs(demoPlan()).find((x) => x.input === 'reliability')!;
    expect((within(first).getByLabelText('Input') as HTMLSelectElement).value).toBe('reliability');
    expect((within(first).getByLabelText('From') as HTMLInputElement).value).toBe(String(info.defaultRange.from));
    expect((within(first).getByLabelText('Steps') as HTMLInputElement).value).toBe(String(info.defaultRange.steps));
    // The demo has two existing groups: no cut-off rule and no clusters, so those are disabled with the reason listed.
    const cutOff = within(first).getByRole('option', { name: /Cut-off of the selection rule/ }) as HTMLOptionElement;
    expect(cutOff.disabled).toBe(true);
    expect(screen.getByText(/Only a plan whose groups a cut-off rule forms has a cut-off/)).toBeTruthy();
    expect((within(first).getByRole('option', { name: /Matching caliper/ }) as HTMLOptionElement).disabled).toBe(false);
    expect(screen.getByText(/not a substitute for a statistician/)).toBeTruthy();
  });

  it('keeps a bad value as typed and shows its message beside the field', async () => {
    renderPanel();
    const first = screen.getByRole('group', { name: 'First input to vary' });
    fireEvent.change(within(first).getByLabelText('To'), { target: { value: 'ninety' } });
    await act(async () => {
      fireEvent.click(screen.getByTestId('explorer-run'));
    });
    expect((within(first).getByLabelText('To') as HTMLInputElement).value).toBe('ninety');
    expect(within(first).getByText('"To" of the first input must be a number; got "ninety".')).toBeTruthy();
    expect(within(first).getByLabelText('To').getAttribute('aria-invalid')).toBe('true');
  });

  it('runs a grid, lists every cell in the table with its figures, and makes a row a candidate plan', async () => {
    const store = renderPanel();
    const first = screen.getByRole('group', { name: 'First input to vary' });
    fireEvent.change(within(first).getByLabelText('From'), { target: { value: '0.6' } });
    fireEvent.change(within(first).getByLabelText('To'), { target: { value: '0.9' } });
    fireEvent.change(within(first).getByLabelText('Steps'), { target: { value: '3' } });
    fireEvent.change(screen.getByLabelText('Replications per cell'), { target: { value: '200' } });
    await act(async () => {
      fireEvent.click(screen.getByTestId('explorer-run'));
    });
    await waitFor(() => expect(screen.getByTestId('explorer-status').getAttribute('data-status')).toBe('done'));
    expect(screen.getByTestId('explorer-progress').textContent).toBe('3 of 3 cells.');
    fireEvent.click(screen.getByLabelText('Show as table'));
    const rows = within(screen.getByTestId('explorer-table')).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(3);
    const cells = store.getState().explorer.result!.cells;
    // Row 2 shows the core's figures for that cell (formatted only).
    const tds = within(rows[1]!).getAllByRole('cell');
    expect(tds[0]!.textContent).toBe(fmtPct(cells[1]!.artefactShare));
    expect(tds[1]!.textContent).toBe(fmtPct(cells[1]!.artefactShareMCSE));
    await act(async () => {
      fireEvent.click(within(rows[2]!).getByRole('button', { name: /Make candidate plan/ }));
    });
    expect(screen.getByTestId('explorer-message').textContent).toContain('Added the candidate plan "Explorer: reliability 0.90"');
    expect(store.getState().variants.at(-1)!.plan.pretest.reliability).toBe(0.9);
  });
});
