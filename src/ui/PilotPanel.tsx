import { useId, useState } from 'react';
import { deferredPanel } from './deferredPanel';

// The body (file reader, mapping, estimates) is its own chunk, fetched when the panel is first opened.
const PilotBody = deferredPanel(() => import('./PilotBody').then((m) => m.PilotBody), <p className="pilot-loading">Loading the pilot reader…</p>).Panel;

/**
 * "Estimate from pilot data": read a pilot or earlier-wave file on this
 * computer, say which columns mean what, see the estimates with their
 * uncertainty, and write them into the plan. Every number shown comes from
 * src/pilot; this component only lays them out.
 */
export function PilotPanel() {
  const [expanded, setExpanded] = useState(false);
  const bodyId = useId();
  return (
    <section className={`pilot${expanded ? ' is-open' : ''}`} aria-labelledby="pilot-heading" data-testid="pilot-panel">
      <div className="pilot-head">
        <h2 id="pilot-heading">
          <button type="button" className="pilot-toggle" aria-expanded={expanded} aria-controls={bodyId} onClick={() => setExpanded(!expanded)}>
            <span aria-hidden="true" className="pilot-toggle-mark">
              {expanded ? '▾' : '▸'}
            </span>{' '}
            Estimate from pilot data
          </button>
        </h2>
        <p className="pilot-lead">
          Have a pilot sample, last year’s cohort or an earlier wave? Fill the pretest means and SDs, the reliability, the posttest SD and the
          pre–post correlation from it, with their uncertainty.
        </p>
      </div>
      <div id={bodyId} hidden={!expanded}>
        {expanded && <PilotBody />}
      </div>
    </section>
  );
}

