// @vitest-environment jsdom
// The page's side of the service worker: when a new version counts as "ready", and that only the
// Reload button (never a timer or the worker itself) reloads the page. The lifecycle modelled by the
// stand-in below (installing → installed = waiting → activated; a controller only once one has
// activated; controllerchange when a waiting worker takes over) is the W3C Service Workers
// specification's (common practice); the browser suite checks the same with a real worker
// (test/e2e/offline.spec.ts).
import { act, cleanup, render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { ServiceWorkerUpdates, type ContainerLike, type RegistrationLike, type WorkerLike } from '../../src/offline/serviceWorkerUpdates';
import { UpdateNotice } from '../../src/ui/UpdateNotice';

afterEach(cleanup);

class FakeWorker implements WorkerLike {
  state = 'installing';
  messages: unknown[] = [];
  private listeners: Array<() => void> = [];
  postMessage(m: unknown) {
    this.messages.push(m);
  }
  addEventListener(_t: 'statechange', l: () => void) {
    this.listeners.push(l);
  }
  become(state: string) {
    this.state = state;
    for (const l of this.listeners) l();
  }
}

class FakeRegistration implements RegistrationLike {
  waiting: FakeWorker | null = null;
  installing: FakeWorker | null = null;
  updates = 0;
  private found: Array<() => void> = [];
  update() {
    this.updates++;
    return Promise.resolve();
  }
  addEventListener(_t: 'updatefound', l: () => void) {
    this.found.push(l);
  }
  /** The browser found a new sw.js and starts installing it. */
  startInstall(w: FakeWorker) {
    this.installing = w;
    for (const l of this.found) l();
  }
}

class FakeContainer implements ContainerLike {
  controller: unknown = null;
  registered: string[] = [];
  private changes: Array<() => void> = [];
  constructor(
    readonly registration: FakeRegistration,
    private readonly fail: 'no' | 'rejects' | 'resolves with nothing' = 'no',
  ) {}
  register(url: string) {
    this.registered.push(url);
    if (this.fail === 'rejects') return Promise.reject(new Error('The operation is insecure.'));
    return Promise.resolve(this.fail === 'no' ? this.registration : (undefined as unknown as FakeRegistration));
  }
  addEventListener(_t: 'controllerchange', l: () => void) {
    this.changes.push(l);
  }
  takeOver() {
    this.controller = {};
    for (const l of this.changes) l();
  }
}

describe('ServiceWorkerUpdates', () => {
  it('registers sw.js relative to the page', async () => {
    const c = new FakeContainer(new FakeRegistration());
    expect(await new ServiceWorkerUpdates(c, vi.fn()).start('./sw.js')).toBe(true);
    expect(c.registered).toEqual(['./sw.js']);
  });

  it('a first install is not an update: no notice while the page has no controller', async () => {
    const reg = new FakeRegistration();
    const c = new FakeContainer(reg);
    const u = new ServiceWorkerUpdates(c, vi.fn());
    await u.start('./sw.js');
    const first = new FakeWorker();
    reg.startInstall(first);
    first.become('installed');
    expect(u.getState().updateReady).toBe(false);
  });

  it('a new version installed beside the one in control is offered; the page reloads only after Reload and the take-over', async () => {
    const reg = new FakeRegistration();
    const c = new FakeContainer(reg);
    c.controller = {};
    const reload = vi.fn();
    const u = new ServiceWorkerUpdates(c, reload);
    const seen = vi.fn();
    u.subscribe(seen);
    await u.start('./sw.js');
    const next = new FakeWorker();
    reg.startInstall(next);
    expect(u.getState().updateReady).toBe(false);
    next.become('installed');
    expect(u.getState().updateReady).toBe(true);
    expect(seen).toHaveBeenCalledTimes(1);
    expect(next.messages).toEqual([]);
    expect(reload).not.toHaveBeenCalled();
    u.activateUpdate();
    expect(next.messages).toEqual([{ type: 'SKIP_WAITING' }]);
    expect(reload).not.toHaveBeenCalled(); // not until the new version controls the page
    c.takeOver();
    expect(reload).toHaveBeenCalledTimes(1);
    u.activateUpdate(); // a second press sends nothing more
    expect(next.messages).toHaveLength(1);
  });

  it('a version left waiting by an earlier visit is offered at once', async () => {
    const reg = new FakeRegistration();
    reg.waiting = new FakeWorker();
    reg.waiting.state = 'installed';
    const c = new FakeContainer(reg);
    c.controller = {};
    const u = new ServiceWorkerUpdates(c, vi.fn());
    await u.start('./sw.js');
    expect(u.getState().updateReady).toBe(true);
  });

  for (const fail of ['rejects', 'resolves with nothing'] as const) {
    it(`a registration the browser refuses (${fail}) leaves the page as it was, with no error thrown`, async () => {
      const u = new ServiceWorkerUpdates(new FakeContainer(new FakeRegistration(), fail), vi.fn());
      expect(await u.start('./sw.js')).toBe(false);
      expect(u.getState().updateReady).toBe(false);
    });
  }
});

describe('UpdateNotice', () => {
  it('shows nothing without a new version, then a polite notice whose Reload button asks the new version to take over', async () => {
    const reg = new FakeRegistration();
    const c = new FakeContainer(reg);
    c.controller = {};
    const reload = vi.fn();
    const u = new ServiceWorkerUpdates(c, reload);
    await u.start('./sw.js');
    render(<UpdateNotice updates={u} />);
    expect(screen.queryByTestId('update-notice')).toBeNull();
    const next = new FakeWorker();
    act(() => {
      reg.startInstall(next);
      next.become('installed');
    });
    expect(screen.getByTestId('update-notice')).toHaveTextContent('A new version of Meanward is ready. Reload to use it.');
    expect(screen.getByRole('status')).toContainElement(screen.getByTestId('update-notice'));
    await userEvent.click(screen.getByRole('button', { name: 'Reload' }));
    expect(next.messages).toEqual([{ type: 'SKIP_WAITING' }]);
    c.takeOver();
    expect(reload).toHaveBeenCalledTimes(1);
  });

  it('renders nothing where the page has no service worker (dev server, tests)', () => {
    const { container } = render(<UpdateNotice updates={null} />);
    expect(container.innerHTML).toBe('');
  });
});
