import type { EngineName } from '../core/engineRegistry';

let loading: Promise<void> | null = null;

/**
 * The page's engine loader (MeanwardDeps.loadEngines in the browser): one dynamic import of
 * src/core/allEngines.ts, which registers the closed forms for covariates, clusters and selection
 * rules in the engine registry. They are one chunk outside the first screen, fetched the first
 * time a plan needs one (the service worker precaches it like every built file, so it also loads
 * offline). A failed fetch may be tried again.
 */
export function loadPageEngines(_names?: readonly EngineName[]): Promise<void> {
  if (!loading) {
    loading = import('../core/allEngines').then(
      () => undefined,
      (e: unknown) => {
        loading = null;
        throw e;
      },
    );
  }
  return loading;
}

/** The engines' load in flight or done, if one was started (main.tsx waits for it before the first render). */
export function pageEnginesLoading(): Promise<void> | null {
  return loading;
}
