/**
 * The page's side of offline use: register the service worker the build writes (`sw.js`, see
 * scripts/build/offlineServiceWorker.ts) and say when a new version of Meanward has been
 * installed and is waiting. Nothing here reloads the page on its own: the update notice's
 * Reload button calls `activateUpdate`, which asks the waiting worker to take over and reloads
 * once it has (the user may be typing; see DEVELOPERS.md, "Offline use and the service worker").
 *
 * No DOM or React here beyond the service-worker container passed in, so it is tested with a
 * stand-in container (test/offline/serviceWorkerUpdates.test.ts).
 */

/** What the update notice needs to know. */
export interface UpdateState {
  /** A new version is installed and waiting for the user's go-ahead. */
  updateReady: boolean;
}

type Listener = () => void;

/** The parts of `ServiceWorkerRegistration`, `ServiceWorker` and the container this module uses. */
export interface WorkerLike {
  state: string;
  postMessage(message: unknown): void;
  addEventListener(type: 'statechange', listener: () => void): void;
}
export interface RegistrationLike {
  waiting: WorkerLike | null;
  installing: WorkerLike | null;
  update(): Promise<unknown>;
  addEventListener(type: 'updatefound', listener: () => void): void;
}
export interface ContainerLike {
  controller: unknown;
  register(url: string): Promise<RegistrationLike>;
  addEventListener(type: 'controllerchange', listener: () => void): void;
}

/** How often an open page asks whether a new version exists (the browser also asks on each visit). */
export const UPDATE_CHECK_MS = 60 * 60 * 1000;

/**
 * One page's watch on its service worker: registration, the waiting version, the go-ahead.
 * `reload` is injected (location.reload in the page) so tests can see when it would happen.
 */
export class ServiceWorkerUpdates {
  private state: UpdateState = { updateReady: false };
  private listeners = new Set<Listener>();
  private waiting: WorkerLike | null = null;
  private activating = false;

  constructor(
    private readonly container: ContainerLike,
    private readonly reload: () => void,
  ) {}

  /** Current state (stable object between changes, as useSyncExternalStore needs). */
  getState = (): UpdateState => this.state;

  /** Be told when the state changes; returns the unsubscribe function. */
  subscribe = (listener: Listener): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  /**
   * Register the worker at `url` (relative to the page, so any sub-path works) and watch for a
   * new version. A failed registration (private mode, blocked by the browser) leaves the page
   * working online as before and is not an error the user needs to see; it resolves to false.
   */
  async start(url: string): Promise<boolean> {
    let registration: RegistrationLike | undefined;
    try {
      registration = await this.container.register(url);
    } catch {
      return false;
    }
    // Some embedders (a browser driven for tests with service workers blocked) resolve with nothing.
    if (!registration || typeof registration !== 'object') return false;
    // A version installed on an earlier visit may already be waiting. Without a controller the
    // page is on its first visit and the installing worker is the first version, not an update.
    if (registration.waiting && this.container.controller) this.offer(registration.waiting);
    // The browser may already be installing a new version (its own check on this visit).
    if (registration.installing) this.watchInstall(registration.installing);
    registration.addEventListener('updatefound', () => {
      if (registration.installing) this.watchInstall(registration.installing);
    });
    return true;
  }

  /** Ask the waiting version to take over; the page reloads once it controls the page. */
  activateUpdate = (): void => {
    const waiting = this.waiting;
    if (!waiting || this.activating) return;
    this.activating = true;
    this.container.addEventListener('controllerchange', () => this.reload());
    waiting.postMessage({ type: 'SKIP_WAITING' });
  };

  /** Offer a worker once it has installed, if it is an update (the page already has a controller). */
  private watchInstall(worker: WorkerLike): void {
    worker.addEventListener('statechange', () => {
      if (worker.state === 'installed' && this.container.controller) this.offer(worker);
    });
  }

  private offer(worker: WorkerLike): void {
    this.waiting = worker;
    if (this.state.updateReady) return;
    this.state = { updateReady: true };
    for (const l of this.listeners) l();
  }
}

let pageUpdates: ServiceWorkerUpdates | null = null;

/**
 * The page's one watch (null where the browser has no service workers, or in the dev server and
 * tests, which never register one). Started by main.tsx after the page has loaded.
 */
export function pageServiceWorkerUpdates(): ServiceWorkerUpdates | null {
  return pageUpdates;
}

/** Register `./sw.js` for the built page once it has loaded; a no-op without service workers. */
export function startPageServiceWorker(): void {
  if (typeof navigator === 'undefined' || !('serviceWorker' in navigator)) return;
  const container = navigator.serviceWorker as unknown as ContainerLike;
  pageUpdates = new ServiceWorkerUpdates(container, () => location.reload());
  const updates = pageUpdates;
  const begin = () => {
    void updates.start('./sw.js').then((ok) => {
      if (!ok) return;
      window.setInterval(() => {
        void navigator.serviceWorker.getRegistration().then((r) => r?.update()).catch(() => undefined);
      }, UPDATE_CHECK_MS);
    });
  };
  if (document.readyState === 'complete') begin();
  else window.addEventListener('load', begin, { once: true });
}
