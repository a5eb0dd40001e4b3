import { useId } from 'react';
import { covariateFieldLabel } from '../state/covariateDraft';
import { FIELD_NAMES } from '../state/planDraft';
import { selectAnalytic, selectAnalyticStale, selectProblems } from '../state/selectors';
import { useMeanwardStore } from '../state/store';
import { CovariateEditor } from './CovariateEditor';
import { CheckField, ChoiceField, NumberField, TextField } from './fields';
import { moreProblemsLine, PROBLEMS_SHOWN } from '../core/capProblemList';
import { fmt, fmtR } from './format';

/** Move keyboard focus to a field by its plan path (from the problem list). */
function focusField(path: string) {
  const el = document.querySelector<HTMLElement>(`[name="${CSS.escape(path)}"]`);
  el?.focus();
  el?.scrollIntoView({ block: 'center' });
}

/** The plan form: every input of the plan, in seven sections. */
export function PlanForm() {
  const problems = useMeanwardStore(selectProblems);
  const covariates = useMeanwardStore((s) => s.draft.covariates);
  const commitDraft = useMeanwardStore((s) => s.commitDraft);
  // Covariate fields and matrix cells are named by number ("Covariate 2 SD"); whole-list problems stay as messages.
  const fieldName = (field: string) =>
    FIELD_NAMES[field] ?? (/^covariate(s\.\d+\.\w+|Correlations\.\d+\.\d+)$/.test(field) ? covariateFieldLabel(field, covariates) : undefined);
  return (
    <form
      className="plan-form"
      aria-label="Study plan"
      onSubmit={(e) => e.preventDefault()}
      noValidate
      // A typed value becomes the plan when its field is left or Enter is pressed (or typing pauses).
      onBlur={commitDraft}
      onKeyDown={(e) => {
        if (e.key === 'Enter') commitDraft();
      }}
    >
      <h2 className="visually-hidden">Study plan</h2>
      <TextField path="title" label="Plan title" hint="A name for this plan; it appears on saved files and the PDF summary." />
      {problems.length > 0 && (
        <div className="form-summary" role="status">
          <strong>
            {problems.length === 1 ? 'One field needs attention' : `${problems.length} fields need attention`}
          </strong>
          ; the results on the right belong to the last complete plan until it is fixed.
          <ul>
            {problems.slice(0, PROBLEMS_SHOWN).map((p) =>
              fieldName(p.field) === undefined ? (
                <li key={p.field + p.message}>{p.message}</li>
              ) : (
                <li key={p.field}>
                  <button type="button" className="link-button" onClick={() => focusField(p.field)}>
                    {fieldName(p.field) ?? p.field}
                  </button>
                </li>
              ),
            )}
            {problems.length > PROBLEMS_SHOWN && <li>{moreProblemsLine(problems.length - PROBLEMS_SHOWN)}</li>}
          </ul>
        </div>
      )}
      <GroupsSection />
      <PretestSection />
      <OutcomeSection />
      <CovariatesSection />
      <MatchingSection />
      <AnalysisSection />
      <SimulationSection />
    </form>
  );
}

function Section({ title, intro, children }: { title: string; intro?: string; children: React.ReactNode }) {
  const id = useId();
  return (
    <fieldset className="form-section" aria-labelledby={id}>
      <legend id={id}>{title}</legend>
      {intro && <p className="section-intro">{intro}</p>}
      {children}
    </fieldset>
  );
}

function GroupColumn({ group, heading }: { group: 'programme' | 'comparison'; heading: string }) {
  const p = `groups.${group}`;
  // The column heading names the group on screen; screen readers hear it in each label.
  const who = <span className="visually-hidden">, {group} group</span>;
  return (
    <div className="group-column">
      <h3>{heading}</h3>
      <TextField path={`${p}.label`} label={<>Name{who}</>} hint="Shown in results and reports." />
      <NumberField path={`${p}.poolSize`} label={<>Pool size{who}</>} unit="people" step={10} min={2} inputMode="numeric" hint="How many people are available to match from." />
      <NumberField path={`${p}.pretestMean`} label={<>Pretest mean{who}</>} unit="points" step={1} hint="Average observed pretest score." />
      <NumberField path={`${p}.pretestSD`} label={<>Pretest SD{who}</>} unit="points" step={0.5} min={0} hint="Spread of observed scores within this group." />
    </div>
  );
}

function GroupsSection() {
  return (
    <Section title="1. The two groups" intro="The programme group is not randomised: say how its pretest scores differ from the comparison pool's.">
      <div className="group-columns">
        <GroupColumn group="programme" heading="Programme group" />
        <GroupColumn group="comparison" heading="Comparison pool" />
      </div>
    </Section>
  );
}

function PretestSection() {
  const mode = useMeanwardStore((s) => s.draft.pretest.mode);
  const setMode = useMeanwardStore((s) => s.setPretestMode);
  const analytic = useMeanwardStore(selectAnalytic);
  const stale = useMeanwardStore(selectAnalyticStale);
  const name = useId();
  return (
    <Section title="2. The pretest" intro="How precisely the pretest measures: a reliability (with the SD of the group it was estimated in) or its SEM.">
      <div className="mode-switch" role="radiogroup" aria-label="Describe the pretest's precision by">
        <label>
          <input type="radio" name={name} value="reliability" checked={mode === 'reliability'} onChange={() => setMode('reliability')} />
          Reliability
        </label>
        <label>
          <input type="radio" name={name} value="sem" checked={mode === 'sem'} onChange={() => setMode('sem')} />
          SEM (standard error of measurement)
        </label>
      </div>
      {mode === 'reliability' ? (
        <>
          <NumberField path="pretest.reliability" label="Reliability" unit="0 to 1" step={0.01} min={0.01} max={0.99} hint="From the test manual or a pilot, e.g. test–retest or internal consistency." />
          <NumberField path="pretest.referenceSD" label="Reference SD (where the reliability was estimated)" unit="points" step={0.5} min={0} hint="SD of the sample the reliability came from; leave empty to use the comparison pool's SD." />
        </>
      ) : (
        <NumberField path="pretest.sem" label="SEM (standard error of measurement)" unit="points" step={0.1} min={0} hint="Typical size of one person's measurement error, in test points." />
      )}
      <div className={`derived${stale ? ' is-stale' : ''}`} aria-live="polite">
        <h3>What follows for these groups</h3>
        {analytic ? (
          <dl>
            <dt>Within-group reliability, programme</dt>
            <dd data-testid="derived-reliability-programme">{fmtR(analytic.reliability.programme, 3)}</dd>
            <dt>Within-group reliability, comparison</dt>
            <dd data-testid="derived-reliability-comparison">{fmtR(analytic.reliability.comparison, 3)}</dd>
            <dt>SEM</dt>
            <dd data-testid="derived-sem">{fmt(analytic.reliability.sem, 2)} points</dd>
          </dl>
        ) : (
          <p>Shown once the plan is complete.</p>
        )}
        {stale && analytic && <p className="stale-note">These are for the last complete plan.</p>}
      </div>
    </Section>
  );
}

function OutcomeSection() {
  return (
    <Section title="3. The outcome and the hoped-for effect">
      <NumberField path="outcome.posttestSD" label="Posttest SD" unit="points" step={0.5} min={0} hint="Spread of the outcome within the comparison group." />
      <NumberField path="outcome.prePostCorrelation" label="Pre–post correlation" unit="−1 to 1" step={0.05} min={-0.99} max={0.99} hint="Correlation of pretest and outcome within a group (from earlier cohorts or the literature)." />
      <NumberField path="outcome.growthGap" label="Growth gap (not caused by the programme)" unit="points" step={0.5} hint="How much more the programme group would gain anyway (maturation, selection); 0 if none." />
      <div className="field-pair">
        <NumberField path="outcome.hypothesisedEffect" label="Hypothesised effect" step={0.05} hint="The programme effect the study hopes to detect." />
        <ChoiceField
          path="outcome.effectScale"
          label="Effect expressed in"
          hint="Raw posttest points or posttest SDs."
          options={[
            { value: 'points', label: 'posttest points' },
            { value: 'sd', label: 'posttest SD units' },
          ]}
        />
      </div>
    </Section>
  );
}

function CovariatesSection() {
  return (
    <Section
      title="4. Other covariates (optional)"
      intro="Variables besides the pretest that you will match or adjust on, each measured with its own error, and confounders you know of but will not measure."
    >
      <CovariateEditor />
    </Section>
  );
}

const CALIPER_UNIT = {
  pretest: 'SDs of the pooled pretest',
  propensity: 'SDs of the logit of the propensity score',
  mahalanobis: 'Mahalanobis-distance units',
} as const;

function MatchingSection() {
  const distance = useMeanwardStore((s) => s.draft.matching.distance);
  const hasCovariates = useMeanwardStore((s) => s.draft.covariates.length > 0);
  return (
    <Section
      title="5. The matching plan"
      intro={
        distance === 'pretest'
          ? 'Matching on the observed pretest: each programme member gets comparison partners with a similar score.'
          : 'Matching on all measured variables at once: each programme member gets comparison partners who are close on the chosen distance.'
      }
    >
      {(hasCovariates || distance !== 'pretest') && (
        <ChoiceField
          path="matching.distance"
          label="Match on"
          hint="The propensity score is the logit fitted on every measured variable. Covariates marked “match exactly” must agree whatever the distance; unmeasured covariates are never used."
          options={[
            { value: 'pretest', label: 'The observed pretest alone' },
            { value: 'propensity', label: 'Propensity score (measured variables)' },
            { value: 'mahalanobis', label: 'Mahalanobis distance (measured variables)' },
          ]}
        />
      )}
      <ChoiceField
        path="matching.method"
        label="Method"
        hint="Nearest score first, or a random partner among those within the caliper."
        options={[
          { value: 'nearest', label: distance === 'pretest' ? 'Nearest pretest score' : 'Nearest partner on the chosen distance' },
          { value: 'random-within-caliper', label: 'Random partner within the caliper' },
        ]}
      />
      <NumberField
        path="matching.caliper"
        label="Caliper"
        unit={CALIPER_UNIT[distance] ?? CALIPER_UNIT.pretest}
        step={0.05}
        min={0.01}
        hint={
          distance === 'propensity'
            ? 'Largest allowed difference in the logit of the propensity score; 0.2 SD is a common choice (Austin 2011). Programme members with no partner this close are dropped.'
            : distance === 'mahalanobis'
              ? 'Largest allowed Mahalanobis distance between partners on the measured variables; programme members with no partner this close are dropped.'
              : 'Largest allowed pretest difference between partners; programme members with no partner this close are dropped.'
        }
      />
      <NumberField path="matching.ratio" label="Ratio (partners per programme member)" unit="1 to 5" step={1} min={1} max={5} inputMode="numeric" hint="Comparison partners for each programme member." />
      <CheckField path="matching.replacement" label="Allow a comparison person to be reused (with replacement)" hint="Reuse keeps more programme members but repeats some comparison people." />
      <ChoiceField
        path="matching.order"
        label="Matching order"
        hint="Without replacement, who picks first matters: early members get the closest partners."
        options={[
          { value: 'random', label: 'Random order' },
          { value: 'lowest-first', label: 'Lowest pretest first' },
          { value: 'highest-first', label: 'Highest pretest first' },
        ]}
      />
    </Section>
  );
}

function AnalysisSection() {
  return (
    <Section title="6. The analysis">
      <NumberField path="analysis.alpha" label="Significance level (alpha, two-sided)" unit="0 to 0.5" step={0.01} min={0.001} max={0.5} hint="Usually 0.05." />
      <NumberField path="analysis.assumedReliability" label="Assumed reliability for the corrected ANCOVA" unit="0 to 1" step={0.01} min={0.01} max={0.99} hint="The reliability the analyst will plug into the correction; a wrong guess leaves some bias." />
      <NumberField path="analysis.tolerableBiasShare" label="Tolerable share of the effect" unit="0 to 1" step={0.05} min={0.01} max={1} hint="How large an artefact you could live with, as a share of the hoped-for effect (0.25 = a quarter)." />
      <NumberField path="analysis.targetPower" label="Target power" unit="0 to 1" step={0.05} min={0.5} max={0.99} hint="Used for the sample size needed; leave empty for 0.8." />
    </Section>
  );
}

function SimulationSection() {
  const autoRun = useMeanwardStore((s) => s.simulation.autoRun);
  const setAutoRun = useMeanwardStore((s) => s.setAutoRun);
  const id = useId();
  return (
    <Section title="7. The simulation" intro="A Monte Carlo check of the formulas with finite pools, the caliper and the matching order. Run it from the results panel.">
      <NumberField path="simulation.replications" label="Replications" unit="studies" step={500} min={100} inputMode="numeric" hint="Simulated studies; 2,000 gives figures precise to about ±1 percentage point." />
      <NumberField path="simulation.seed" label="Seed" step={1} min={0} inputMode="numeric" hint="The same plan and seed give the same simulated figures, bit for bit." />
      <div className="field field-check">
        <div className="field-input-row">
          <input id={id} type="checkbox" checked={autoRun} onChange={(e) => setAutoRun(e.target.checked)} aria-describedby={`${id}-hint`} />
          <label htmlFor={id} className="field-label">
            Re-run automatically after a pause in editing
          </label>
        </div>
        <p id={`${id}-hint`} className="field-hint">
          Starts a new run two seconds after the plan stops changing.
        </p>
      </div>
    </Section>
  );
}
