import { cleanup, render } from '@testing-library/react';
import { afterEach } from 'vitest';
import type { SimulationRunner } from '../../src/state/deps';
import { MeanwardStoreContext } from '../../src/state/store';
import { App } from '../../src/ui/App';
import { preloadDeferredPanels } from '../../src/ui/deferredPanel';
import { makeStore } from '../state/helpers';

// Vitest runs without globals, so Testing Library cannot register its own cleanup.
afterEach(cleanup);

// The page's deferred chunks (charts, methods text, candidate plans, the pilot reader) are loaded
// before any render here, so the whole page renders at once as the tests expect.
await preloadDeferredPanels();

/** Render the whole planner over a fresh store (real core and io; injected simulation). */
export function renderApp(opts: { simulation?: SimulationRunner | null } = {}) {
  const store = makeStore({ simulation: opts.simulation ?? null });
  const utils = render(
    <MeanwardStoreContext.Provider value={store}>
      <App />
    </MeanwardStoreContext.Provider>,
  );
  return { store, ...utils };
}
