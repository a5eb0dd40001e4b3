// @vitest-environment jsdom
// The pilot panel with Testing Library: open it, give it an invented file by
// the picker (and by drag-and-drop), check the mapping, estimate, use the
// values, and see the plan's fields, results and provenance notes follow.
// jsdom has no Worker, so the in-page reader runs the same src/pilot
// functions. Displayed numbers are compared with the estimates object
// formatted by the shared formatters (no tolerance: same strings), and the
// group sizes and a mean with an independent library (simple-statistics).
import { act, fireEvent, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { mean } from 'simple-statistics';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { fmt, fmtInt } from '../../src/ui/format';
import { inventedPilot } from '../state/pilotTestData';
import { renderApp } from './renderApp';

const DATA = inventedPilot({ seed: 2026, programme: 80, comparison: 120, items: 6, retest: true, posttest: true });
const fileOf = (text: string, name: string) => new File([text], name, { type: 'text/csv' });

beforeEach(() => sessionStorage.clear());

/** Estimates are typed into the form with 6 significant digits: relative difference at most 5e-6. */
function expectWritten(shown: unknown, estimate: number) {
  expect(Math.abs(Number(shown) - estimate)).toBeLessThanOrEqual(5e-6 * Math.abs(estimate));
}

async function openPanel(user: ReturnType<typeof userEvent.setup>) {
  const toggle = screen.getByRole('button', { name: /Estimate from pilot data/ });
  expect(toggle).toHaveAttribute('aria-expanded', 'false');
  await user.click(toggle);
  expect(toggle).toHaveAttribute('aria-expanded', 'true');
  return within(screen.getByTestId('pilot-panel'));
}

describe('pilot panel', () => {
  it('says the data stay on this computer, and its drop zone is a button that opens the file picker', async () => {
    const user = userEvent.setup();
    renderApp();
    const panel = await openPanel(user);
    expect(panel.getByText(/Your data stay on this computer\./)).toBeInTheDocument();
    expect(panel.getByText(/rows are never sent anywhere and are not stored/)).toBeInTheDocument();
    const drop = panel.getByRole('button', { name: /Choose a pilot file/ });
    const input = panel.getByLabelText('Pilot data file (CSV or TSV)') as HTMLInputElement;
    const click = vi.spyOn(input, 'click');
    drop.focus();
    await user.keyboard('{Enter}');
    expect(click).toHaveBeenCalledTimes(1);
    // The live region exists before anything is announced.
    expect(panel.getByRole('status')).toHaveAttribute('aria-live', 'polite');
  });

  it('imports a file, maps columns, estimates, and fills the plan with provenance notes', async () => {
    const user = userEvent.setup();
    const { store } = renderApp();
    const panel = await openPanel(user);
    const biasBefore = screen.getByTestId('verdict-bias').textContent;
    await user.upload(panel.getByLabelText('Pilot data file (CSV or TSV)'), fileOf(DATA.text, 'wave1-invented.csv'));
    expect(await panel.findByTestId('pilot-file-facts')).toHaveTextContent(
      'wave1-invented.csv: 200 rows of data, 10 columns, separated by commas; the first row holds the column names; 1 comment line (starting with #) skipped.',
    );
    // The guessed mapping, as labelled controls (mounted in a deferred render, hence findBy).
    expect(await panel.findByLabelText('Group column')).toHaveValue('group');
    expect(panel.getByLabelText('Programme group is')).toHaveValue('programme');
    expect(panel.getByText('Comparison group: “comparison”.')).toBeInTheDocument();
    expect(panel.getByRole('radio', { name: 'Item columns' })).toBeChecked();
    for (let j = 1; j <= 6; j++) expect(panel.getByRole('checkbox', { name: `item${j}` })).toBeChecked();
    expect(panel.getByLabelText('Retest column (optional)')).toHaveValue('retest');
    expect(panel.getByLabelText('Posttest column (optional)')).toHaveValue('posttest');
    // Nothing is in the plan yet.
    expect(screen.getByTestId('verdict-bias').textContent).toBe(biasBefore);

    await user.click(panel.getByRole('button', { name: 'Estimate' }));
    const estimates = await panel.findByTestId('pilot-estimates');
    const e = store.getState().pilot.estimates!;
    const table = within(within(estimates).getByTestId('pilot-group-table'));
    const row = (name: RegExp) => table.getByRole('row', { name });
    // n known by construction (80 and 120 invented people).
    expect(row(/^People used/)).toHaveTextContent('80120200');
    // Programme pretest mean: the mean of the item sums (simple-statistics), shown to 2 decimals.
    const sums = DATA.rows.filter((r) => r.group === 'programme').map((r) => r.items.reduce((a, b) => a + b, 0));
    expect(within(row(/^Pretest mean/)).getAllByRole('cell')[0]).toHaveTextContent(fmt(mean(sums)));
    expect(within(estimates).getByTestId('pilot-alpha')).toHaveTextContent(
      `(95% CI ${fmt(e.reliability.alpha!.lower).replace(/^0/, '')}–${fmt(e.reliability.alpha!.upper).replace(/^0/, '')}), n = ${fmtInt(e.reliability.alpha!.n)}, 6 items`,
    );
    expect(within(estimates).getByTestId('pilot-retest')).toBeInTheDocument();
    expect(within(estimates).getByTestId('pilot-rows')).toHaveTextContent('200 of 200 rows used.');
    expect(panel.getByTestId('pilot-status')).toHaveTextContent(/Nothing is in the plan until you choose “Use these values”\./);
    expect(screen.getByTestId('verdict-bias').textContent).toBe(biasBefore);
    // Before pressing: what will be written, the value now and the pilot's (demo plan: programme mean 44).
    const preview = within(panel.getByTestId('pilot-preview'));
    expect(preview.getByRole('row', { name: /^Programme pretest mean/ })).toHaveTextContent(`Programme pretest mean44.00${fmt(e.groups.programme.pretestMean)}`);
    expect(preview.getAllByRole('row')).toHaveLength(1 + 8); // header + 4 group values, reliability, reference SD, posttest SD, pre–post r

    // With a retest mapped, the test–retest figure is suggested for the plan, with why; the researcher may choose alpha.
    const choice = within(panel.getByTestId('pilot-reliability-choice'));
    expect(choice.getByRole('radio', { name: /^test–retest correlation within groups.*\(suggested\)/ })).toBeChecked();
    expect(choice.getByText(/day-to-day ups and downs as error/)).toBeInTheDocument();
    await user.click(choice.getByRole('radio', { name: /^Cronbach's alpha within groups/ }));

    await user.click(panel.getByRole('button', { name: 'Use these values' }));
    const plan = store.getState().validPlan;
    // The corrected ANCOVA's assumed reliability is asked about, not changed.
    const assumedBefore = plan.analysis.assumedReliability;
    expect(assumedBefore).not.toBe(plan.pretest.reliability);
    const offers = panel.getByTestId('pilot-offers');
    expect(offers).toHaveTextContent(/The corrected ANCOVA still assumes a reliability of/);
    expectWritten(plan.groups.programme.pretestMean, e.groups.programme.pretestMean);
    const meanBox = screen.getByRole('textbox', { name: /^Pretest mean, programme group/ });
    expectWritten((meanBox as HTMLInputElement).value, e.groups.programme.pretestMean);
    // The note sits under the field and is linked to it.
    const note = plan.provenance!['groups.programme.pretestMean']!.note;
    expect(note).toMatch(/^from pilot file wave1-invented\.csv/);
    const described = meanBox.getAttribute('aria-describedby')!.split(' ').map((id) => document.getElementById(id)?.textContent);
    expect(described).toContain(note);
    const relBox = screen.getByRole('textbox', { name: /^Reliability/ });
    expect(relBox.closest('[data-field]')!.querySelector('[data-testid="field-source"]')).toHaveTextContent(/Cronbach's alpha within groups/);
    // Results follow the new plan.
    expect(screen.getByTestId('verdict-bias').textContent).not.toBe(biasBefore);
    const report = panel.getByTestId('pilot-apply-report');
    expect(within(report).getByText('Programme pretest mean')).toBeInTheDocument();
    expect(panel.getByTestId('pilot-status')).toHaveTextContent(/plan fields filled from “wave1-invented\.csv”/);
    await user.click(within(offers).getByRole('button', { name: /for the corrected ANCOVA$/ }));
    expect(store.getState().validPlan.analysis.assumedReliability).toBe(Number(plan.pretest.reliability!.toPrecision(6)));
    expect(panel.queryByTestId('pilot-offers')).toBeNull();

    // Typing over a pilot value removes its note: the plan no longer credits the pilot.
    await user.clear(meanBox);
    await user.type(meanBox, '45{Enter}'); // Enter commits the typed value to the plan
    expect(meanBox.closest('[data-field]')!.querySelector('[data-testid="field-source"]')).toBeNull();
    expect(store.getState().validPlan.provenance?.['groups.programme.pretestMean']).toBeUndefined();
  });

  it('takes a dropped file, and "Plan with the pessimistic reliability" uses the lower CI end', async () => {
    const user = userEvent.setup();
    const { store } = renderApp();
    const panel = await openPanel(user);
    const drop = panel.getByRole('button', { name: /Choose a pilot file/ });
    const file = fileOf(DATA.text, 'dropped-invented.csv');
    await act(async () => {
      fireEvent.dragOver(drop, { dataTransfer: { files: [file], dropEffect: 'none' } });
      fireEvent.drop(drop, { dataTransfer: { files: [file] } });
    });
    expect(await panel.findByTestId('pilot-file-facts')).toHaveTextContent('dropped-invented.csv');
    await user.click(await panel.findByRole('button', { name: 'Estimate' }));
    await panel.findByTestId('pilot-estimates');
    await user.click(panel.getByRole('radio', { name: /^Cronbach's alpha within groups/ }));
    const lower = store.getState().pilot.estimates!.reliability.alpha!.lower;
    // The button names the value it will plan with: alpha's lower Feldt limit, 3 decimals.
    await user.click(panel.getByRole('button', { name: `Plan with the pessimistic reliability (${fmt(lower, 3).replace(/^0/, '')})` }));
    expectWritten((screen.getByRole('textbox', { name: /^Reliability/ }) as HTMLInputElement).value, lower);
    expect(panel.getByTestId('pilot-apply-report')).toHaveTextContent(/reliability at the lower end of its interval/);
  });

  it('a non-numeric cell: a clear message naming the column and the row, and the plan unchanged', async () => {
    const user = userEvent.setup();
    const { store } = renderApp();
    const panel = await openPanel(user);
    const bad = inventedPilot({ seed: 8, programme: 30, comparison: 30, items: 4, posttest: true, badCell: { row: 20, column: 'item3', text: 'absent' } });
    const draftBefore = store.getState().draft;
    // The plan's boxes (the pilot panel's own boxes, e.g. the items' scale, are not the plan).
    const planBoxes = () => screen.getAllByRole('textbox').filter((b) => b.closest('[data-testid="pilot-panel"]') === null);
    const values = planBoxes().map((b) => (b as HTMLInputElement).value);
    await user.upload(panel.getByLabelText('Pilot data file (CSV or TSV)'), fileOf(bad.text, 'bad-invented.csv'));
    await panel.findByTestId('pilot-file-facts');
    // The column with text is offered, marked, and chosen by its name: estimating names the cell.
    expect(await panel.findByRole('checkbox', { name: 'item3 (has text)' })).toBeChecked();
    await user.click(panel.getByRole('button', { name: 'Estimate' }));
    const alert = await panel.findByRole('alert');
    expect(alert).toHaveTextContent('No estimates; your plan is unchanged.');
    // Data row 20 is line 22 of the file (a comment line and the header come first).
    expect(alert).toHaveTextContent('Column "item3" must hold numbers, but row 22 holds "absent".');
    expect(panel.queryByTestId('pilot-estimates')).toBeNull();
    // Said once: the polite status region stays quiet while the alert speaks.
    expect(panel.getByTestId('pilot-status')).toHaveTextContent(/^$/);
    expect(store.getState().draft).toBe(draftBefore);
    expect(planBoxes().map((b) => (b as HTMLInputElement).value)).toEqual(values);
  });

  it('a file that cannot be read says so and offers the picker again', async () => {
    const user = userEvent.setup();
    renderApp();
    const panel = await openPanel(user);
    await user.upload(panel.getByLabelText('Pilot data file (CSV or TSV)'), fileOf('# nothing but a label\n', 'empty.csv'));
    const alert = await panel.findByRole('alert');
    expect(alert).toHaveTextContent('The file could not be read; your plan is unchanged.');
    await waitFor(() => expect(panel.getByRole('button', { name: /Choose a pilot file/ })).toBeEnabled());
    expect(panel.queryByLabelText('Group column')).toBeNull();
  });
});
