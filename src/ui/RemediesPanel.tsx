import { selectAnalytic, selectAnalyticStale } from '../state/selectors';
import { useMeanwardStore } from '../state/store';
import { APPLICABLE_REMEDY_IDS } from '../core/applyRemedy';
import { studyDesign } from '../core/design/studyDesign';
import { fmt, fmtPct, fmtR, fmtSigned } from './format';

/** Design changes that remove the artefact, best first (from analysePlan), and the break-even reliability. */
export function RemediesPanel() {
  const analytic = useMeanwardStore(selectAnalytic);
  const stale = useMeanwardStore(selectAnalyticStale);
  const tryRemedy = useMeanwardStore((s) => s.tryRemedy);
  const plan = useMeanwardStore((s) => s.validPlan);
  if (!analytic) return null;
  const canTry = studyDesign(plan).kind === 'existing-groups';
  const be = analytic.breakEven;
  // Clusters matched on their means: the break-even figure is the reliability of a cluster's mean (λ), and core's note says how to reach it.
  const clusterLevel = analytic.clusters?.level === 'clusters';
  return (
    <section className={`remedies${stale ? ' is-stale' : ''}`} aria-labelledby="remedies-heading">
      <h2 id="remedies-heading">What would fix it</h2>
      <div className="break-even" data-testid="break-even">
        <h3>Break-even reliability</h3>
        {be.reliability !== null && clusterLevel ? (
          <p data-testid="break-even-cluster">
            The matched comparison stays within your tolerable share if the reliability of a cluster&rsquo;s observed mean (λ) is at least{' '}
            <strong>{fmtR(be.reliability, 3)}</strong>. {be.note}
          </p>
        ) : be.reliability !== null ? (
          <p>
            The matched comparison stays within your tolerable share if the pretest&rsquo;s within-group reliability (comparison group; the scale of the
            sensitivity chart) is at least{' '}
            <strong>{fmtR(be.reliability, 3)}</strong>
            {be.alreadyMet ? ' — the planned pretest already meets this.' : ` (now ${fmtR(analytic.reliability.comparison, 3)}).`}
            {be.parallelForms !== null && !be.alreadyMet && (
              <>
                {' '}
                Averaging <strong>{be.parallelForms}</strong> parallel forms of the pretest would get there (Spearman–Brown).
              </>
            )}
          </p>
        ) : null}
        {be.note && be.reliability === null && <p className="note">{be.note}</p>}
      </div>
      {analytic.remedies.length > 0 && (
        <ol className="remedy-list">
          {analytic.remedies.map((r) => (
            <li key={r.id} data-remedy={r.id}>
              <h3 id={`remedy-title-${r.id}`}>{r.title}</h3>
              <p>{r.summary}</p>
              <p className="remedy-figures">
                Remaining artefact: <strong>{fmtSigned(r.remainingBias)} points</strong>
                {r.remainingBiasShare !== null && <> ({fmtPct(Math.abs(r.remainingBiasShare), 0)} of the effect)</>}
                {r.discardedShare !== null && <>; programme members left unmatched: about {fmtPct(r.discardedShare, 0)}</>}.
              </p>
              {r.feasibility && (
                <p className="remedy-feasibility" data-testid={`remedy-feasibility-${r.id}`}>
                  <strong>{r.feasibility}</strong>
                </p>
              )}
              {r.estimand && (
                <p className="remedy-estimand" data-testid={`remedy-estimand-${r.id}`}>
                  Whom the estimate describes: {r.estimand}
                </p>
              )}
              {r.neededReliability !== undefined && (
                <p className="remedy-needed" data-testid="remedy-needed-reliability">
                  Pooled within-group reliability the correction needs: <strong>{fmtR(r.neededReliability, 3)}</strong>.
                </p>
              )}
              {r.caliperSuggestion && (
                <p className="remedy-caliper" data-testid={`remedy-caliper-${r.id}`}>
                  Suggested Mahalanobis caliper: <strong>{fmt(r.caliperSuggestion.value, 2)}</strong>.
                </p>
              )}
              <p className="assumption">Assumes: {r.assumption}</p>
              {canTry && APPLICABLE_REMEDY_IDS.includes(r.id) && (
                <button type="button" className="try-remedy" onClick={() => tryRemedy(r.id)} aria-label={`Try this: ${r.title}`}>
                  Try this (adds a variant)
                </button>
              )}
            </li>
          ))}
        </ol>
      )}
      <p className="table-note">
        Best first: remedies that leave a tolerable artefact while keeping most of the programme pool and staying realistic come first. Each remedy is judged under the same model, one at a time; a combination may do better than any one.
        Shares are of the hoped-for effect ({fmt(analytic.tau)} points).
      </p>
    </section>
  );
}
