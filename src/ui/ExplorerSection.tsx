import { lazy, Suspense, useState } from 'react';

// The explorer panel (its chart and the grid's code) loads only when opened, so the first screen stays small.
const ExplorerPanel = lazy(() => import('./ExplorerPanel').then((m) => ({ default: m.ExplorerPanel })));

/** The design explorer's place in the results: a button that opens it, then the panel itself (loaded on demand). */
export function ExplorerSection() {
  const [open, setOpen] = useState(false);
  return (
    <div className="explorer-section">
      <button type="button" className="explorer-toggle" aria-expanded={open} aria-controls="explorer-panel" onClick={() => setOpen((o) => !o)} data-testid="explorer-toggle">
        {open ? 'Close the design explorer' : 'Open the design explorer: simulate a grid of plan variants'}
      </button>
      {open && (
        <div id="explorer-panel">
          <Suspense fallback={<p>Loading the design explorer…</p>}>
            <ExplorerPanel />
          </Suspense>
        </div>
      )}
    </div>
  );
}
