import { useCallback, useEffect, useId, useMemo, useRef, useState } from 'react';
import { ANALYSIS_DESCRIPTIONS } from '../core/analysisDescriptions';
import { PLANNING_CAUTION } from '../core/planningCaution';
import { designAnalysisIds, headlineAnalysisId } from '../core/design/studyDesign';
import { exploreInputs, type ExploreInputInfo } from '../core/explore';
import type { ExploreCellSummary, ExploreInput, ExploreResult } from '../core/explore/exploreTypes';
import { explorerChartData, type ExplorerChartData } from '../charts/explorerChartData';
import { explorerChartText } from '../charts/explorerChartText';
import { explorerChartMinHeight, renderExplorerChart } from '../charts/renderExplorerChart';
import { chartSize } from '../charts/chartSize';
import { explorerCellCounts, explorerStale, type ExploreAxisDraft } from '../state/explorerSlice';
import { useMeanwardStore } from '../state/store';
import { ChartFigure, buildChart, type DrawChart } from './ChartFigure';
import { fmt, fmtInt, fmtPct } from './format';
import { ProgressBar } from './ProgressBar';

/** The caution shown wherever the explorer's figures are (the planning caution in the explorer's own words). */
export const EXPLORER_CAUTION = `Each cell is a simulation of the planned procedure, with Monte Carlo error (± one MC SE shown). ${PLANNING_CAUTION}`;

/** The chart's size at a width: the shared chart size, but a heat map only as tall as its rows need (no empty band below it). */
function explorerSize(data: ExplorerChartData, width: number): { width: number; height: number } {
  const size = chartSize('explorer', data, width);
  return data.mode === 'heatmap' ? { width: size.width, height: explorerChartMinHeight(data, size.width) } : size;
}

/** One axis's value in a cell, in the input's own words (whole numbers without decimals). */
function axisValue(info: ExploreInputInfo | undefined, value: number): string {
  if (!info) return fmt(value);
  return info.wholeNumber ? fmtInt(value) : fmt(value);
}

/** The varied values of a cell in words, e.g. "reliability 0.80, caliper 0.20". */
function cellLabel(result: ExploreResult, cell: ExploreCellSummary, infos: ExploreInputInfo[]): string {
  return result.spec.axes
    .map((a, i) => {
      const info = infos.find((x) => x.input === a.input);
      return `${info?.shortLabel ?? a.input} ${axisValue(info, cell.values[i] ?? NaN)}`;
    })
    .join(', ');
}

/** The figures of one cell, each a formatted core/engine figure (nothing computed here). */
function cellFigures(cell: ExploreCellSummary) {
  const done = cell.status === 'done';
  return {
    share: done ? fmtPct(cell.artefactShare) : '',
    shareMCSE: done ? fmtPct(cell.artefactShareMCSE) : '',
    closedForm: fmtPct(cell.closedFormShare),
    discarded: done ? fmtPct(cell.discardedShare) : '',
    power: done ? fmtPct(cell.power, 0) : '',
    powerMCSE: done ? fmtPct(cell.powerMCSE) : '',
    wrongSign: done && cell.wrongSignRate !== undefined ? fmtPct(cell.wrongSignRate) : '',
    tolerable: done ? (cell.tolerable ? 'yes' : 'no') : '',
  };
}

/** Plain words for a cell that has no simulated figures. */
function cellStateWords(cell: ExploreCellSummary, cancelled: boolean): string {
  if (cell.status === 'impossible') return `impossible plan: ${cell.problem ?? 'the inputs contradict each other'}`;
  if (cell.status === 'failed') return `the simulation failed: ${cell.failure ?? 'no message'}`;
  if (cell.status === 'pending') return cancelled ? 'not run (the grid was cancelled)' : 'waiting for its simulation';
  return '';
}

/** Details of the focused cell: every figure with its Monte Carlo SE, and why it is (not) tolerable. */
function CellDetails({ result, index, infos, cancelled }: { result: ExploreResult; index: number | null; infos: ExploreInputInfo[]; cancelled: boolean }) {
  const cell = index === null ? undefined : result.cells[index];
  if (!cell) return <p className="explorer-details-hint">Point at a cell, or move to it with the Tab key, to see its figures here; press Enter or click to make it a candidate plan.</p>;
  const f = cellFigures(cell);
  return (
    <dl className="explorer-details-list" data-cell-details={cell.index}>
      <dt>Cell</dt>
      <dd>{cellLabel(result, cell, infos)}</dd>
      {cell.status === 'done' ? (
        <>
          <dt>Simulated artefact</dt>
          <dd>
            {f.share} of the hoped-for effect (± {f.shareMCSE} MC SE)
          </dd>
          <dt>Closed form</dt>
          <dd>{f.closedForm}</dd>
          <dt>Programme pool discarded by matching</dt>
          <dd>{f.discarded}</dd>
          <dt>Power</dt>
          <dd>
            {f.power} (± {f.powerMCSE} MC SE)
            {f.wrongSign ? `, of which ${f.wrongSign} significant in the wrong direction` : ''}
          </dd>
          <dt>Tolerable</dt>
          <dd>
            {f.tolerable}
            {cell.tolerableReason ? `: ${cell.tolerableReason}` : ''}
          </dd>
        </>
      ) : (
        <>
          <dt>State</dt>
          <dd>{cellStateWords(cell, cancelled)}</dd>
          {cell.closedFormShare !== undefined && (
            <>
              <dt>Closed form</dt>
              <dd>{f.closedForm}</dd>
            </>
          )}
        </>
      )}
    </dl>
  );
}

/** The table alternative: one row per cell with the same figures, and a button to make each a candidate plan. */
function CellTable({ result, infos, cancelled, onMake }: { result: ExploreResult; infos: ExploreInputInfo[]; cancelled: boolean; onMake: (index: number) => void }) {
  return (
    <div className="table-scroll">
      <table className="explorer-table" data-testid="explorer-table">
        <caption>Every cell of the grid: simulated artefact as a share of the hoped-for effect (± MC SE), closed form, discarded share, power and whether it is tolerable</caption>
        <thead>
          <tr>
            {result.spec.axes.map((a) => (
              <th key={a.input} scope="col">
                {infos.find((x) => x.input === a.input)?.label ?? a.input}
              </th>
            ))}
            <th scope="col">Simulated artefact (share of effect)</th>
            <th scope="col">± MC SE</th>
            <th scope="col">Closed form</th>
            <th scope="col">Discarded</th>
            <th scope="col">Power</th>
            <th scope="col">Tolerable</th>
            <th scope="col">
              <span className="visually-hidden">Action</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {result.cells.map((cell) => {
            const f = cellFigures(cell);
            return (
              <tr key={cell.index} data-cell-row={cell.index} data-status={cell.status}>
                {cell.values.map((v, i) => {
                  const info = infos.find((x) => x.input === result.spec.axes[i]?.input);
                  return i === 0 ? (
                    <th key={i} scope="row">
                      {axisValue(info, v)}
                    </th>
                  ) : (
                    <td key={i}>{axisValue(info, v)}</td>
                  );
                })}
                {cell.status === 'done' ? (
                  <>
                    <td>{f.share}</td>
                    <td>{f.shareMCSE}</td>
                    <td>{f.closedForm}</td>
                    <td>{f.discarded}</td>
                    <td>
                      {f.power} (± {f.powerMCSE})
                    </td>
                    <td>{f.tolerable}</td>
                  </>
                ) : (
                  <>
                    <td colSpan={2}>{cellStateWords(cell, cancelled)}</td>
                    <td>{f.closedForm}</td>
                    <td colSpan={3} />
                  </>
                )}
                <td>
                  {cell.plan ? (
                    <button type="button" onClick={() => onMake(cell.index)} aria-label={`Make candidate plan: ${cellLabel(result, cell, infos)}`}>
                      Make candidate plan
                    </button>
                  ) : null}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

/** One axis's fields: the input, then from, to and steps. */
function AxisFields({ axis, infos }: { axis: 0 | 1; infos: ExploreInputInfo[] }) {
  const draft = useMeanwardStore((s) => s.explorer.draft.axes[axis]);
  const problems = useMeanwardStore((s) => s.explorer.problems);
  const setInput = useMeanwardStore((s) => s.setExplorerInput);
  const setField = useMeanwardStore((s) => s.setExplorerAxisField);
  const other = useMeanwardStore((s) => s.explorer.draft.axes[axis === 0 ? 1 : 0].input);
  const baseId = useId();
  const info = infos.find((x) => x.input === draft.input);
  const problemOf = (field: string) => problems.find((p) => p.field === `axis${axis}.${field}`)?.message;
  const inputProblem = problemOf('input');
  const legend = axis === 0 ? 'First input to vary' : 'Second input to vary (optional)';
  const numberField = (field: 'from' | 'to' | 'steps', label: string) => {
    const id = `${baseId}-${field}`;
    const problem = problemOf(field);
    return (
      <div className={`field explorer-field${problem ? ' field-invalid' : ''}`} data-field={`explorer.axis${axis}.${field}`}>
        <label htmlFor={id} className="field-label">
          {label}
        </label>
        <input
          id={id}
          type="text"
          inputMode="decimal"
          autoComplete="off"
          spellCheck={false}
          className="input-narrow"
          value={draft[field as keyof ExploreAxisDraft]}
          onChange={(e) => setField(axis, field, e.target.value)}
          aria-invalid={problem ? true : undefined}
          aria-describedby={problem ? `${id}-problem` : undefined}
        />
        {problem && (
          <p id={`${id}-problem`} className="field-error">
            {problem}
          </p>
        )}
      </div>
    );
  };
  return (
    <fieldset className="explorer-axis" data-axis={axis}>
      <legend>{legend}</legend>
      <div className={`field${inputProblem ? ' field-invalid' : ''}`}>
        <label htmlFor={`${baseId}-input`} className="field-label">
          Input
        </label>
        <select
          id={`${baseId}-input`}
          value={draft.input}
          onChange={(e) => setInput(axis, e.target.value as ExploreInput | '')}
          aria-invalid={inputProblem ? true : undefined}
          aria-describedby={inputProblem ? `${baseId}-input-problem` : info ? `${baseId}-note` : undefined}
        >
          <option value="">{axis === 0 ? 'Choose an input' : 'None (one input only)'}</option>
          {infos.map((x) => (
            <option key={x.input} value={x.input} disabled={!x.applies || x.input === other}>
              {x.label}
              {x.unit ? ` (${x.unit})` : ''}
              {!x.applies ? ' — not for this plan' : x.input === other ? ' — already the other input' : ''}
            </option>
          ))}
        </select>
        {inputProblem && (
          <p id={`${baseId}-input-problem`} className="field-error">
            {inputProblem}
          </p>
        )}
        {info && (
          <p id={`${baseId}-note`} className="field-hint">
            {info.note} Allowed: {axisValue(info, info.allowed.min)} to {axisValue(info, info.allowed.max)}
            {info.current !== null ? `; the plan has ${axisValue(info, info.current)}.` : '.'}
          </p>
        )}
      </div>
      {draft.input !== '' && (
        <div className="explorer-range">
          {numberField('from', 'From')}
          {numberField('to', 'To')}
          {numberField('steps', 'Steps')}
        </div>
      )}
    </fieldset>
  );
}

/**
 * The design explorer: choose one or two plan inputs and their ranges, run
 * every cell of the grid as a simulation (on the worker pool, cells filling in
 * as they finish), read the heat map or curves of the simulated artefact with
 * its MC SE beside the closed form, and make any cell a candidate plan.
 */
export function ExplorerPanel() {
  const plan = useMeanwardStore((s) => s.validPlan);
  const planProblems = useMeanwardStore((s) => s.problems.length);
  const explorer = useMeanwardStore((s) => s.explorer);
  const stale = useMeanwardStore(explorerStale);
  const prepareExplorer = useMeanwardStore((s) => s.prepareExplorer);
  const startExplore = useMeanwardStore((s) => s.startExplore);
  const cancelExplore = useMeanwardStore((s) => s.cancelExplore);
  const makeCandidateFromCell = useMeanwardStore((s) => s.makeCandidateFromCell);
  const setExplorerField = useMeanwardStore((s) => s.setExplorerField);
  const [focused, setFocused] = useState<number | null>(null);
  const [asTable, setAsTable] = useState(false);
  const repsId = useId();
  const analysisFieldId = useId();
  const infos = useMemo(() => {
    try {
      return exploreInputs(plan);
    } catch {
      return [];
    }
  }, [plan]);
  useEffect(() => prepareExplorer(), [prepareExplorer]);

  const result = explorer.result;
  const running = explorer.status === 'running';
  const cancelled = explorer.status === 'cancelled';
  const counts = explorerCellCounts(result);
  const pct = Math.round(explorer.progress * 100);
  const general = explorer.problems.filter((p) => p.field === '');
  const repsProblem = explorer.problems.find((p) => p.field === 'replications')?.message;
  const analyses = designAnalysisIds(plan);
  const headline = headlineAnalysisId(plan);

  // The chart's callbacks go through refs, so a new focus never redraws the chart.
  const make = useRef(makeCandidateFromCell);
  make.current = makeCandidateFromCell;
  // Leaving a cell keeps its figures shown until another is pointed at.
  const onCellFocus = useCallback((index: number | null) => {
    if (index !== null) setFocused(index);
  }, []);
  const onCellActivate = useCallback((index: number) => make.current(index), []);
  // Stable hooks: while the grid fills in, the renderer redraws only the cells that changed.
  const draw: DrawChart<ExplorerChartData> = useCallback(
    (svg, data, width) => renderExplorerChart(svg, data, { ...explorerSize(data, width), interactive: true, onCellFocus, onCellActivate }),
    [onCellFocus, onCellActivate],
  );
  const chart = useMemo(() => (result ? buildChart(() => explorerChartData(result), explorerChartText) : null), [result]);

  return (
    <div className="explorer-panel" data-testid="explorer">
      <form
        className="explorer-form"
        onSubmit={(e) => {
          e.preventDefault();
          if (!running) void startExplore();
        }}
        noValidate
      >
        <div className="explorer-axes">
          <AxisFields axis={0} infos={infos} />
          <AxisFields axis={1} infos={infos} />
        </div>
        {infos.some((x) => !x.applies) && (
          <details className="explorer-unavailable">
            <summary>Why some inputs are not offered for this plan</summary>
            <ul>
              {infos
                .filter((x) => !x.applies)
                .map((x) => (
                  <li key={x.input}>
                    <strong>{x.label}:</strong> {x.notApplicableReason}
                  </li>
                ))}
            </ul>
          </details>
        )}
        <div className="explorer-run-settings">
          <div className={`field explorer-field${repsProblem ? ' field-invalid' : ''}`}>
            <label htmlFor={repsId} className="field-label">
              Replications per cell
            </label>
            <input
              id={repsId}
              type="text"
              inputMode="numeric"
              autoComplete="off"
              className="input-narrow"
              value={explorer.draft.replications}
              onChange={(e) => setExplorerField('replications', e.target.value)}
              aria-invalid={repsProblem ? true : undefined}
              aria-describedby={repsProblem ? `${repsId}-problem` : undefined}
            />
            {repsProblem && (
              <p id={`${repsId}-problem`} className="field-error">
                {repsProblem}
              </p>
            )}
          </div>
          <div className="field explorer-field">
            <label htmlFor={analysisFieldId} className="field-label">
              Analysis judged
            </label>
            <select id={analysisFieldId} value={explorer.draft.analysisId} onChange={(e) => setExplorerField('analysisId', e.target.value)}>
              <option value="">{`${ANALYSIS_DESCRIPTIONS[headline].name} (headline)`}</option>
              {analyses
                .filter((id) => id !== headline)
                .map((id) => (
                  <option key={id} value={id}>
                    {ANALYSIS_DESCRIPTIONS[id].name}
                  </option>
                ))}
            </select>
          </div>
        </div>
        {general.length > 0 && (
          <ul className="explorer-problems" role="alert">
            {general.map((p) => (
              <li key={p.message}>{p.message}</li>
            ))}
          </ul>
        )}
        <div className="sim-controls">
          {running ? (
            // Keys: two separate buttons, so a click on Cancel can never land on the Run button React would reuse (and submit the form again).
            <button key="cancel" type="button" className="primary" onClick={cancelExplore} data-testid="explorer-cancel">
              Cancel the grid
            </button>
          ) : (
            <button key="run" type="submit" className="primary" aria-disabled={planProblems > 0 || undefined} data-testid="explorer-run">
              {result ? 'Run the grid again' : 'Run the grid'}
            </button>
          )}
        </div>
      </form>
      {running && <ProgressBar label="Design explorer progress" pct={pct} valueText={`${counts.finished} of ${counts.toRun} cells done`} />}
      <p className="sim-status" role="status" data-testid="explorer-status" data-status={explorer.status} data-stale={stale ? 'true' : 'false'}>
        {explorer.status === 'idle' && !result && 'Not run yet.'}
        {running && !result && 'Preparing the grid’s plans and closed forms…'}
        {result && explorer.status !== 'error' && (
          <span data-testid="explorer-progress">
            {fmtInt(counts.finished)} of {fmtInt(counts.toRun)} cells{running ? ' done; you can keep working.' : '.'}
          </span>
        )}
        {result && counts.impossible > 0 && ` ${fmtInt(counts.impossible)} cell${counts.impossible === 1 ? ' is' : 's are'} impossible plans and were not simulated.`}
        {explorer.status === 'done' && ' Done.'}
        {cancelled && ' Cancelled: the cells not finished are marked as not run.'}
        {explorer.status === 'error' && explorer.error}
        {stale && ' The plan has changed since this grid was run: its figures are for the earlier plan.'}
      </p>
      {result && chart && (
        <>
          <ChartFigure
            chart="explorer"
            data={chart.data}
            text={chart.text}
            error={chart.error}
            draw={draw}
            fallbackTitle="Design explorer"
            controls={
              <label className="explorer-table-toggle">
                <input type="checkbox" checked={asTable} onChange={(e) => setAsTable(e.target.checked)} /> Show as table
              </label>
            }
          />
          <div className="explorer-details" aria-live="polite" data-testid="explorer-details">
            <CellDetails result={result} index={focused} infos={infos} cancelled={cancelled} />
          </div>
          {asTable && <CellTable result={result} infos={infos} cancelled={cancelled} onMake={makeCandidateFromCell} />}
        </>
      )}
      {explorer.message && (
        <p className="explorer-message" role="status" data-testid="explorer-message">
          {explorer.message}
        </p>
      )}
      <p className="explorer-caution">
        <strong>Caution:</strong> {EXPLORER_CAUTION}
      </p>
    </div>
  );
}
