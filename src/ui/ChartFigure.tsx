import { useCallback, useEffect, useId, useRef, useState } from 'react';
import type { AnalysisId } from '../core/plan';
import type { ChartText, RenderOptions } from '../charts/chartTypes';
import { selectHighlight, selectSetHighlight } from '../state/selectors';
import { useMeanwardStore } from '../state/store';

/** The shared highlight a drawn chart shows and updates. */
export type ChartLink = Pick<RenderOptions, 'highlight' | 'onHighlight'>;

/**
 * Draws a chart's data into the SVG for a container width (src/charts does
 * the drawing). Pass a stable function (module level or memoised): a new one
 * draws the chart again.
 */
export type DrawChart<D> = (svg: SVGSVGElement, data: D, width: number, link: ChartLink) => void;

/**
 * Which of a chart's focusable controls has the keyboard focus, as a key that
 * survives a redraw: its analysis (data-analysis) and its position among the
 * controls for that analysis; null when the focus is elsewhere.
 */
export function focusedControlKey(svg: SVGSVGElement): string | null {
  const active = svg.ownerDocument.activeElement;
  if (!active || active === svg || !svg.contains(active)) return null;
  const analysis = active.getAttribute('data-analysis') ?? '';
  const same = Array.from(svg.querySelectorAll('[tabindex]')).filter((el) => (el.getAttribute('data-analysis') ?? '') === analysis);
  return `${analysis}#${Math.max(0, same.indexOf(active))}`;
}

/** Focus the control a redrawn chart has for a key from focusedControlKey (no scrolling); false when it has none. */
export function restoreFocus(svg: SVGSVGElement, key: string): boolean {
  const [analysis, index] = key.split('#');
  const same = Array.from(svg.querySelectorAll<SVGElement>('[tabindex]')).filter((el) => (el.getAttribute('data-analysis') ?? '') === analysis);
  const target = same[Number(index)] ?? same[0];
  if (!target) return false;
  target.focus({ preventScroll: true });
  return true;
}

/** A chart's data and text alternative, or the message of the error that stopped them. */
export interface BuiltChart<D> {
  data: D | null;
  text: ChartText | null;
  error: string | null;
}

/** Build one chart's data and text, turning a thrown error into a message. */
export function buildChart<D>(make: () => D, describe: (d: D) => ChartText): BuiltChart<D> {
  try {
    const data = make();
    return { data, text: describe(data), error: null };
  } catch (e) {
    return { data: null, text: null, error: e instanceof Error ? e.message : String(e) };
  }
}

interface ChartFigureProps<D> extends BuiltChart<D> {
  /** The figure's data-chart name (browser tests and styles find the chart by it). */
  chart: string;
  draw: DrawChart<D>;
  /** Heading when there is no text alternative (no data, or an error). */
  fallbackTitle: string;
  /** Shown beside the heading, e.g. a mode switch. */
  controls?: React.ReactNode;
  /** Shown instead of the chart when there is neither data nor an error. */
  placeholder?: React.ReactNode;
  /** Class of a row in the text alternative's table, e.g. to flag it. */
  rowClassName?: (row: number) => string | undefined;
}

/**
 * One chart card: the SVG drawn at the width shown (in its own task, so a new
 * result never blocks the main thread for long in one piece), linked to the
 * shared highlight, with its text and table alternative; a plain message when
 * it cannot be drawn.
 */
export function ChartFigure<D>({ chart, data, text, error, draw, fallbackTitle, controls, placeholder, rowClassName }: ChartFigureProps<D>) {
  const ref = useRef<SVGSVGElement>(null);
  const box = useRef<HTMLDivElement>(null);
  const headingId = useId();
  const highlight = useMeanwardStore(selectHighlight);
  const setHighlight = useMeanwardStore(selectSetHighlight);
  const [width, setWidth] = useState(600);
  const [drawError, setDrawError] = useState<string | null>(null);
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
  // True while a redraw replaces the chart's elements: a blur from the removed
  // element must not clear the highlight the redraw is showing.
  const redrawing = useRef(false);
  const onHighlight = useCallback(
    (id: AnalysisId | null) => {
      if (!redrawing.current) setHighlight(id);
    },
    [setHighlight],
  );
  useEffect(() => {
    const svg = ref.current;
    if (!svg || !data) return;
    const timer = setTimeout(() => {
      // A redraw replaces every element: remember which control had the keyboard
      // focus so focus stays on the same logical control (never drops to the page).
      const focusKey = focusedControlKey(svg);
      redrawing.current = true;
      try {
        draw(svg, data, width, { highlight, onHighlight });
        // On screen, legend entries are focusable buttons; an image may not contain
        // controls, so the live chart is a labelled group (exports stay role=img).
        if (svg.querySelector('[tabindex]')) svg.setAttribute('role', 'group');
        if (focusKey !== null) restoreFocus(svg, focusKey);
        setDrawError(null);
      } catch (e) {
        setDrawError(e instanceof Error ? e.message : String(e));
      } finally {
        redrawing.current = false;
      }
    }, 0);
    return () => clearTimeout(timer);
  }, [draw, data, highlight, onHighlight, width]);
  const problem = error ?? drawError;
  return (
    <figure className="chart-card" data-chart={chart} aria-labelledby={headingId}>
      <figcaption>
        {/* The drawn chart shows its own title; this heading names it for screen readers and the outline. */}
        <h3 id={headingId} className={data && !problem ? 'visually-hidden' : undefined}>
          {text?.title ?? fallbackTitle}
        </h3>
        {controls}
      </figcaption>
      <div ref={box} className="chart-box">
        {problem ? (
          <p className="chart-error" role="status">
            This chart cannot be drawn for the current plan: {problem}
          </p>
        ) : data ? (
          <svg ref={ref} aria-labelledby={headingId} />
        ) : (
          placeholder
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
                  <tr key={i} className={rowClassName?.(i)}>
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
