// @vitest-environment jsdom
// The exports panel over a real store (real core and io): buttons, the reasons
// given when a download is unavailable, and what each download contains.
import { cleanup, render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { demoPlan } from '../../src/io/demoPlan';
import { serializePlan } from '../../src/io/planFile';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { MeanwardStoreContext } from '../../src/state/store';
import { ExportPanel } from '../../src/ui/ExportPanel';
import { makeStore } from '../state/helpers';

let downloads: { name: string; blob: Blob }[] = [];

beforeEach(() => {
  downloads = [];
  let last: Blob | null = null;
  // jsdom has no object URLs or real downloads: record what would be saved.
  URL.createObjectURL = vi.fn((b: Blob) => {
    last = b;
    return 'blob:test';
  }) as unknown as typeof URL.createObjectURL;
  URL.revokeObjectURL = vi.fn();
  vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (this: HTMLAnchorElement) {
    if (last) downloads.push({ name: this.download, blob: last });
  });
});
afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

function renderPanel() {
  const store = makeStore({ simulation: null });
  render(
    <MeanwardStoreContext.Provider value={store}>
      <ExportPanel />
    </MeanwardStoreContext.Provider>,
  );
  return store;
}

describe('ExportPanel', () => {
  it('shows the caution line and explains why the estimates file is not ready', () => {
    renderPanel();
    expect(screen.getByTestId('export-caution')).toHaveTextContent('not a substitute for a statistician’s review');
    expect(screen.getByRole('button', { name: 'Download PDF summary' })).toBeEnabled();
    const csv = screen.getByRole('button', { name: 'Estimates CSV' });
    expect(csv).toBeDisabled();
    expect(csv).toHaveAccessibleDescription(/Run the simulation first/);
  });

  it('disables every download with a reason while the plan has a problem, keeping what was typed', async () => {
    const store = renderPanel();
    store.getState().setField('pretest.reliability', '1.4');
    await waitFor(() => expect(screen.getByRole('button', { name: 'Download PDF summary' })).toBeDisabled());
    for (const name of ['Download PDF summary', 'Plan file (JSON)', 'Estimates CSV', 'Pretest distributions chart as SVG']) {
      const b = screen.getByRole('button', { name });
      expect(b).toBeDisabled();
      expect(b).toHaveAccessibleDescription(/Exports are unavailable while the plan has a problem/);
    }
    expect(JSON.stringify(store.getState().draft)).toContain('1.4');
  });

  it('saves the plan file exactly as serializePlan writes it', async () => {
    const store = renderPanel();
    await userEvent.click(screen.getByRole('button', { name: 'Plan file (JSON)' }));
    await waitFor(() => expect(downloads).toHaveLength(1));
    expect(downloads[0]!.name).toMatch(/-plan\.json$/);
    expect(await downloads[0]!.blob.text()).toBe(serializePlan(store.getState().validPlan));
    expect(screen.getByTestId('export-status')).toHaveTextContent('Plan file downloaded.');
  });

  it('saves the estimates CSV once a simulation of this plan exists', async () => {
    const store = renderPanel();
    const plan = store.getState().validPlan;
    expect(plan).toEqual(demoPlan());
    const result = simulatePlan(plan, { replications: 40, seed: 5 });
    store.setState((s) => ({ simulation: { ...s.simulation, status: 'done', result, stale: false } }));
    const csv = await screen.findByRole('button', { name: 'Estimates CSV' });
    await waitFor(() => expect(csv).toBeEnabled());
    await userEvent.click(csv);
    await waitFor(() => expect(downloads).toHaveLength(1));
    const text = await downloads[0]!.blob.text();
    expect(text.split('\r\n')[0]).toBe('replication,seed,matched_difference,ancova_observed_pretest,gain_score,reliability_corrected_ancova,plan_title');
    expect(text.trim().split('\r\n')).toHaveLength(41);
  });

  it('saves a chart as a standalone SVG file', async () => {
    renderPanel();
    await userEvent.click(screen.getByRole('button', { name: 'Sensitivity chart as SVG' }));
    await waitFor(() => expect(downloads).toHaveLength(1));
    const svg = await downloads[0]!.blob.text();
    expect(svg.startsWith('<?xml version="1.0" encoding="UTF-8"?>\n<svg')).toBe(true);
    const doc = new DOMParser().parseFromString(svg, 'image/svg+xml');
    expect(doc.getElementsByTagName('parsererror')).toHaveLength(0);
  });
});
