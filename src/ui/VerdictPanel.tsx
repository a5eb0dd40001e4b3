import { requireAnalysis } from '../core/presentAnalyses';
import { DEFAULT_TARGET_POWER } from '../core/analysisSettings';
import { headlineAnalysisId } from '../core/design/studyDesign';
import type { AnalyticAnalysis, AnalyticResults, ArtefactVerdict, ClusterSummary, DesignSummary, UnmeasuredBias } from '../core/analyticResults';
import type { Plan } from '../core/plan';
import { MATCHED_ON } from '../core/matchedOnWords';
import { selectAnalytic, selectAnalyticStale, selectValidPlan } from '../state/selectors';
import { useMeanwardStore } from '../state/store';
import { fmt, fmtInt, fmtPct, fmtR, fmtSigned } from './format';

/** What an artefact does to the conclusion, in plain words. */
const VERDICT_WORDS: Record<ArtefactVerdict, { short: string; heading: string; sentence: string }> = {
  negligible: { short: 'artefact small enough to tolerate', heading: 'leaves only a tolerable artefact', sentence: 'is within the share of the effect you said you could tolerate.' },
  hides: { short: 'hides the effect', heading: 'hides the effect', sentence: 'works against the programme: it shrinks the estimate and could hide a real effect.' },
  reverses: { short: 'reverses the effect', heading: 'reverses the effect', sentence: 'is larger than the effect and opposite to it: a helpful programme would look harmful.' },
  inflates: { short: 'inflates the effect', heading: 'inflates the effect', sentence: 'works in the programme’s favour: the programme would look better than it is.' },
  invents: { short: 'invents an effect', heading: 'invents an effect', sentence: 'would produce a difference even though the hoped-for effect is zero.' },
};


/** "A", "A and B", "A, B and C". */
function names(list: string[]): string {
  return list.length <= 1 ? list.join('') : `${list.slice(0, -1).join(', ')} and ${list[list.length - 1]}`;
}

/**
 * The part of the bias that no analysis of the measured variables removes
 * (core's unmeasuredBias), in plain words; shown only for plans with covariates.
 */
function UnmeasuredPart({ u, tauZero }: { u: UnmeasuredBias; tauZero: boolean }) {
  if (u.covariates.length === 0) {
    return (
      <p className="verdict-unmeasured" data-testid="verdict-unmeasured">
        Every covariate you listed is measured, so none of this bias comes from a known confounder left unobserved. Confounders you did not list
        are not in these figures.
      </p>
    );
  }
  const one = u.covariates.length === 1;
  return (
    <p className="verdict-unmeasured is-unremovable" data-testid="verdict-unmeasured">
      <strong>Not measured: {names(u.covariates)}.</strong> Of the shift, <strong data-testid="verdict-unmeasured-bias">{fmtSigned(u.points)} points</strong>{' '}
      ({fmtSigned(u.sd)} posttest SD{!tauZero && u.share !== null ? <>, {fmtPct(Math.abs(u.share), 0)} of the hoped-for effect</> : null}) comes from{' '}
      {one ? 'this confounder' : 'these confounders'}. No matching, adjustment or reliability correction on the measured variables can remove that
      part; only measuring {one ? 'it' : 'them'} could.
    </p>
  );
}

export function verdictWords(v: ArtefactVerdict) {
  return VERDICT_WORDS[v];
}

/** How people got into the programme and what that means for the analyses (core's design summary). */
function DesignNote({ design }: { design: DesignSummary }) {
  return (
    <p className="verdict-design" data-testid="verdict-design" data-design={design.kind} data-shape={design.shape}>
      <strong>Who got the programme:</strong> <span data-testid="verdict-rule">{design.rule}</span>{' '}
      <span data-testid="verdict-meaning">{design.meaning}</span>
      {design.selectedShare !== null && <> The rule selects about {fmtPct(design.selectedShare, 0)} of the population.</>}
    </p>
  );
}

/**
 * A clusters design's own figures (core's ClusterSummary and the headline
 * analysis' clusters needed and minimum detectable effect): the reliability
 * of a cluster's mean and whether the same people sit the posttest, the
 * design effect, and what the target power takes in clusters.
 */
export function ClusterFacts({ c, m, targetPower }: { c: ClusterSummary; m: AnalyticAnalysis; targetPower: number }) {
  const same = c.cohort === 'same';
  return (
    <ul className="verdict-clusters" data-testid="verdict-clusters">
      <li data-testid="verdict-cluster-lambda">
        <strong>Reliability of a cluster&rsquo;s observed mean: λ = {fmtR(c.clusterMeanReliability.comparison, 3)}</strong> (
        {fmtInt(c.size.comparison)} people tested per cluster, pretest ICC {fmtR(c.pretestICC, 2)}).{' '}
        <span data-testid="verdict-cohort">
          {same
            ? 'The same people sit the posttest, so λ counts the test’s measurement error and which people happen to be in each cluster.'
            : 'A new cohort sits the posttest, not the people who were tested, so λ is ICC(2): it counts which people were tested, whatever the test’s own reliability.'}
        </span>
      </li>
      <li data-testid="verdict-design-effect">
        Design effect (Kish): <strong>{fmt(c.designEffect.posttest, 2)}</strong> for the posttest
        {c.designEffect.pretest !== c.designEffect.posttest && <> ({fmt(c.designEffect.pretest, 2)} for the pretest)</>}: a person-level analysis that ignores
        the clustering treats the people as that many times more informative than they are, so its SEs are too small.
      </li>
      {m.feasible && m.clustersPerGroupNeeded !== undefined && (
        <li data-testid="verdict-clusters-needed">
          For {fmtPct(targetPower, 0)} power with the artefact included:{' '}
          {m.requiredNNote !== null ? (
            <strong>{m.requiredNNote}</strong>
          ) : m.clustersPerGroupNeeded === null ? (
            <strong>no number of clusters is enough</strong>
          ) : (
            <>
              <strong>{fmtInt(m.clustersPerGroupNeeded)} clusters per group</strong> ({fmtInt(m.requiredNPerGroup)} people)
            </>
          )}
          ; the smallest effect this plan detects with that power is <strong data-testid="verdict-mde">{fmtSigned(m.minimumDetectableEffect)} points</strong>.
        </li>
      )}
    </ul>
  );
}

/**
 * The one-group verdict's lead: the change expected with no programme at all
 * (regression toward the mean, plus any growth) set beside the hoped-for
 * effect, then what that does to the estimate.
 */
function OneGroupLead({ m, analytic, plan }: { m: AnalyticAnalysis; analytic: AnalyticResults; plan: Plan }) {
  const tauZero = analytic.tau === 0;
  const side = plan.assignment?.side ?? 'below';
  return (
    <>
      <div className="verdict-beside" data-testid="verdict-beside">
        <p>
          <span>Change expected with no programme at all</span>
          <strong data-testid="verdict-no-programme-change">{fmtSigned(analytic.design.noProgrammeChange)} points</strong>
        </p>
        <p>
          <span>Hoped-for effect of the programme</span>
          <strong>{fmtSigned(analytic.tau)} points</strong>
        </p>
      </div>
      <p className="verdict-lead" data-testid="verdict-lead">
        People picked for {side === 'below' ? 'low' : 'high'} scores were, on average, partly {side === 'below' ? 'unlucky' : 'lucky'} on the day they
        were measured; measured again, their scores drift back toward the population mean even if nothing is done. So the pre–post change is expected
        to shift the estimated effect by <strong data-testid="verdict-bias">{fmtSigned(m.regressionArtefact)} points</strong>
        {!tauZero && m.regressionArtefactShare !== null && <>, {fmtPct(Math.abs(m.regressionArtefactShare), 0)} of the hoped-for effect</>}: this regression-toward-the-mean
        artefact {VERDICT_WORDS[m.verdict].sentence}
      </p>
      <GrowthGapPart m={m} tauZero={tauZero} />
    </>
  );
}

/**
 * The growth gap as its own part of the shift (core's growthGap, its share,
 * and the net), and core's plain sentence when it offsets the artefact.
 */
function GrowthGapPart({ m, tauZero }: { m: AnalyticAnalysis; tauZero: boolean }) {
  if (m.growthGap === 0) return null;
  return (
    <p className="verdict-growth" data-testid="verdict-growth">
      The growth gap you assumed adds <strong>{fmtSigned(m.growthGap)} points</strong>
      {!tauZero && m.growthGapShare !== null && <> ({fmtPct(Math.abs(m.growthGapShare), 0)} of the effect)</>}; together the estimate is expected to
      shift by <strong data-testid="verdict-net">{fmtSigned(m.bias)} points</strong> ({fmtSigned(m.biasSD)} posttest SD).{' '}
      {m.growthGapNote && <strong data-testid="verdict-offset">{m.growthGapNote}</strong>}
    </p>
  );
}

/**
 * The sample size for the target power, beside it (core's requiredNPerGroup),
 * or core's note that more people do not help a biased analysis; and what
 * "per group" counts (core's requiredNCounts).
 */
function RequiredN({ m, analytic, targetPower }: { m: AnalyticAnalysis; analytic: AnalyticResults; targetPower: number }) {
  if (!m.feasible && m.requiredNNote === null) return null;
  return (
    <li data-testid="verdict-required-n">
      At the target power of <strong>{fmtPct(targetPower, 0)}</strong>:{' '}
      {m.requiredNNote !== null ? (
        <>
          <strong data-testid="verdict-required-n-value">{m.requiredNNote}</strong>.
        </>
      ) : m.requiredNPerGroup === null ? (
        <>
          <strong data-testid="verdict-required-n-value">no sample size reaches it</strong>.
        </>
      ) : (
        <>
          <strong data-testid="verdict-required-n-value">{fmtInt(m.requiredNPerGroup)} per group</strong> needed.{' '}
          {analytic.requiredNCounts && <span className="verdict-per-group">{analytic.requiredNCounts}</span>}
        </>
      )}
    </li>
  );
}

/**
 * The headline: the artefact expected from the planned matching beside the
 * hoped-for effect, what it does to the conclusion, the false-positive rate
 * if the programme does nothing and the power with the artefact. Every
 * number comes from analysePlan.
 */
export function VerdictPanel() {
  const analytic = useMeanwardStore(selectAnalytic);
  const stale = useMeanwardStore(selectAnalyticStale);
  const plan = useMeanwardStore(selectValidPlan);
  // A typed value waiting for the field to be left (or typing to pause): these figures are about to change.
  const pending = useMeanwardStore((s) => s.draftPending);
  if (!analytic) {
    return (
      <section className="verdict" aria-labelledby="verdict-heading">
        <h2 id="verdict-heading">Verdict</h2>
        <p>Complete the plan on the left to see what matching on this pretest would do.</p>
      </section>
    );
  }
  const m = requireAnalysis(analytic.analyses, headlineAnalysisId(plan));
  const words = VERDICT_WORDS[m.verdict];
  const alphaPct = fmtPct(plan.analysis.alpha, 0);
  const tauZero = analytic.tau === 0;
  const oneGroup = analytic.design.shape === 'one-group';
  const selection = analytic.design.kind === 'selection';
  const clusters = analytic.clusters;
  const clusterLevel = clusters?.level === 'clusters';
  const matchedOn = clusterLevel ? 'clusters’ observed pretest means' : MATCHED_ON[analytic.matchingDistance ?? 'pretest'];
  return (
    <section
      className={`verdict verdict-${m.verdict}${stale ? ' is-stale' : ''}${pending ? ' is-pending' : ''}`}
      aria-labelledby="verdict-heading"
      aria-busy={pending || undefined}
      data-pending={pending || undefined}
      data-testid="verdict"
      data-verdict={m.verdict}
      data-basis={m.basis}
    >
      <h2 id="verdict-heading">
        Verdict: {oneGroup ? 'the pre–post change' : 'the planned matching'} <span className="verdict-word">{words.heading}</span>
      </h2>
      {stale && (
        <p className="stale-banner" role="status">
          Out of date: these results are for the last complete plan. Fix the marked fields to update them.
        </p>
      )}
      <DesignNote design={analytic.design} />
      {oneGroup ? (
        <OneGroupLead m={m} analytic={analytic} plan={plan} />
      ) : (
        <>
          <p className="verdict-lead" data-testid="verdict-lead">
            Matching on {matchedOn} is expected to shift the estimated effect by{' '}
            <strong data-testid="verdict-bias">{fmtSigned(m.regressionArtefact)} points</strong> ({fmtSigned(m.regressionArtefactSD)} posttest SD)
            {m.growthGap !== 0 && <>, the growth gap apart</>}
            {tauZero ? (
              <> when the hoped-for effect is zero.</>
            ) : (
              <>
                , which is <strong>{fmtPct(m.regressionArtefactShare === null ? null : Math.abs(m.regressionArtefactShare), 0)}</strong> of the hoped-for
                effect of {fmtSigned(analytic.tau)} points.
              </>
            )}{' '}
            This regression-toward-the-mean artefact {words.sentence}
          </p>
          <GrowthGapPart m={m} tauZero={tauZero} />
        </>
      )}
      <ul className="verdict-facts">
        <li data-testid="verdict-basis">
          Expected estimate from {oneGroup ? 'the pre–post change' : 'the matched comparison'}: <strong>{fmtSigned(m.expectedEstimate)} points</strong> (true effect{' '}
          {fmtSigned(analytic.tau)}
          {m.basis === 'planned-procedure' ? (
            <>
              ; for the procedure as planned, from a quick simulation, Monte Carlo SE {fmt(m.expectedEstimateMCSE)}; the formula for unlimited pools and
              exact matching gives {fmtSigned(m.formulaEstimate)})
            </>
          ) : oneGroup ? (
            <>; from the formula for this population and rule)</>
          ) : (
            <>; from the formula for unlimited pools and exact matching, until the quick simulation of the planned procedure is in)</>
          )}
          .
        </li>
        {m.feasible ? (
          <>
            <li>
              If the programme did nothing, {oneGroup ? 'the pre–post change' : 'a matched comparison'} would be significant in <strong data-testid="verdict-fpr">{fmtPct(m.falsePositiveRate)}</strong>{' '}
              of studies (the nominal rate is {alphaPct}).
            </li>
            {!tauZero && (
              <li>
                Power to detect the hoped-for effect: <strong data-testid="verdict-power">{fmtPct(m.power, 0)}</strong> with the artefact,{' '}
                {fmtPct(m.powerWithoutBias, 0)} without it
                {m.wrongSignRate !== null && m.wrongSignRate >= 0.001 && (
                  <>; chance of a significant result in the wrong direction {fmtPct(m.wrongSignRate)}</>
                )}
                .
              </li>
            )}
          </>
        ) : (
          <li data-testid="verdict-infeasible">
            <strong>The planned matching is not feasible.</strong> {m.infeasibleReason}
          </li>
        )}
        <li data-testid="verdict-tolerability" data-tolerable={m.tolerability.tolerable}>
          {m.tolerability.reason}
        </li>
        {!tauZero && <RequiredN m={m} analytic={analytic} targetPower={plan.analysis.targetPower ?? DEFAULT_TARGET_POWER} />}
        {!oneGroup && (
          <li data-testid="verdict-why">
            {analytic.model.pretestGap === 0 ? (
              <>
                Why so small: the groups start level on the pretest, so regression toward the mean pulls both groups&rsquo; matched members the same way
                (Kelley). Any artefact left comes from other differences between the groups.
              </>
            ) : (
              clusterLevel ? (
              <>
                Why: matched clusters share an observed mean, but each cluster&rsquo;s true mean is pulled back toward its own group&rsquo;s mean
                (Kelley, with the cluster mean&rsquo;s reliability λ), so part of the {fmt(Math.abs(analytic.model.pretestGap), 1)}-point pretest gap
                between the groups survives matching.
              </>
              ) : (
              <>
                {(analytic.matchingDistance ?? 'pretest') === 'pretest' ? (
                  <>Why: matched people share an observed score, but each person&rsquo;s true score is pulled back toward their own group&rsquo;s mean (Kelley)</>
                ) : (
                  <>
                    Why: matched people are close on {MATCHED_ON[analytic.matchingDistance ?? 'pretest']}, which is built from fallible observed measurements, so
                    each person&rsquo;s true pretest score is still pulled back toward their own group&rsquo;s mean (Kelley)
                  </>
                )}
                , so part of the {fmt(Math.abs(analytic.model.pretestGap), 1)}-point pretest gap between the groups survives matching.
                {selection && <> Which analyses this touches depends on what the rule looked at: see the table below.</>}
              </>
              )
            )}
          </li>
        )}
      </ul>
      {clusters && <ClusterFacts c={clusters} m={m} targetPower={plan.analysis.targetPower ?? DEFAULT_TARGET_POWER} />}
      {analytic.unmeasuredBias && (plan.covariates?.length ?? 0) > 0 && <UnmeasuredPart u={analytic.unmeasuredBias} tauZero={tauZero} />}
      <p className="caution" role="note">
        <strong>A planning aid, not a verdict on your study.</strong> These figures hold under the stated assumptions (normal scores, linear
        relations, the reliability and correlations you entered{clusters ? ', equal cluster sizes and the ICCs you entered' : ''}). They do not replace advice from a statistician or review by an ethics board.
      </p>
    </section>
  );
}
