import { useEffect, useId, useMemo, useRef, useState } from 'react';
import type { ChartInput, ChartText } from '../charts/chartTypes';
import { covariateBalanceChartData, hasCovariateBalance, type CovariateBalanceChartData } from '../charts/covariateBalanceChartData';
import { covariateBalanceChartSize, renderCovariateBalanceChart } from '../charts/covariateBalanceChartRender';
import { covariateBalanceChartText } from '../charts/covariateBalanceChartText';
import { selectHighlight, selectSetHighlight } from '../state/selectors';
import { useMeanwardStore } from '../state/store';

/**
 * The balance chart per covariate (pretest first): observed SMD before and
 * after matching, true-score SMD after matching, the 0.1 and 0.25 lines and
 * variance ratios flagged outside 0.5–2, with its text and table
 * alternative. Its figures come from the simulation of this plan when there
 * is one, else from core's closed form (exact matching, unlimited pool).
 */
export function CovariateBalanceCard({ input, simulationOutOfDate }: { input: ChartInput; simulationOutOfDate: boolean }) {
  const ref = useRef<SVGSVGElement>(null);
  const box = useRef<HTMLDivElement>(null);
  const headingId = useId();
  const highlight = useMeanwardStore(selectHighlight);
  const setHighlight = useMeanwardStore(selectSetHighlight);
  const [width, setWidth] = useState(600);
  const [drawError, setDrawError] = useState<string | null>(null);
  const built = useMemo((): { data: CovariateBalanceChartData | null; text: ChartText | null; error: string | null } => {
    if (!hasCovariateBalance(input)) return { data: null, text: null, error: null };
    try {
      const data = covariateBalanceChartData(input);
      return { data, text: covariateBalanceChartText(data), error: null };
    } catch (e) {
      return { data: null, text: null, error: e instanceof Error ? e.message : String(e) };
    }
  }, [input]);
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
  const { data, text, error } = built;
  useEffect(() => {
    const svg = ref.current;
    if (!svg || !data) return;
    const timer = setTimeout(() => {
      try {
        const w = Math.max(420, Math.min(900, Math.round(width)));
        renderCovariateBalanceChart(svg, data, { ...covariateBalanceChartSize(data, w), highlight, onHighlight: setHighlight });
        setDrawError(null);
      } catch (e) {
        setDrawError(e instanceof Error ? e.message : String(e));
      }
    }, 0);
    return () => clearTimeout(timer);
  }, [data, highlight, setHighlight, width]);
  const problem = error ?? drawError;
  return (
    <figure className="chart-card" data-chart="covariateBalance" aria-labelledby={headingId}>
      <figcaption>
        <h3 id={headingId} className={data && !problem ? 'visually-hidden' : undefined}>
          {text?.title ?? 'Balance on each covariate'}
        </h3>
      </figcaption>
      <div ref={box} className="chart-box">
        {problem ? (
          <p className="chart-error" role="status">
            This chart cannot be drawn for the current plan: {problem}
          </p>
        ) : data ? (
          <svg ref={ref} aria-labelledby={headingId} />
        ) : (
          <p className="chart-placeholder" data-testid="covariate-balance-placeholder">
            Balance on each covariate appears once the plan is complete{simulationOutOfDate ? ' (the last simulation is for an earlier plan)' : ''}.
          </p>
        )}
      </div>
      {text && data && !problem && (
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
                  <tr key={i} className={data.rows[i]?.varianceRatioOutside ? 'is-flagged' : undefined}>
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
