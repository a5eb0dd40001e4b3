import { lazy, Suspense, type ComponentType, type ReactNode } from 'react';

/** A component kept out of the first screen's script: its own chunk, fetched when first rendered. */
export interface DeferredPanel<P extends object> {
  /** Renders the component: at once when its chunk is already loaded (see `preload`), else once it loads, showing `fallback` meanwhile. */
  Panel: ComponentType<P>;
  /** Fetches the chunk now (tests, or to warm it before it is needed); resolves when it can render without waiting. */
  preload: () => Promise<void>;
}

const allPreloads: Array<() => Promise<void>> = [];

/**
 * Wrap a dynamically imported component so the first screen's script does not carry it
 * (see DEVELOPERS.md, "What the first screen loads"). When its chunk was loaded before the
 * first render (`preload`), it renders at once without a Suspense pause.
 */
export function deferredPanel<P extends object>(load: () => Promise<ComponentType<P>>, fallback: ReactNode = null): DeferredPanel<P> {
  let loaded: ComponentType<P> | null = null;
  let pending: Promise<ComponentType<P>> | null = null;
  const fetchOnce = () =>
    (pending ??= load().then((c) => {
      loaded = c;
      return c;
    }));
  // Once loaded, the lazy component is handed a thenable that resolves synchronously, so React
  // renders it without suspending; before that it suspends until the chunk arrives. Either way the
  // tree has the same shape, so the panel keeps its state when the page re-renders.
  const Lazy = lazy(() => {
    const ready = loaded;
    if (ready) return { then: (resolve: (m: { default: ComponentType<P> }) => void) => resolve({ default: ready }) } as unknown as Promise<{ default: ComponentType<P> }>; // React reads only `then`
    return fetchOnce().then((c) => ({ default: c }));
  });
  function Panel(props: P) {
    return (
      <Suspense fallback={fallback}>
        <Lazy {...props} />
      </Suspense>
    );
  }
  const preload = () => fetchOnce().then(() => undefined);
  allPreloads.push(preload);
  return { Panel, preload };
}

/** Load every deferred panel's chunk (component tests render the whole page at once after this). */
export function preloadDeferredPanels(): Promise<void> {
  return Promise.all(allPreloads.map((p) => p())).then(() => undefined);
}
