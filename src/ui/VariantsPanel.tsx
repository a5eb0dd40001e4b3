import { useEffect, useMemo, useRef, useState } from 'react';
import { comparePlans, COMPARE_MAX_PLANS, type PlanComparisonRow } from '../core/comparePlans';
import { PLANNING_CAUTION } from '../core/planningCaution';
import { missingEngines } from '../core/engineRegistry';
import { loadPageEngines } from '../state/pageEngines';
import {
  planComparisonChartData,
  planComparisonChartSize,
  planComparisonChartText,
  renderPlanComparisonChart,
} from '../charts/planComparisonChart';
import { useMeanwardStore } from '../state/store';
import type { PlanVariant } from '../state/variantsSlice';
import { fmtInt, fmtPct, fmtSigned } from './format';

/** One variant's row in the list: open, rename, duplicate, delete, and a tick for the comparison. */
function VariantRow({ v, active, compared }: { v: PlanVariant; active: boolean; compared: boolean }) {
  const { openVariant, renameVariant, duplicateVariant, deleteVariant, toggleCompare } = useMeanwardStore((s) => s);
  const [name, setName] = useState(v.name);
  const [problem, setProblem] = useState<string | null>(null);
  useEffect(() => setName(v.name), [v.name]);
  const commit = () => {
    if (name === v.name) return;
    setProblem(renameVariant(v.id, name));
  };
  const inputId = `variant-name-${v.id}`;
  return (
    <li className={`variant${active ? ' is-active' : ''}`} data-variant={v.name}>
      <label className="variant-compare">
        <input type="checkbox" checked={compared} onChange={() => toggleCompare(v.id)} /> Compare
      </label>
      <label htmlFor={inputId} className="visually-hidden">
        Name of the variant
      </label>
      <input
        id={inputId}
        className="variant-name"
        value={name}
        onChange={(e) => setName(e.target.value)}
        onBlur={commit}
        onKeyDown={(e) => e.key === 'Enter' && commit()}
        aria-invalid={problem !== null}
        aria-describedby={problem ? `${inputId}-problem` : undefined}
      />
      {active ? <span className="variant-active">in the form</span> : <button type="button" onClick={() => openVariant(v.id)}>Open in the form</button>}
      <button type="button" onClick={() => duplicateVariant(v.id)} aria-label={`Duplicate ${v.name}`}>
        Duplicate
      </button>
      <button type="button" onClick={() => deleteVariant(v.id)} aria-label={`Delete ${v.name}`}>
        Delete
      </button>
      {problem && (
        <p id={`${inputId}-problem`} className="field-problem" role="alert">
          {problem}
        </p>
      )}
      {v.note && <p className="variant-note">{v.note}</p>}
    </li>
  );
}

/** The comparison chart (core's rows, drawn by src/charts). */
function ComparisonChart({ rows, tolerableShare }: { rows: PlanComparisonRow[]; tolerableShare: number | null }) {
  const ref = useRef<SVGSVGElement>(null);
  const [width, setWidth] = useState(640);
  const box = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = box.current;
    if (!el || typeof ResizeObserver === 'undefined') return;
    const ro = new ResizeObserver(() => setWidth(Math.max(280, Math.floor(el.clientWidth))));
    ro.observe(el);
    return () => ro.disconnect();
  }, []);
  const data = useMemo(() => planComparisonChartData(rows, tolerableShare), [rows, tolerableShare]);
  const size = planComparisonChartSize(width, rows.length);
  useEffect(() => {
    if (ref.current) renderPlanComparisonChart(ref.current, data, { ...size, highlight: null });
  }, [data, size.width, size.height]);
  const alt = planComparisonChartText(data);
  return (
    <figure className="chart-card comparison-chart" ref={box as never}>
      <svg ref={ref} aria-labelledby="comparison-chart-caption" />
      <figcaption id="comparison-chart-caption">{alt.sentences.join(' ')}</figcaption>
    </figure>
  );
}

/** Candidate plans side by side: the session's variants, the comparison table and chart. */
export function VariantsPanel() {
  const variants = useMeanwardStore((s) => s.variants);
  const activeId = useMeanwardStore((s) => s.activeVariantId);
  const compareIds = useMeanwardStore((s) => s.compareIds);
  const message = useMeanwardStore((s) => s.variantMessage);
  const keepAsVariant = useMeanwardStore((s) => s.keepAsVariant);
  const chosen = compareIds.map((id) => variants.find((v) => v.id === id)).filter((v): v is PlanVariant => v !== undefined);
  // A variant of another design may need an engine the form's plan did not (src/core/engineRegistry.ts):
  // the comparison waits for it, saying so, rather than showing anything computed without it.
  const missing = [...new Set(chosen.flatMap((v) => missingEngines(v.plan)))];
  const [engineLoads, setEngineLoads] = useState(0);
  const [engineError, setEngineError] = useState<string | null>(null);
  useEffect(() => {
    if (missing.length === 0) return;
    let live = true;
    loadPageEngines(missing).then(
      () => live && setEngineLoads((n) => n + 1),
      () => live && setEngineError('The figures for these plans could not be loaded (the connection may have dropped). Reload the page to try again.'),
    );
    return () => {
      live = false;
    };
  }, [missing.join(',')]);
  const compared = useMemo(() => {
    if (chosen.length < 2) return null;
    if (missing.length > 0) return { rows: [], error: engineError, waiting: true };
    try {
      return { rows: comparePlans(chosen.map((v) => ({ name: v.name, plan: v.plan, analysisId: v.analysisId }))), error: null, waiting: false };
    } catch (err) {
      return { rows: [], error: err instanceof Error ? err.message : String(err), waiting: false };
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [chosen.map((v) => `${v.id}:${v.name}`).join('|'), variants, engineLoads, engineError]);
  const tol = chosen[0]?.plan.analysis.tolerableBiasShare ?? null;
  return (
    <section className="variants" aria-labelledby="variants-heading">
      <h2 id="variants-heading">Candidate plans side by side</h2>
      <p className="table-note">
        Keep several versions of the plan, each with its own name; tick two to {COMPARE_MAX_PLANS} to compare them. Everything here is saved in
        this browser as you go.
      </p>
      {activeId === null && (
        <button type="button" onClick={() => keepAsVariant()}>
          Keep the plan in the form as a variant
        </button>
      )}
      {variants.length > 0 && (
        <ul className="variant-list" aria-label="Variants">
          {variants.map((v) => (
            <VariantRow key={v.id} v={v} active={v.id === activeId} compared={compareIds.includes(v.id)} />
          ))}
        </ul>
      )}
      <p className="variant-message" role="status" aria-live="polite">
        {message ?? ''}
      </p>
      {compared?.error && <p className="field-problem">{compared.error}</p>}
      {compared?.waiting && !compared.error && <p role="status">Loading the figures for these plans…</p>}
      {compared && !compared.error && !compared.waiting && (
        <>
          <div className="table-scroll" tabIndex={0} role="region" aria-label="Comparison of the candidate plans">
            <table className="comparison-of-plans" data-testid="plan-comparison">
              <caption>The analysis each variant relies on (closed forms)</caption>
              <thead>
                <tr>
                  <th scope="col">Variant</th>
                  <th scope="col">Analysis</th>
                  <th scope="col">Artefact (points)</th>
                  <th scope="col">Share of effect</th>
                  <th scope="col">False positives</th>
                  <th scope="col">Power (without artefact)</th>
                  <th scope="col">Programme members used</th>
                  <th scope="col">Discarded</th>
                  <th scope="col">Whom the estimate describes</th>
                </tr>
              </thead>
              <tbody>
                {compared.rows.map((r, i) => (
                  <tr key={chosen[i]!.id}>
                    <th scope="row">{r.name}</th>
                    <td>{r.analysisName}</td>
                    <td>{fmtSigned(r.artefact)}</td>
                    <td>{fmtPct(r.artefactShare, 0)}</td>
                    <td>
                      {fmtPct(r.falsePositiveRate)} <span className="note">(α {fmtPct(r.alpha, 0)})</span>
                    </td>
                    <td>
                      {fmtPct(r.power, 0)} ({fmtPct(r.powerWithoutBias, 0)})
                    </td>
                    <td>
                      {fmtInt(r.programmeN)} of {fmtInt(r.programmePool)}
                    </td>
                    <td>{fmtPct(r.discardedShare, 0)}</td>
                    <td>{r.estimand}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <ComparisonChart rows={compared.rows} tolerableShare={tol} />
          <p className="caution">{PLANNING_CAUTION}</p>
        </>
      )}
    </section>
  );
}
