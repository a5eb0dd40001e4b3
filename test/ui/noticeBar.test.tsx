// @vitest-environment jsdom
// The notice bar: Undo after a replace (keyboard, announced as a status), and
// the message about an unreadable autosave with its download button.
import { cleanup, render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { AUTOSAVE_KEY, UNREADABLE_KEY } from '../../src/state/persistenceSlice';
import { MeanwardStoreContext } from '../../src/state/store';
import { App } from '../../src/ui/App';
import { makeStore, memoryStorage } from '../state/helpers';
import { renderApp } from './renderApp';

afterEach(cleanup);

describe('notice bar', () => {
  it('after "Reset to demo", Undo is reachable by Tab, in a status message, and brings the typed text back', async () => {
    const user = userEvent.setup();
    const { store } = renderApp();
    const caliper = screen.getByRole('textbox', { name: /^Caliper/ });
    await user.clear(caliper);
    await user.type(caliper, '0.3 or so');
    await user.click(screen.getByRole('button', { name: 'Reset to demo' }));
    expect(caliper).toHaveValue(String(store.getState().validPlan.matching.caliper));
    const status = screen.getByTestId('notice').closest('[role="status"]') as HTMLElement;
    expect(status).not.toBeNull();
    expect(status).toHaveTextContent('The form was reset to the demo plan');
    // Keyboard: from the reset button, Tab reaches Undo (after the other header actions, within 10 stops).
    const undo = within(status).getByRole('button', { name: 'Undo' });
    for (let i = 0; i < 10 && document.activeElement !== undo; i++) await user.tab();
    expect(undo).toHaveFocus();
    await user.keyboard('{Enter}');
    expect(caliper).toHaveValue('0.3 or so');
    expect(screen.getByTestId('notice')).toHaveTextContent(/^Brought back your plan from before the reset to the demo/);
    // The same button now offers Redo, and keeps the focus.
    expect(within(screen.getByTestId('notice')).getByRole('button', { name: 'Redo' })).toHaveFocus();
  });

  it('an unreadable autosave: says so as an alert, downloads the stored text, and is forgotten only when dismissed', async () => {
    const user = userEvent.setup();
    const storage = memoryStorage();
    storage.setItem(AUTOSAVE_KEY, '{"version":1,"draft":');
    const store = makeStore({ storage });
    render(
      <MeanwardStoreContext.Provider value={store}>
        <App />
      </MeanwardStoreContext.Provider>,
    );
    const box = screen.getByTestId('unreadable-draft-notice');
    expect(box.closest('[role="alert"]')).not.toBeNull();
    expect(box).toHaveTextContent(/An autosaved draft could not be read .* the form shows the demo plan/);
    const blobs: Blob[] = [];
    const create = vi.fn((b: Blob) => {
      blobs.push(b);
      return 'blob:test';
    });
    const revoke = vi.fn();
    Object.assign(URL, { createObjectURL: create, revokeObjectURL: revoke });
    const clicked = vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(() => undefined);
    await user.click(within(box).getByRole('button', { name: 'Download the unreadable draft' }));
    expect(clicked).toHaveBeenCalledTimes(1);
    expect(await blobs[0]!.text()).toBe('{"version":1,"draft":');
    expect(storage.getItem(UNREADABLE_KEY)).not.toBeNull(); // still kept after the download
    await user.click(within(box).getByRole('button', { name: 'Dismiss and forget it' }));
    expect(screen.queryByTestId('unreadable-draft-notice')).toBeNull();
    expect(storage.getItem(UNREADABLE_KEY)).toBeNull();
    clicked.mockRestore();
  });
});
