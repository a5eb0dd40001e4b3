import { lazy, Suspense, useState } from 'react';

// The explorer panel (its chart and the grid's code) loads only when opened, so the first screen stays small.
const ExplorerPanel = lazy(() => import('./ExplorerPanel').then((m) => ({ default: m.ExplorerPanel })));

/** The design explorer's place in the results: its heading, a button that opens it, then the panel (loaded on demand). */
export function ExplorerSection() {
  const [open, setOpen] = useState(false);
  return (
    <section className="explorer" aria-labelledby="explorer-heading">
      <h2 id="explorer-heading">Design explorer</h2>
      <p className="explorer-intro">
        Vary one or two inputs of the plan over a range. Every cell of the grid is a full simulation of the planned procedure (finite pools, your
        matching and analysis), run in the background on this computer’s cores, with the closed form beside it.
      </p>
      <button type="button" className="explorer-toggle" aria-expanded={open} aria-controls="explorer-panel" onClick={() => setOpen((o) => !o)} data-testid="explorer-toggle">
        {open ? 'Close the design explorer' : 'Open the design explorer'}
      </button>
      {open && (
        <div id="explorer-panel">
          <Suspense fallback={<p>Loading the design explorer…</p>}>
            <ExplorerPanel />
          </Suspense>
        </div>
      )}
    </section>
  );
}
