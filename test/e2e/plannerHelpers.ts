import { expect, type Page } from '@playwright/test';
import { E2E_ORIGIN } from './origin';

/**
 * Record every request the page makes to anywhere but its own origin.
 * Meanward promises that nothing leaves the browser (no fonts, no CDNs, no
 * analytics); data: and blob: URLs stay on the machine and are allowed.
 */
export function trackForeignRequests(page: Page, origin = E2E_ORIGIN): string[] {
  const foreign: string[] = [];
  page.on('request', (req) => {
    const url = req.url();
    if (url.startsWith('data:') || url.startsWith('blob:')) return;
    if (!url.startsWith(`${origin}/`)) foreign.push(url);
  });
  return foreign;
}

/** Replace a text box's contents as a user would (select all, type). */
export async function retype(page: Page, label: RegExp, value: string): Promise<void> {
  const box = page.getByRole('textbox', { name: label });
  await box.fill('');
  await box.pressSequentially(value);
  await expect(box).toHaveValue(value);
}

/** Parse a displayed number ("−1.97", "+2.03", "35.4%") back to a number. */
export function shownNumber(text: string): number {
  const m = text.replace('−', '-').match(/[-+]?\d+(\.\d+)?/);
  if (!m) throw new Error(`No number in "${text}"`);
  return Number(m[0]);
}

/** Simulated figure "v ± e" in a table cell. */
export function shownFigure(text: string): { value: number; mcse: number } {
  const [v, e] = text.split('±');
  return { value: shownNumber(v ?? ''), mcse: shownNumber(e ?? '') };
}
