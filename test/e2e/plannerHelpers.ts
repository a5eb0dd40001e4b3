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

/** Replace a text box's contents as a user would (select all, type); a string label is matched exactly. */
export async function retype(page: Page, label: RegExp | string, value: string): Promise<void> {
  const box = page.getByRole('textbox', { name: label, exact: typeof label === 'string' });
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

/**
 * Open the planner afresh: no autosave or remembered pilot mapping from an
 * earlier visit (local and session storage cleared), and wait for the verdict.
 */
export async function openFreshPlanner(page: Page): Promise<void> {
  await page.goto('/');
  await page.evaluate(() => {
    localStorage.clear();
    sessionStorage.clear();
  });
  await page.goto('/');
  await expect(page.getByTestId('verdict-bias')).toBeVisible();
  // Let the page settle: the quick figures of the planned procedure arrive from their worker and re-render once.
  await waitForPlannedFigures(page);
}

/** A long task the browser reported (PerformanceObserver 'longtask': over 50 ms on the main thread). */
export interface LongTask {
  start: number;
  duration: number;
}

type LongTaskWindow = { __longTasks: LongTask[]; __doneAt: number | null; __marks: string[] | null };

/**
 * Let the page settle (500 ms), then record every long task from now on, and
 * the time the element with data-testid `statusTestId` first reports
 * data-status `doneStatus`; with `marks`, also each change of its status (for
 * the log). Returns performance.now() at the start of the watch.
 */
export async function watchLongTasks(page: Page, statusTestId: string, doneStatus: string, { marks = false } = {}): Promise<number> {
  await page.waitForTimeout(500);
  await page.evaluate(
    ({ testId, done, withMarks }) => {
      const w = window as unknown as LongTaskWindow;
      w.__longTasks = [];
      w.__doneAt = null;
      w.__marks = withMarks ? [] : null;
      new PerformanceObserver((list) => {
        for (const e of list.getEntries()) w.__longTasks.push({ start: e.startTime, duration: e.duration });
      }).observe({ type: 'longtask', buffered: false });
      const status = document.querySelector(`[data-testid="${testId}"]`)!;
      new MutationObserver(() => {
        w.__marks?.push(`${Math.round(performance.now())} ${status.getAttribute('data-status')}`);
        if (status.getAttribute('data-status') === done && w.__doneAt === null) w.__doneAt = performance.now();
      }).observe(status, { attributes: true });
    },
    { testId: statusTestId, done: doneStatus, withMarks: marks },
  );
  return page.evaluate(() => performance.now());
}

/**
 * After a watch started at `startedAt` (watchLongTasks): wait 300 ms, then
 * every long task seen, those that started before the status reported done,
 * the time it did (null if it never did) and the status marks (empty unless asked for).
 */
export async function watchedLongTasks(
  page: Page,
  startedAt: number,
): Promise<{ tasks: LongTask[]; during: LongTask[]; doneAt: number | null; marks: string[] }> {
  await page.waitForTimeout(300);
  const { tasks, doneAt, marks } = await page.evaluate(() => {
    const w = window as unknown as LongTaskWindow;
    return { tasks: w.__longTasks, doneAt: w.__doneAt, marks: w.__marks ?? [] };
  });
  const during = tasks.filter((t) => t.start >= startedAt && t.start < doneAt!);
  return { tasks, during, doneAt, marks };
}

/**
 * Wait until the figures on screen are those of the procedure as planned (the
 * quick simulation's figures have replaced the closed forms shown at first).
 */
export async function waitForPlannedFigures(page: Page): Promise<void> {
  await expect(page.getByTestId('verdict')).toHaveAttribute('data-basis', 'planned-procedure', { timeout: 15_000 });
}

/** Every chart label's real box (Chromium's getBBox, transformed to the svg) lies inside its svg's viewBox, 1 px slack. */
export async function clippedChartLabels(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const out: string[] = [];
    for (const svg of Array.from(document.querySelectorAll<SVGSVGElement>('figure[data-chart] svg'))) {
      const vb = svg.viewBox.baseVal;
      for (const t of Array.from(svg.querySelectorAll<SVGTextElement>('text'))) {
        const b = t.getBBox();
        const m = t.getCTM() && svg.getCTM() ? svg.getCTM()!.inverse().multiply(t.getCTM()!) : null;
        if (!m) continue;
        const pts = [
          new DOMPoint(b.x, b.y).matrixTransform(m),
          new DOMPoint(b.x + b.width, b.y + b.height).matrixTransform(m),
        ];
        const [x0, x1] = [Math.min(pts[0]!.x, pts[1]!.x), Math.max(pts[0]!.x, pts[1]!.x)];
        const [y0, y1] = [Math.min(pts[0]!.y, pts[1]!.y), Math.max(pts[0]!.y, pts[1]!.y)];
        if (x0 < -1 || y0 < -1 || x1 > vb.width + 1 || y1 > vb.height + 1) {
          out.push(`${svg.closest('figure')!.getAttribute('data-chart')}: "${t.textContent}" ${x0.toFixed(0)}..${x1.toFixed(0)} × ${y0.toFixed(0)}..${y1.toFixed(0)} in ${vb.width} × ${vb.height}`);
        }
      }
    }
    return out;
  });
}

/** The accessible name of the focused element (its label's text), for moving by Tab. */
export async function focusedName(page: Page): Promise<string> {
  return page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    if (!el) return '';
    const id = el.id;
    const label = id ? document.querySelector(`label[for="${CSS.escape(id)}"]`) : null;
    return (label?.textContent ?? el.getAttribute('aria-label') ?? el.textContent ?? '').trim();
  });
}

/** Press Tab (forwards only) until the focused control's label starts with `name`; fails after 250 presses. */
export async function tabTo(page: Page, name: string): Promise<void> {
  for (let i = 0; i < 250; i++) {
    if ((await focusedName(page)).startsWith(name)) return;
    await page.keyboard.press('Tab');
  }
  throw new Error(`No control labelled "${name}" reached by Tab.`);
}

/** Tab to a text box, select its contents and type a value, as a keyboard user would. */
export async function typeInto(page: Page, name: string, value: string): Promise<void> {
  await tabTo(page, name);
  await page.keyboard.press('Control+A');
  await page.keyboard.type(value);
}

/** Tab to a drop-down and move through its options with the arrow keys until `option` is chosen. */
export async function choose(page: Page, name: string, option: string): Promise<void> {
  await tabTo(page, name);
  const current = () => page.evaluate(() => (document.activeElement as HTMLSelectElement).selectedOptions[0]?.textContent ?? '');
  for (const key of ['ArrowDown', 'ArrowUp']) {
    for (let i = 0; i < 6; i++) {
      if ((await current()) === option) return;
      await page.keyboard.press(key);
    }
  }
  throw new Error(`"${name}" has no option "${option}" within reach of the arrow keys.`);
}

/** Start from the top of the form with the keyboard: focus the page, then Tab forwards from the plan title. */
export async function startAtPlanTitle(page: Page): Promise<void> {
  await page.keyboard.press('Tab');
  await tabTo(page, 'Plan title');
}
