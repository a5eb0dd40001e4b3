import { useCallback, useId, useMemo, useState } from 'react';
import { balanceChartData } from '../charts/balanceChartData';
import { balanceChartText } from '../charts/balanceChartText';
import { chartSize } from '../charts/chartSize';
import type { ChartId, ChartInput } from '../charts/chartTypes';
import { estimatesChartData } from '../charts/estimatesChartData';
import { estimatesChartText } from '../charts/estimatesChartText';
import { pretestChartData } from '../charts/pretestChartData';
import { pretestChartText } from '../charts/pretestChartText';
import { renderChart, type ChartDataById } from '../charts/renderChartToSvgString';
import { sensitivityChartData, sensitivityModes } from '../charts/sensitivityChartData';
import { sensitivityChartText } from '../charts/sensitivityChartText';
import { usesCovariateModel } from '../core/multivariate/covariateModel';
import { studyDesign } from '../core/design/studyDesign';
import type { SensitivityVariable } from '../core/sensitivityCurve';
import { selectAnalytic, selectAnalyticStale, selectValidPlan } from '../state/selectors';
import { useMeanwardStore } from '../state/store';
import { ChartFigure, buildChart, type BuiltChart, type DrawChart } from './ChartFigure';
import { CovariateBalanceCard } from './CovariateBalanceCard';

const MODE_LABELS: Record<SensitivityVariable, string> = {
  reliability: 'against reliability',
  pretestGap: 'against the pretest gap',
  cutOff: 'against the cut-off',
  screenerReliability: 'against the screener’s reliability',
};

interface ChartCardProps<K extends ChartId> extends BuiltChart<ChartDataById[K]> {
  chartId: K;
  controls?: React.ReactNode;
}

/** One of the four charts (drawn by src/charts' renderChart at the size shown), with its text and table alternative. */
function ChartCard<K extends ChartId>({ chartId, controls, ...built }: ChartCardProps<K>) {
  const draw = useCallback<DrawChart<ChartDataById[K]>>(
    (svg, data, width, link) => renderChart(chartId, svg, data, { ...chartSize(chartId, data, width), ...link }),
    [chartId],
  );
  return <ChartFigure chart={chartId} {...built} draw={draw} fallbackTitle="Chart" controls={controls} />;
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
  const [chosenMode, setMode] = useState<SensitivityVariable>('reliability');
  // The axes this plan's design offers; a choice the design lacks falls back to reliability (kept for when it returns).
  const modes = useMemo(() => sensitivityModes(plan), [plan]);
  const mode = modes.includes(chosenMode) ? chosenMode : 'reliability';
  const simulation = simResult && !simStale ? simResult : null;
  const input: ChartInput | null = useMemo(() => (analytic ? { plan, analytic, simulation } : null), [plan, analytic, simulation]);
  const pretest = useMemo(() => (input ? buildChart(() => pretestChartData(input), pretestChartText) : null), [input]);
  const estimates = useMemo(() => (input ? buildChart(() => estimatesChartData(input), estimatesChartText) : null), [input]);
  // The sensitivity curves are closed forms of the plan alone: the quick planned-procedure figures arriving
  // for the same plan (a new analytic object) must not recompute them.
  const sensitivityInput = useMemo(() => input, [plan, analytic !== null]); // eslint-disable-line react-hooks/exhaustive-deps
  const sensitivity = useMemo(
    () => (sensitivityInput ? buildChart(() => sensitivityChartData(sensitivityInput, mode), sensitivityChartText) : null),
    [sensitivityInput, mode],
  );
  // A one-group study matches nobody: it has no balance chart.
  const oneGroup = studyDesign(plan).shape === 'one-group';
  const balance = useMemo(() => (input && !oneGroup ? buildChart(() => balanceChartData(input), balanceChartText) : null), [input, oneGroup]);
  const modeName = useId();
  if (!pretest || !estimates || !sensitivity || (!balance && !oneGroup)) return null;
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
        ) : balance ? (
          <ChartCard chartId="balance" {...balance} />
        ) : null}
        <ChartCard chartId="estimates" {...estimates} />
        <ChartCard
          chartId="sensitivity"
          {...sensitivity}
          controls={
            <div className="mode-switch" role="radiogroup" aria-label="Sensitivity chart: vary">
              {modes.map((m) => (
                <label key={m}>
                  <input type="radio" name={modeName} checked={mode === m} onChange={() => setMode(m)} />
                  {MODE_LABELS[m]}
                </label>
              ))}
            </div>
          }
        />
      </div>
    </section>
  );
}
