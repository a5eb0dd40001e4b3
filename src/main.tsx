import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { demoPlan } from './io/demoPlan';
import { defaultDeps } from './state/defaultDeps';
import { isShareFragment } from './state/persistenceSlice';
import { createGridRunner, createPlannedProcedureRunner, createSimulationRunner } from './state/simulationRunner';
import { createMeanwardStore, getAppStore, setAppStoreFactory } from './state/store';
import { App } from './ui/App';
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
    openingLink = false;
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

const root = document.getElementById('root');
if (!root) throw new Error('The page has no #root element.');
createRoot(root).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
