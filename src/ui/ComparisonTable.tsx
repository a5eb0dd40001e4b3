import { ANALYSIS_STYLES } from '../charts/palette';
import type { AnalysisId } from '../core/plan';
import { isFeasible, type SimAnalysisResult } from '../sim/types';
import { procedureBasisNote } from '../core/procedureBasisNote';
import { quickFiguresAgreement } from '../sim/quickFiguresAgreement';
import { selectAnalysesInOrder, selectAnalytic, selectAnalyticStale, selectHighlight, selectSetHighlight } from '../state/selectors';
import { useMeanwardStore } from '../state/store';
import { fmt, fmtInt, fmtPct, fmtSigned } from './format';
import type { AnalyticAnalysis } from '../core/analyticResults';
import { centralCutOffVarianceInflation } from '../core/design/centralCutOffVarianceInflation';
import { verdictWords } from './VerdictPanel';
import { FAILURE_WORDS } from '../core/judgeTolerable';
import { DEFAULT_TARGET_POWER } from '../core/analysisSettings';

function SimFigure({ value, mcse, pct, signed }: { value: number; mcse: number; pct?: boolean; signed?: boolean }) {
  const v = pct ? fmtPct(value) : signed ? fmtSigned(value) : fmt(value);
  const e = pct ? fmtPct(mcse) : fmt(mcse);
  return (
    <span className="sim-figure">
      {v} <span className="mcse">± {e}</span>
    </span>
  );
}

const COUNT_WORDS: Record<number, string> = { 2: 'two', 3: 'three', 4: 'four', 5: 'five', 6: 'six' };

/** "A", "A and B", "A, B and C". */
function names(list: string[]): string {
  return list.length <= 1 ? list.join('') : `${list.slice(0, -1).join(', ')} and ${list[list.length - 1]}`;
}

/**
 * Regression discontinuity's price: the variance of its estimate relative to a
 * randomised study of the same size (core's varianceInflation), in plain words.
 */
export function VarianceInflationNote({ inflation }: { inflation: number }) {
  return (
    <span className="rd-cost" data-testid="rd-variance-inflation">
      Its cost: the estimate varies about {fmt(inflation, 2)} times as much as a randomised study&rsquo;s of the same size and split, so it needs
      about {fmt(inflation, 1)} times the sample for the same power (about {fmt(centralCutOffVarianceInflation(), 2)} times at a cut-off in the
      middle of the scores).
    </span>
  );
}

/**
 * Under an analysis of a clusters design: its cluster-aware SE (and, for the
 * person-level analysis, the naive SE that ignores clustering), the clusters
 * per group the target power needs and the minimum detectable effect, all
 * from core.
 */
function ClusterRowNote({ a }: { a: AnalyticAnalysis }) {
  if (a.clustersPerGroupNeeded === undefined || !a.feasible) return null;
  return (
    <span className="cluster-note" data-testid={`cluster-note-${a.id}`}>
      Cluster-aware SE {fmt(a.se)}
      {a.df !== null && <> (df {fmtInt(a.df)})</>}
      {a.naiveSE !== undefined && <>; ignoring the clustering it would be reported as {fmt(a.naiveSE)}</>}. For the target power:{' '}
      {a.requiredNNote !== null ? a.requiredNNote : a.clustersPerGroupNeeded === null ? 'no number of clusters is enough' : `${fmtInt(a.clustersPerGroupNeeded)} clusters per group`}; minimum detectable
      effect {fmtSigned(a.minimumDetectableEffect)} points.
    </span>
  );
}

/** The simulated figures of the same estimates with a naive person-level SE (what ignoring the clustering costs). */
function NaiveRow({ name, s, tauZero }: { name: string; s: SimAnalysisResult; tauZero: boolean }) {
  const f = isFeasible(s) ? s : null;
  return (
    <tr className="naive-row" data-testid={`naive-${s.id}`}>
      <th scope="row">
        <span className="swatch swatch-empty" aria-hidden="true" />
        {name}, with a naive SE that ignores the clustering
        <span className="assumption">
          The same estimates; only the SE differs.{f && <> Its mean reported SE was {fmt(f.meanModelSE)} against an actual spread of {fmt(f.empiricalSE)}.</>}
        </span>
      </th>
      <td>—</td>
      <td>{f ? <SimFigure value={f.bias} mcse={f.biasMCSE} signed /> : '—'}</td>
      <td>{f ? <SimFigure value={f.rmse} mcse={f.rmseMCSE} /> : '—'}</td>
      <td>{f ? <SimFigure value={f.coverage} mcse={f.coverageMCSE} pct /> : '—'}</td>
      <td>{f && tauZero ? <SimFigure value={f.rejectionRate} mcse={f.rejectionRateMCSE} pct /> : '—'}</td>
      <td>{f && !tauZero ? <SimFigure value={f.rejectionRate} mcse={f.rejectionRateMCSE} pct /> : '—'}</td>
      <td>{f && !tauZero ? <SimFigure value={f.wrongSignRate} mcse={f.wrongSignRateMCSE} pct /> : '—'}</td>
    </tr>
  );
}

/**
 * The design's analyses side by side: closed-form expectations and, after a
 * simulation, the simulated figures with their Monte Carlo SEs. Hovering or
 * focusing a row highlights that analysis in every chart.
 */
export function ComparisonTable() {
  const rows = useMeanwardStore(selectAnalysesInOrder);
  const analytic = useMeanwardStore(selectAnalytic);
  const stale = useMeanwardStore(selectAnalyticStale);
  const highlight = useMeanwardStore(selectHighlight);
  const setHighlight = useMeanwardStore(selectSetHighlight);
  // Narrow reads: progress ticks during a run must not re-render the table.
  const simResult = useMeanwardStore((s) => s.simulation.result);
  const simStale = useMeanwardStore((s) => s.simulation.stale);
  const sim = { stale: simStale };
  const targetPower = useMeanwardStore((s) => s.validPlan?.analysis.targetPower ?? DEFAULT_TARGET_POWER);
  const tauZero = simResult ? simResult.tau === 0 : false;
  if (rows.length === 0 || !analytic) return null;
  const disagreements = simResult && !simStale && !stale ? quickFiguresAgreement(analytic, simResult) : [];
  const simAll = (id: AnalysisId): SimAnalysisResult | null => simResult?.analyses[id] ?? null;
  // Clusters: the naive person-level figures of the same estimates, shown under their analysis after a simulation.
  const naive = simResult && !simStale ? simResult.naivePersonLevel : undefined;
  const naiveOf = (id: AnalysisId): SimAnalysisResult | undefined =>
    id === 'personLevelAncova' ? naive?.personLevelAncova : id === 'matchedDifference' ? naive?.matchedDifference : undefined;
  return (
    <section className="comparison" aria-labelledby="comparison-heading">
      <h2 id="comparison-heading">{rows.length === 1 ? `The analysis: ${rows[0]!.name.toLowerCase()}` : `The ${COUNT_WORDS[rows.length] ?? rows.length} analyses compared`}</h2>
      <p className="section-intro">
        <span data-testid="procedure-basis">{procedureBasisNote(analytic)}</span>
        {simResult ? (
          <>
            {' '}
            Simulated figures (smaller, after ±: Monte Carlo SE) are from {simResult.replications.toLocaleString('en-GB')} replications with seed{' '}
            {simResult.seed}
            {sim.stale ? <strong className="stale-inline"> — from an earlier plan, re-run to update</strong> : null}.
          </>
        ) : (
          ' Run the simulation to add simulated bias, RMSE and coverage.'
        )}
      </p>
      <div className="table-scroll">
        <table className={`comparison-table${stale ? ' is-stale' : ''}${sim.stale ? ' sim-stale' : ''}`} data-testid="comparison-table">
          <caption className="visually-hidden">
            Expected and simulated performance of {names(rows.map((a) => a.name))}. Hover or focus a row to highlight it in the charts.
          </caption>
          <thead>
            <tr>
              <th scope="col">Analysis</th>
              <th scope="col">Expected bias (points / SD)</th>
              <th scope="col">Simulated bias</th>
              <th scope="col">RMSE (sim.)</th>
              <th scope="col">95% CI coverage (sim.)</th>
              <th scope="col">False-positive rate</th>
              <th scope="col">Power</th>
              <th scope="col">Wrong-sign rate</th>
              <th scope="col">n per group for {fmtPct(targetPower, 0)} power</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((a) => {
              const all = simAll(a.id);
              // An analysis the simulation could not summarise shows its reason instead of figures.
              const s = all && isFeasible(all) ? all : null;
              const infeasible = all && !isFeasible(all) ? all.reason : null;
              const style = ANALYSIS_STYLES[a.id];
              const on = highlight === a.id;
              const naiveResult = naiveOf(a.id);
              return [
                <tr
                  key={a.id}
                  data-analysis={a.id}
                  tabIndex={0}
                  className={on ? 'is-highlighted' : highlight ? 'is-dimmed' : undefined}
                  aria-current={on ? 'true' : undefined}
                  onMouseEnter={() => setHighlight(a.id)}
                  onMouseLeave={() => setHighlight(null)}
                  onFocus={() => setHighlight(a.id)}
                  onBlur={() => setHighlight(null)}
                >
                  <th scope="row">
                    <span className="swatch" style={{ background: style.colour }} aria-hidden="true" />
                    {a.name}
                    <span className="row-verdict">{verdictWords(a.verdict).short}</span>
                    <span className="row-tolerability" data-testid={`tolerability-${a.id}`}>
                      {a.tolerability.tolerable ? 'Tolerable on all three conditions' : `Not tolerable: ${a.tolerability.failed.map((f) => FAILURE_WORDS[f]).join(', ')}`}
                    </span>
                    <span className="assumption">{a.assumption}</span>
                    {a.varianceInflation !== undefined && <VarianceInflationNote inflation={a.varianceInflation} />}
                    <ClusterRowNote a={a} />
                    {!a.feasible && (
                      <span className="infeasible-reason" data-testid={`infeasible-${a.id}`}>
                        Not feasible: {a.infeasibleReason}
                      </span>
                    )}
                  </th>
                  <td>
                    <span className="nowrap">
                      {fmtSigned(a.bias)} / {fmtSigned(a.biasSD)}
                    </span>
                    {a.growthGap !== 0 && (
                      <span className="formula-figure" data-testid={`parts-${a.id}`}>
                        regression artefact {fmtSigned(a.regressionArtefact)}
                        {a.regressionArtefactShare !== null && <> ({fmtPct(Math.abs(a.regressionArtefactShare), 0)} of the effect)</>}; growth gap{' '}
                        {fmtSigned(a.growthGap)}
                        {a.growthGapShare !== null && <> ({fmtPct(Math.abs(a.growthGapShare), 0)})</>}
                      </span>
                    )}
                    {a.basis === 'planned-procedure' && (
                      <>
                        <span className="formula-figure">quick simulation, MC SE {fmt(a.expectedEstimateMCSE)}</span>
                        <span className="formula-figure">formula, unlimited pools: {fmtSigned(a.formulaEstimate - analytic.tau)}</span>
                      </>
                    )}
                  </td>
                  <td>
                    {s ? <SimFigure value={s.bias} mcse={s.biasMCSE} signed /> : infeasible ? <span className="sim-infeasible">Not computed: {infeasible}</span> : '—'}
                  </td>
                  <td>{s ? <SimFigure value={s.rmse} mcse={s.rmseMCSE} /> : '—'}</td>
                  <td>{s ? <SimFigure value={s.coverage} mcse={s.coverageMCSE} pct /> : '—'}</td>
                  <td>
                    {fmtPct(a.falsePositiveRate)}
                    {s && tauZero && (
                      <>
                        <br />
                        <SimFigure value={s.rejectionRate} mcse={s.rejectionRateMCSE} pct />
                      </>
                    )}
                  </td>
                  <td>
                    {!a.feasible ? '—' : a.wrongSignRate === null ? 'n/a (no effect)' : fmtPct(a.power, 0)}
                    {s && !tauZero && (
                      <>
                        <br />
                        <SimFigure value={s.rejectionRate} mcse={s.rejectionRateMCSE} pct />
                      </>
                    )}
                  </td>
                  <td>
                    {!a.feasible ? '—' : a.wrongSignRate === null ? 'n/a' : fmtPct(a.wrongSignRate)}
                    {s && !tauZero && (
                      <>
                        <br />
                        <SimFigure value={s.wrongSignRate} mcse={s.wrongSignRateMCSE} pct />
                      </>
                    )}
                  </td>
                  <td data-testid={`required-n-${a.id}`}>
                    {a.requiredNNote ?? (!a.feasible ? '—' : a.requiredNPerGroup === null ? 'not reachable' : fmtInt(a.requiredNPerGroup))}
                  </td>
                </tr>,
                naiveResult ? <NaiveRow key={`${a.id}-naive`} name={a.name} s={naiveResult} tauZero={tauZero} /> : null,
              ];
            })}
          </tbody>
        </table>
      </div>
      {disagreements.length > 0 && (
        <ul className="disagreements" data-testid="quick-disagreements">
          {disagreements.map((d) => (
            <li key={d.id}>{d.note}</li>
          ))}
        </ul>
      )}
      <p className="table-note">
        False-positive rate: how often the analysis declares an effect when the programme does nothing. Wrong-sign rate: how often a helpful
        programme comes out significantly harmful. Tolerable: the regression artefact within your tolerable share, the false-positive rate at most
        1.5 × alpha, and power lowered by at most 10 percentage points. {analytic.requiredNCounts} Where two figures are stacked, the upper is expected and the lower simulated. Under each name: the condition under which that analysis is unbiased.
        {analytic.clusters && (
          <>
            {' '}
            With clusters, each SE counts the clusters as the units (cluster means, or person-level regression with cluster-robust CR2 SEs); a row
            marked &ldquo;naive SE&rdquo; shows what a person-level analysis that ignores the clustering would claim: its coverage falls short of 95%.
          </>
        )}
      </p>
    </section>
  );
}
