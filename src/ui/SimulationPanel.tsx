import { useEffect, useRef } from 'react';
import { selectIsValid, selectSimulation, selectValidPlan } from '../state/selectors';
import { useMeanwardStore } from '../state/store';
import { BROWSER_RUN_LIMIT_SECONDS } from '../sim/estimateRunSeconds';
import { fmtDuration, fmtInt, fmtPct, fmtSigned } from './format';
import { ProgressBar } from './ProgressBar';

/** Run, watch and cancel the Monte Carlo check; shows whether its figures are out of date. */
export function SimulationPanel() {
  const sim = useMeanwardStore(selectSimulation);
  const valid = useMeanwardStore(selectIsValid);
  const plan = useMeanwardStore(selectValidPlan);
  const run = useMeanwardStore((s) => s.runSimulation);
  const cancel = useMeanwardStore((s) => s.cancelSimulation);
  const running = sim.status === 'running';

  // Optional auto-run: two seconds after the plan stops changing.
  const first = useRef(true);
  useEffect(() => {
    if (first.current) {
      first.current = false;
      return;
    }
    if (!sim.autoRun || !valid) return;
    const t = setTimeout(() => void run(), 2000);
    return () => clearTimeout(t);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [plan, sim.autoRun, valid]);

  const pct = Math.round(sim.progress * 100);
  return (
    <section className="simulation" aria-labelledby="simulation-heading">
      <h2 id="simulation-heading">Check by simulation</h2>
      <div className="sim-controls">
        {/* While a run starts or ends, the button pressed stays focusable (aria-disabled, not
            disabled): a disabled focused button would drop the keyboard focus to the page. */}
        <button
          type="button"
          className="primary"
          onClick={() => {
            if (!running && valid) void run();
          }}
          aria-disabled={running || !valid}
        >
          {sim.result ? 'Run the simulation again' : 'Run the simulation'}
        </button>
        <button
          type="button"
          onClick={() => {
            if (running) cancel();
          }}
          aria-disabled={!running}
        >
          Cancel
        </button>
        <span className="sim-size">
          {fmtInt(plan.simulation.replications)} replications, seed {plan.simulation.seed}
        </span>
      </div>
      {running && <ProgressBar label="Simulation progress" pct={pct} valueText={`${pct}% of replications done`} />}
      <p className="sim-status" role="status" data-testid="sim-status" data-status={sim.status} data-stale={sim.stale ? 'true' : 'false'}>
        {sim.status === 'idle' && 'Not run yet. The simulation draws finite pools, matches with your caliper, ratio and order, and analyses each simulated study four ways.'}
        {running && 'Running in the background; you can keep editing.'}
        {running && sim.estimate && ` Estimated time: ${fmtDuration(sim.estimate.seconds)} in all (${sim.estimate.method}).`}
        {sim.status === 'too-long' &&
          sim.estimate &&
          `This run would take ${fmtDuration(sim.estimate.seconds)} (${sim.estimate.method}), longer than the ${fmtDuration(BROWSER_RUN_LIMIT_SECONDS, true)} a run in the page may take without asking. Run it anyway (keep this tab open), use fewer replications, or run the plan from the command line with a time limit (meanward run plan.json --max-seconds N).`}
        {sim.status === 'done' && !sim.stale && sim.result && `Done: ${fmtInt(sim.result.replications)} replications.`}
        {sim.status === 'done' && sim.stale && 'The plan has changed since this run: the simulated figures are out of date. Run again to update them.'}
        {sim.status === 'cancelled' && `Cancelled.${sim.result ? ' The figures shown are from the previous run.' : ''}`}
        {sim.status === 'error' && sim.error}
      </p>
      {sim.status === 'too-long' && (
        <div className="sim-confirm">
          <button type="button" className="primary" onClick={() => void run({ confirmed: true })}>
            Run it anyway
          </button>
          <button type="button" onClick={cancel}>
            Not now
          </button>
        </div>
      )}
      {sim.status === 'error' && sim.errorKind === 'stalled' && valid && (
        <div className="sim-confirm">
          <button type="button" className="primary" onClick={() => void run()}>
            Run it again
          </button>
        </div>
      )}
      {sim.result && sim.stale && sim.status !== 'done' && <p className="stale-note">The simulated figures shown are from an earlier plan.</p>}
      {sim.result && <MatchingFacts />}
    </section>
  );
}

function MatchingFacts() {
  const sim = useMeanwardStore(selectSimulation);
  const m = sim.result?.matching;
  if (!m) return null;
  return (
    <p className={`matching-facts${sim.stale ? ' is-stale' : ''}`}>
      On average {fmtInt(m.meanMatchedProgramme)} programme members found partners ({fmtPct(m.discardedProgrammeShare, 0)} left unmatched). After matching the
      observed pretest looks balanced (SMD {fmtSigned(m.observedSMDAfter)}), but the true scores still differ (SMD {fmtSigned(m.trueSMDAfter)}): the hidden imbalance.
    </p>
  );
}
