import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { demoPlan } from './io/demoPlan';
import { defaultDeps } from './state/defaultDeps';
import { pageEnginesLoading } from './state/pageEngines';
import { isShareFragment } from './state/persistenceSlice';
import { createGridRunner, createPlannedProcedureRunner, createSimulationRunner } from './state/simulationRunner';
import { createMeanwardStore, getAppStore, setAppStoreFactory } from './state/store';
import { App } from './ui/App';
import { startPageServiceWorker } from './offline/serviceWorkerUpdates';
import './ui/styles.css';

setAppStoreFactory(() =>
  createMeanwardStore({
    deps:
      typeof Worker === 'undefined'
        ? defaultDeps(null)
        : defaultDeps(createSimulationRunner(), createPlannedProcedureRunner(), createGridRunner()),
    demo: demoPlan,
  }),
);

const store = getAppStore();
// A shared link wins over the autosave (Undo brings the autosaved draft back);
// a bad or malformed "#plan…" link keeps the restored plan and says why.
let openingLink = false;
const openLinkInAddress = () => {
  if (!isShareFragment(location.hash)) return;
  openingLink = true;
  try {
    store.getState().openShareFragment(location.hash);
  } finally {
    // A link whose plan needs an engine opens when it arrives: the address is kept until then.
    const engines = pageEnginesLoading();
    if (engines) void engines.finally(() => (openingLink = false)).catch(() => undefined);
    else openingLink = false;
  }
};
openLinkInAddress();
window.addEventListener('hashchange', openLinkInAddress);
// Once the plan is edited (or a replace is undone), a "#plan…" address no longer
// describes it: drop the fragment so a reload restores the autosave rather than the link.
store.subscribe((state, prev) => {
  if (state.draft !== prev.draft && !openingLink && isShareFragment(location.hash)) {
    history.replaceState(null, '', `${location.pathname}${location.search}`);
  }
});

// Offline use: only the build has a service worker (sw.js); the dev server has none. The watch
// starts before the first render, so the update notice can follow it; the worker is registered
// once the page has loaded.
if (import.meta.env.PROD) startPageServiceWorker();

const root = document.getElementById('root');
if (!root) throw new Error('The page has no #root element.');
const renderPage = () =>
  createRoot(root).render(
    <StrictMode>
      <App />
    </StrictMode>,
  );
// A restored plan or a shared link whose design needs an engine outside the first screen
// (covariates, clusters, a selection rule) waits for it before the first render, so the page
// never opens on the demo's figures under another plan's form. A failed load renders anyway:
// the store shows its plain message.
const engines = pageEnginesLoading();
if (engines) void engines.then(renderPage, renderPage);
else renderPage();
