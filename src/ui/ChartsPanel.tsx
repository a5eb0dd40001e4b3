import { useEffect, useId, useMemo, useRef, useState } from 'react';
import { balanceChartData } from '../charts/balanceChartData';
import { balanceChartText } from '../charts/balanceChartText';
import type { ChartId, ChartInput, ChartText } from '../charts/chartTypes';
import { estimatesChartData } from '../charts/estimatesChartData';
import { estimatesChartText } from '../charts/estimatesChartText';
import { pretestChartData } from '../charts/pretestChartData';
import { pretestChartText } from '../charts/pretestChartText';
import { renderChart, type ChartDataById } from '../charts/renderChartToSvgString';
import { sensitivityChartData } from '../charts/sensitivityChartData';
import { sensitivityChartText } from '../charts/sensitivityChartText';
import { usesCovariateModel } from '../core/multivariate/covariateModel';
import type { SensitivityVariable } from '../core/sensitivityCurve';
import { selectAnalytic, selectAnalyticStale, selectHighlight, selectSetHighlight, selectValidPlan } from '../state/selectors';
import { useMeanwardStore } from '../state/store';
import { CovariateBalanceCard } from './CovariateBalanceCard';

/** Chart size for a container width: drawn at the size shown, so text stays at its designed size. */
function sizeFor(width: number): { width: number; height: number } {
  const w = Math.max(320, Math.min(900, Math.round(width)));
  return { width: w, height: Math.round(Math.max(300, Math.min(420, w * 0.55))) };
}

interface ChartCardProps<K extends ChartId> {
  chartId: K;
  data: ChartDataById[K] | null;
  text: ChartText | null;
  error: string | null;
  controls?: React.ReactNode;
}

/** One chart: the SVG (drawn by src/charts), linked to the shared highlight, with its text and table alternative. */
function ChartCard<K extends ChartId>({ chartId, data, text, error, controls }: ChartCardProps<K>) {
  const ref = useRef<SVGSVGElement>(null);
  const highlight = useMeanwardStore(selectHighlight);
  const setHighlight = useMeanwardStore(selectSetHighlight);
  const headingId = useId();
  const box = useRef<HTMLDivElement>(null);
  const [drawError, setDrawError] = useState<string | null>(null);
  const [width, setWidth] = useState(600);
  useEffect(() => {
    const el = box.current;
    if (!el || typeof ResizeObserver === 'undefined') return;
    const ro = new ResizeObserver((entries) => {
      const w = entries[0]?.contentRect.width;
      if (w && Math.abs(w - width) > 8) setWidth(w);
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, [width]);
  useEffect(() => {
    const svg = ref.current;
    if (!svg || !data) return;
    // Each chart draws in its own task, so a new result (four charts at once)
    // never blocks the main thread for long in one piece.
    const timer = setTimeout(() => {
      try {
        renderChart(chartId, svg, data, { ...sizeFor(width), highlight, onHighlight: setHighlight });
        // On screen, legend entries are focusable buttons; an image may not contain
        // controls, so the live chart is a labelled group (exports stay role=img).
        if (svg.querySelector('[tabindex]')) svg.setAttribute('role', 'group');
        setDrawError(null);
      } catch (e) {
        setDrawError(e instanceof Error ? e.message : String(e));
      }
    }, 0);
    return () => clearTimeout(timer);
  }, [chartId, data, highlight, setHighlight, width]);
  const problem = error ?? drawError;
  return (
    <figure className="chart-card" data-chart={chartId} aria-labelledby={headingId}>
      <figcaption>
        {/* The drawn chart shows its own title; this heading names it for screen readers and the outline. */}
        <h3 id={headingId} className={problem ? undefined : 'visually-hidden'}>
          {text?.title ?? 'Chart'}
        </h3>
        {controls}
      </figcaption>
      <div ref={box} className="chart-box">
      {problem ? (
        <p className="chart-error" role="status">
          This chart cannot be drawn for the current plan: {problem}
        </p>
      ) : (
        <svg ref={ref} aria-labelledby={headingId} />
      )}
      </div>
      {text && !problem && (
        <details>
          <summary>Read this chart as text and a table</summary>
          {text.sentences.map((s) => (
            <p key={s}>{s}</p>
          ))}
          <div className="table-scroll">
            <table>
              <caption>{text.table.caption}</caption>
              <thead>
                <tr>
                  {text.table.columns.map((c) => (
                    <th key={c} scope="col">
                      {c}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {text.table.rows.map((r, i) => (
                  <tr key={i}>
                    {r.map((cell, j) => (j === 0 ? <th key={j} scope="row">{cell}</th> : <td key={j}>{cell}</td>))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </details>
      )}
    </figure>
  );
}

/** Build one chart's data and text, turning a thrown error into a message. */
function build<D>(make: () => D, describe: (d: D) => ChartText): { data: D | null; text: ChartText | null; error: string | null } {
  try {
    const data = make();
    return { data, text: describe(data), error: null };
  } catch (e) {
    return { data: null, text: null, error: e instanceof Error ? e.message : String(e) };
  }
}

/**
 * The four linked charts. Each reads the last valid plan, its closed-form
 * results and, when it still belongs to this plan, the simulation result.
 */
export function ChartsPanel() {
  const plan = useMeanwardStore(selectValidPlan);
  const analytic = useMeanwardStore(selectAnalytic);
  const stale = useMeanwardStore(selectAnalyticStale);
  // Narrow reads: progress ticks during a run must not re-render the charts.
  const simResult = useMeanwardStore((s) => s.simulation.result);
  const simStale = useMeanwardStore((s) => s.simulation.stale);
  const [mode, setMode] = useState<SensitivityVariable>('reliability');
  const simulation = simResult && !simStale ? simResult : null;
  const input: ChartInput | null = useMemo(() => (analytic ? { plan, analytic, simulation } : null), [plan, analytic, simulation]);
  const pretest = useMemo(() => (input ? build(() => pretestChartData(input), pretestChartText) : null), [input]);
  const estimates = useMemo(() => (input ? build(() => estimatesChartData(input), estimatesChartText) : null), [input]);
  const sensitivity = useMemo(() => (input ? build(() => sensitivityChartData(input, mode), sensitivityChartText) : null), [input, mode]);
  const balance = useMemo(() => (input ? build(() => balanceChartData(input), balanceChartText) : null), [input]);
  const modeName = useId();
  if (!pretest || !estimates || !sensitivity || !balance) return null;
  return (
    <section className={`charts${stale ? ' is-stale' : ''}`} aria-labelledby="charts-heading">
      <h2 id="charts-heading">Pictures of the artefact</h2>
      <p className="section-intro">
        Point at a row of the table, a line or a legend entry to pick out one analysis in every chart.
        {stale && <strong className="stale-inline"> These charts are for the last complete plan.</strong>}
        {simResult && simStale && ' The simulation is out of date, so the charts show expected figures only.'}
      </p>
      <div className="charts-grid">
        <ChartCard chartId="pretest" {...pretest} />
        {/* With covariates (or a multivariate distance) balance is shown per variable, pretest included. */}
        {usesCovariateModel(plan) ? (
          <CovariateBalanceCard input={input!} simulationOutOfDate={Boolean(simResult && simStale)} />
        ) : (
          <ChartCard chartId="balance" {...balance} />
        )}
        <ChartCard chartId="estimates" {...estimates} />
        <ChartCard
          chartId="sensitivity"
          {...sensitivity}
          controls={
            <div className="mode-switch" role="radiogroup" aria-label="Sensitivity chart: vary">
              <label>
                <input type="radio" name={modeName} checked={mode === 'reliability'} onChange={() => setMode('reliability')} />
                against reliability
              </label>
              <label>
                <input type="radio" name={modeName} checked={mode === 'pretestGap'} onChange={() => setMode('pretestGap')} />
                against the pretest gap
              </label>
            </div>
          }
        />
      </div>
    </section>
  );
}
