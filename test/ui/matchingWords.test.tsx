// @vitest-environment jsdom
import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { MATCHING_WORDS } from '../../src/core/matchingWords';
import type { Plan } from '../../src/core/plan';
import { parsePlanText, serializePlan } from '../../src/io/planFile';
import { demoPlan } from '../../src/io/demoPlan';
import { planInputRows } from '../../src/report/planInputRows';
import { renderApp } from './renderApp';

/** The plan-file values of version 1 (docs/plan-file.md): these never change, only the words shown. */
const FILE_VALUES = {
  method: ['nearest', 'random-within-caliper'],
  order: ['random', 'lowest-first', 'highest-first'],
};

describe('matching options in plain English', () => {
  it('asks plain questions on screen and offers plain answers, with the plan-file values underneath', async () => {
    const user = userEvent.setup();
    const { store } = renderApp();
    const order = screen.getByRole('combobox', { name: /^Who picks first/ }) as HTMLSelectElement;
    expect([...order.options].map((o) => o.textContent)).toEqual(['Anyone: a random order', 'Those with the lowest pretest', 'Those with the highest pretest']);
    expect([...order.options].map((o) => o.value)).toEqual(FILE_VALUES.order);
    const method = screen.getByRole('combobox', { name: /^How a partner is chosen/ }) as HTMLSelectElement;
    expect([...method.options].map((o) => o.value)).toEqual(FILE_VALUES.method);
    expect([...method.options].map((o) => o.textContent)).toEqual(['The closest pretest score', 'Any one within the caliper, at random']);
    const reuse = screen.getByRole('checkbox', { name: 'May a comparison person be used more than once?' });
    // The trade's term stays in the hint, so a reader can look the method up.
    expect(document.getElementById(reuse.getAttribute('aria-describedby')!.split(' ')[0]!)?.textContent).toContain('with replacement');
    expect(screen.getByRole('textbox', { name: /^Ratio: comparison partners for each programme member/ })).toBeInTheDocument();
    expect(screen.getByRole('textbox', { name: /^Caliper/ })).toBeInTheDocument();
    // No option reads like a list of keywords.
    expect(document.body.textContent).not.toMatch(/lowest-first|highest-first|random-within-caliper/);

    // Choosing in plain words writes the version-1 values into the plan and its file.
    await user.selectOptions(order, 'Those with the highest pretest');
    await user.click(reuse);
    const plan = store.getState().validPlan as Plan;
    expect(plan.matching.order).toBe('highest-first');
    expect(plan.matching.replacement).toBe(true);
    const file = JSON.parse(serializePlan(plan)) as { version: number; matching: { order: string; replacement: boolean } };
    expect(file.version).toBe(1);
    expect(file.matching).toMatchObject({ order: 'highest-first', replacement: true });
  });

  it('reads a version-1 plan file with the old values and shows them in the new words (screen words = PDF words)', () => {
    const text = JSON.stringify({ ...JSON.parse(serializePlan(demoPlan())), matching: { method: 'random-within-caliper', caliper: 0.2, ratio: 2, replacement: true, order: 'lowest-first' } });
    const read = parsePlanText(text);
    expect(read.ok).toBe(true);
    if (!read.ok) return;
    const rows = new Map(planInputRows(read.plan).map((r) => [r.path, r]));
    expect(rows.get('matching.order')).toMatchObject({ label: MATCHING_WORDS.orderQuestion, value: 'Those with the lowest pretest' });
    expect(rows.get('matching.method')).toMatchObject({ label: 'How a partner is chosen', value: 'Any one within the caliper, at random' });
    expect(rows.get('matching.replacement')).toMatchObject({ label: 'May a comparison person be used more than once?', value: 'yes' });
    expect(rows.get('matching.ratio')!.label).toBe('Ratio: comparison partners for each programme member');
  });
});
