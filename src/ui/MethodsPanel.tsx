import { useMemo, useState } from 'react';
import { methodsText } from '../core/methodsText';
import { methodsParagraphText, methodsPlainText } from '../report/methodsTextRender';
import { selectAnalytic, selectAnalyticStale, selectSimulation, selectValidPlan } from '../state/selectors';
import { useMeanwardStore } from '../state/store';

/**
 * "Methods text": a paragraph or two for a proposal or pre-registration,
 * written by core (methodsText) from the plan and its results, with a copy
 * button that announces the outcome to screen readers. The text and its
 * figures are core's; this component only lays them out.
 */
export function MethodsPanel() {
  const plan = useMeanwardStore(selectValidPlan);
  const analytic = useMeanwardStore(selectAnalytic);
  const stale = useMeanwardStore(selectAnalyticStale);
  const simulation = useMeanwardStore(selectSimulation);
  const [status, setStatus] = useState('');
  // A finished simulation of this very plan adds its figures; a stale one does not.
  const sim = simulation.result !== null && !simulation.stale ? simulation.result : null;
  const text = useMemo(() => (plan && analytic ? methodsText(plan, analytic, sim) : null), [plan, analytic, sim]);
  if (!text) return null;

  const copy = async () => {
    try {
      await navigator.clipboard.writeText(methodsPlainText(text));
      setStatus('Copied the methods text.');
    } catch {
      setStatus('Could not copy: select the text below and copy it by hand.');
    }
  };

  return (
    <section className={`methods-text${stale ? ' is-stale' : ''}`} aria-labelledby="methods-heading" data-testid="methods-panel">
      <div className="methods-head">
        <h2 id="methods-heading">Methods text</h2>
        <button type="button" onClick={() => void copy()} data-testid="methods-copy">
          Copy methods text
        </button>
        <span role="status" aria-live="polite" className="methods-status" data-testid="methods-status">
          {status}
        </span>
      </div>
      <p className="note">A draft for a proposal or pre-registration, written from this plan. Check every sentence before you use it.</p>
      <div className="methods-body" data-testid="methods-body">
        {text.paragraphs.map((p) => (
          <p key={p.heading}>
            <strong>{p.heading}.</strong> {methodsParagraphText(p)}
          </p>
        ))}
        <p className="caution">
          <em>{text.caution}</em>
        </p>
        <h3>References</h3>
        <ul className="methods-references">
          {text.references.map((r) => (
            <li key={r.citation}>{r.entry}</li>
          ))}
        </ul>
      </div>
    </section>
  );
}
