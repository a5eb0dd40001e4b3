import { useId, useMemo, useState } from 'react';
import { covariateFieldLabel } from '../state/covariateDraft';
import { draftUsesClusters, draftUsesSelection, FIELD_NAMES } from '../state/planDraft';
import { selectAnalytic, selectAnalyticStale, selectProblems, selectValidPlan } from '../state/selectors';
import { useMeanwardStore } from '../state/store';
import { CovariateEditor } from './CovariateEditor';
import { CheckField, ChoiceField, NumberField, TextField } from './fields';
import { moreProblemsLine, PROBLEMS_SHOWN } from '../core/capProblemList';
import { fmt, fmtInt, fmtPct, fmtR } from './format';
import { isClusterDesign, isSelectionDesign } from '../core/design/studyDesign';
import { selectionModel } from '../core/design/selectionModel';
import { ICC_PRESETS } from '../core/clusters/iccPresets';
import { MATCHING_WORDS, matchingChoices } from '../core/matchingWords';

/** Move keyboard focus to a field by its plan path (from the problem list). */
function focusField(path: string) {
  const el = document.querySelector<HTMLElement>(`[name="${CSS.escape(path)}"]`);
  el?.focus();
  el?.scrollIntoView({ block: 'center' });
}

/**
 * The plan form: every input of the plan, in up to eight numbered sections.
 * Sections and fields a design does not read are hidden, never cleared: the
 * draft keeps them, so switching back restores what was typed.
 */
export function PlanForm() {
  const problems = useMeanwardStore(selectProblems);
  const covariates = useMeanwardStore((s) => s.draft.covariates);
  const selection = useMeanwardStore((s) => draftUsesSelection(s.draft));
  const oneGroup = useMeanwardStore((s) => s.draft.design === 'one-group');
  const clustered = useMeanwardStore((s) => draftUsesClusters(s.draft));
  // Sections are numbered as shown.
  const shown = [
    'assignment',
    'groups',
    ...(selection ? [] : ['clusters']),
    'pretest',
    'outcome',
    ...(selection || clustered ? [] : ['covariates']),
    ...(oneGroup ? [] : ['matching']),
    'analysis',
    'simulation',
  ];
  const n = (key: string) => shown.indexOf(key) + 1;
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
      <AssignmentSection n={n('assignment')} />
      {selection ? <PopulationSection n={n('groups')} /> : <GroupsSection n={n('groups')} />}
      {!selection && <ClustersSection n={n('clusters')} />}
      <PretestSection n={n('pretest')} />
      <OutcomeSection n={n('outcome')} />
      {!selection && !clustered && <CovariatesSection n={n('covariates')} />}
      {!oneGroup && <MatchingSection n={n('matching')} />}
      <AnalysisSection n={n('analysis')} />
      <SimulationSection n={n('simulation')} />
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
  const clustered = useMeanwardStore((s) => draftUsesClusters(s.draft));
  // The column heading names the group on screen; screen readers hear it in each label.
  const who = <span className="visually-hidden">, {group} group</span>;
  return (
    <div className="group-column">
      <h3>{heading}</h3>
      <TextField path={`${p}.label`} label={<>Name{who}</>} hint="Shown in results and reports." />
      <NumberField path={`${p}.poolSize`} label={<>Pool size{who}</>} unit="people" step={10} min={2} inputMode="numeric" hint={clustered ? 'People, not clusters: a whole number of clusters (see “People in clusters” below).' : 'How many people are available to match from.'} />
      <NumberField path={`${p}.pretestMean`} label={<>Pretest mean{who}</>} unit="points" step={1} hint="Average observed pretest score." />
      <NumberField path={`${p}.pretestSD`} label={<>Pretest SD{who}</>} unit="points" step={0.5} min={0} hint="Spread of observed scores within this group." />
    </div>
  );
}

/** Study design and the rule that decided who got the programme. */
function AssignmentSection({ n }: { n: number }) {
  const rule = useMeanwardStore((s) => s.draft.assignment.rule);
  const basis = useMeanwardStore((s) => s.draft.assignment.basis);
  const selection = useMeanwardStore((s) => draftUsesSelection(s.draft));
  return (
    <Section
      title={`${n}. Who gets the programme`}
      intro="Which analysis is biased depends on how people got into the programme, so say what decided it."
    >
      <ChoiceField
        path="design"
        label="Study design"
        hint="Two groups: the programme group is compared with people who did not get it. One group: only the people selected are measured again, and their change is the result."
        options={[
          { value: 'two-groups', label: 'Two groups compared' },
          { value: 'one-group', label: 'One group, measured before and after' },
        ]}
      />
      <ChoiceField
        path="assignment.rule"
        label="How people got into the programme"
        hint="Existing groups: schools, clinics or volunteers that were already apart, by no rule you can write down. Cut-off: everyone on one side of a score got it. Probability: the chance of getting it rose gradually across the cut-off."
        options={[
          { value: 'existing-groups', label: 'Existing groups (no written rule)' },
          { value: 'cut-off', label: 'A cut-off on a score' },
          { value: 'probability', label: 'A chance that changes across a cut-off' },
        ]}
      />
      {selection && (
        <>
          <ChoiceField
            path="assignment.basis"
            label="What the rule looked at"
            hint="The pretest itself; a separate screening test of the same skill with its own measurement error; or staff judgement of real need, which no test captures (the true score)."
            options={[
              { value: 'pretest', label: 'The pretest' },
              { value: 'screener', label: 'A separate screening test' },
              { value: 'true-score', label: 'Staff judgement of real need (true score)' },
            ]}
          />
          {basis === 'screener' && (
            <NumberField
              path="assignment.screenerReliability"
              label="Screener reliability"
              unit="0 to 1"
              step={0.01}
              min={0.01}
              max={0.99}
              hint="Reliability of the screening test in this population, from its manual or a pilot."
            />
          )}
          <div className="field-pair">
            <NumberField
              path="assignment.cutOff"
              label="Cut-off"
              unit="points"
              step={1}
              hint="On the pretest's scale; a screener or judged need is taken to share the pretest's mean and scale."
            />
            <ChoiceField
              path="assignment.side"
              label="Who is selected"
              hint="Which side of the cut-off gets the programme."
              options={[
                { value: 'below', label: 'Those below it' },
                { value: 'above', label: 'Those above it' },
              ]}
            />
          </div>
          {rule === 'probability' && (
            <NumberField
              path="assignment.spread"
              label="Spread of the chance"
              unit="points"
              step={0.5}
              min={0.1}
              hint="How gradually the chance changes: one half at the cut-off, about one in six (or five in six) one spread away from it."
            />
          )}
        </>
      )}
    </Section>
  );
}

/** With a rule: the one population people are picked from, and what the rule forms from it. */
function PopulationSection({ n }: { n: number }) {
  const oneGroup = useMeanwardStore((s) => s.draft.design === 'one-group');
  const hasCovariates = useMeanwardStore((s) => s.draft.covariates.length > 0);
  const plan = useMeanwardStore(selectValidPlan);
  const analytic = useMeanwardStore(selectAnalytic);
  const stale = useMeanwardStore(selectAnalyticStale);
  const pending = useMeanwardStore((s) => s.draftPending);
  const p = 'population';
  // The groups core derived for the last complete plan (expected sizes and means), when it has a rule.
  const derived = isSelectionDesign(plan) ? plan.groups : null;
  const share = analytic?.design.selectedShare ?? null;
  return (
    <Section
      title={`${n}. The population`}
      intro="The one population the rule picks from, before anyone is selected. The groups follow from the rule."
    >
      <TextField path={`${p}.label`} label="Population name" hint="Who could have been selected, e.g. “Year 3 pupils in the district”." />
      <NumberField path={`${p}.poolSize`} label="Population size" unit="people" step={100} min={2} inputMode="numeric" hint="How many people the rule is applied to." />
      <NumberField path={`${p}.pretestMean`} label="Pretest mean in the population" unit="points" step={1} hint="Average observed pretest score before selection." />
      <NumberField path={`${p}.pretestSD`} label="Pretest SD in the population" unit="points" step={0.5} min={0} hint="Spread of observed pretest scores across the whole population." />
      <TextField path="selectionLabels.programme" label="Name of the selected group (optional)" hint="Leave empty to name it by the rule." />
      {!oneGroup && (
        <TextField path="selectionLabels.comparison" label="Name of the people not selected (optional)" hint="Leave empty for “Not selected”." />
      )}
      <div className={`derived${stale || pending ? ' is-stale' : ''}`} aria-live="polite" data-testid="derived-groups">
        <h3>What the rule forms</h3>
        {derived && analytic ? (
          <dl>
            <dt>{derived.programme.label}</dt>
            <dd>
              about {fmtInt(derived.programme.poolSize)} people{share !== null ? ` (${fmtPct(share, 0)})` : ''}, pretest mean {fmt(derived.programme.pretestMean, 1)}
            </dd>
            <dt>{derived.comparison.label}</dt>
            <dd>
              about {fmtInt(derived.comparison.poolSize)} people, pretest mean {fmt(derived.comparison.pretestMean, 1)}
            </dd>
          </dl>
        ) : (
          <p>Shown once the population and the rule are complete.</p>
        )}
        {stale && derived && <p className="stale-note">These are for the last complete plan.</p>}
      </div>
      {hasCovariates && (
        <p className="section-intro" data-testid="covariates-set-aside">
          The covariates you entered cannot yet be combined with a rule that forms the groups. They are kept, and come back if you choose existing groups.
        </p>
      )}
    </Section>
  );
}

function GroupsSection({ n }: { n: number }) {
  return (
    <Section title={`${n}. The two groups`} intro="The programme group is not randomised: say how its pretest scores differ from the comparison pool's.">
      <div className="group-columns">
        <GroupColumn group="programme" heading="Programme group" />
        <GroupColumn group="comparison" heading="Comparison pool" />
      </div>
    </Section>
  );
}

/** Whether people sit in clusters, how many are tested per cluster, the ICCs, who sits the posttest and what is matched. */
function ClustersSection({ n }: { n: number }) {
  const on = useMeanwardStore((s) => s.draft.clusters.inClusters);
  const hasCovariates = useMeanwardStore((s) => s.draft.covariates.length > 0);
  const level = useMeanwardStore((s) => s.draft.matching.level);
  const cohort = useMeanwardStore((s) => s.draft.clusters.cohort);
  return (
    <Section
      title={`${n}. People in clusters`}
      intro="Schools, classes, clinics or wards: when whole clusters are in the programme, a cluster's mean is what gets compared, and it is a fallible measure of the cluster."
    >
      <CheckField
        path="clusters.inClusters"
        label="People are sampled in clusters (schools, classes, clinics, wards)"
        hint="Both groups are then made of whole clusters; the pool sizes above still count people."
      />
      {on && (
        <>
          <NumberField
            path="clusters.size"
            label="People tested per cluster"
            unit="people"
            step={1}
            min={2}
            inputMode="numeric"
            hint="How many people in each cluster sit the test. Each pool size must be a whole number of clusters of this size."
          />
          <ClusterCounts />
          <NumberField
            path="clusters.pretestICC"
            label="Pretest ICC"
            unit="0 to 1"
            step={0.01}
            min={0.01}
            max={0.99}
            hint="Intraclass correlation of the observed pretest within a group: the share of its spread that lies between clusters."
          />
          <IccPresetPicker />
          <NumberField
            path="clusters.posttestICC"
            label="Posttest ICC (optional)"
            unit="0 to 1"
            step={0.01}
            min={0.01}
            max={0.99}
            hint="The same for the observed posttest in the comparison group; leave empty to use the pretest ICC."
          />
          <ChoiceField
            path="clusters.cohort"
            label="Who sits the posttest"
            hint="A new cohort is typical when schools are compared on last year's results: the cluster mean then measures the cluster, not the people who will be measured again."
            options={[
              { value: 'same', label: 'The same people, retested' },
              { value: 'new', label: 'A new cohort of the same clusters' },
            ]}
          />
          <ChoiceField
            path="matching.level"
            label="What is matched"
            hint={
              level === 'people' && cohort === 'new'
                ? 'Matching people needs the same people at the posttest: with a new cohort, match clusters on their means.'
                : 'Whole clusters on their observed pretest means, or people across clusters on their own pretests.'
            }
            options={[
              { value: 'clusters', label: 'Clusters, on their observed means' },
              { value: 'people', label: 'People across clusters, on their own pretests' },
            ]}
          />
          {hasCovariates && (
            <p className="section-intro" data-testid="covariates-set-aside-clusters">
              The covariates you entered cannot yet be combined with clusters. They are kept, and come back if you switch clusters off.
            </p>
          )}
        </>
      )}
    </Section>
  );
}

/** How many clusters each pool makes (core's cluster summary for the last complete plan). */
function ClusterCounts() {
  const plan = useMeanwardStore(selectValidPlan);
  const analytic = useMeanwardStore(selectAnalytic);
  const stale = useMeanwardStore(selectAnalyticStale);
  const pending = useMeanwardStore((s) => s.draftPending);
  const c = isClusterDesign(plan) ? analytic?.clusters : undefined;
  return (
    <div className={`derived${stale || pending ? ' is-stale' : ''}`} aria-live="polite" data-testid="cluster-counts">
      <h3>What the pools make</h3>
      {c ? (
        <dl>
          <dt>{plan.groups.programme.label}</dt>
          <dd data-testid="cluster-count-programme">
            {fmtInt(plan.groups.programme.poolSize)} people = {fmtInt(c.clustersPerGroup.programme)} clusters of {fmtInt(c.size.programme)}
          </dd>
          <dt>{plan.groups.comparison.label}</dt>
          <dd data-testid="cluster-count-comparison">
            {fmtInt(plan.groups.comparison.poolSize)} people = {fmtInt(c.clustersPerGroup.comparison)} clusters of {fmtInt(c.size.comparison)}
          </dd>
          <dt>Reliability of a cluster&rsquo;s mean (λ)</dt>
          <dd data-testid="derived-cluster-lambda">{fmtR(c.clusterMeanReliability.comparison, 3)}</dd>
        </dl>
      ) : (
        <p>Shown once the pool sizes are whole numbers of clusters and the plan is complete.</p>
      )}
      {stale && c && <p className="stale-note">These are for the last complete plan.</p>}
    </div>
  );
}

/** Typical ICCs (core's ICC_PRESETS) offered as starting values, each with where it came from. */
function IccPresetPicker() {
  const [chosen, setChosen] = useState(ICC_PRESETS[0]?.id ?? '');
  const apply = useMeanwardStore((s) => s.applyIccPreset);
  const id = useId();
  const preset = ICC_PRESETS.find((p) => p.id === chosen);
  return (
    <div className="field icc-presets" data-testid="icc-presets">
      <label htmlFor={id} className="field-label">
        Typical ICCs to start from
      </label>
      <div className="field-input-row">
        <select id={id} value={chosen} onChange={(e) => setChosen(e.target.value)} aria-describedby={`${id}-src`}>
          {ICC_PRESETS.map((p) => (
            <option key={p.id} value={p.id}>
              {p.label}: {fmtR(p.icc, 2)}
            </option>
          ))}
        </select>
      </div>
      <div className="icc-preset-buttons">
        <button type="button" onClick={() => apply('clusters.pretestICC', chosen)}>
          Use as pretest ICC
        </button>
        <button type="button" onClick={() => apply('clusters.posttestICC', chosen)}>
          Use as posttest ICC
        </button>
      </div>
      <p id={`${id}-src`} className="field-hint">
        {preset ? (
          <>
            {preset.conditioning === 'unconditional'
              ? 'Of raw scores, which is what the ICCs here describe. '
              : 'Of scores adjusted for a pretest: what is left between schools after a person-level adjustment, shown for comparison. '}
            Source: {preset.source}. A starting value: replace it with one for your own population.
          </>
        ) : null}
      </p>
    </div>
  );
}

function PretestSection({ n }: { n: number }) {
  const selection = useMeanwardStore((s) => draftUsesSelection(s.draft));
  const plan = useMeanwardStore(selectValidPlan);
  // With a rule, the pretest is described in the whole population: reliability inside a group the rule
  // cut out of it is not a reliability (a cut on the pretest narrows its observed spread below the true one).
  const population = useMemo(() => (isSelectionDesign(plan) ? selectionModel(plan).population : null), [plan]);
  const mode = useMeanwardStore((s) => s.draft.pretest.mode);
  const setMode = useMeanwardStore((s) => s.setPretestMode);
  const analytic = useMeanwardStore(selectAnalytic);
  const stale = useMeanwardStore(selectAnalyticStale);
  const name = useId();
  return (
    <Section title={`${n}. The pretest`} intro="How precisely the pretest measures: a reliability (with the SD of the group it was estimated in) or its SEM.">
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
          <NumberField path="pretest.referenceSD" label="Reference SD (where the reliability was estimated)" unit="points" step={0.5} min={0} hint={`SD of the sample the reliability came from; leave empty to use the ${selection ? 'population' : 'comparison pool'}'s SD.`} />
        </>
      ) : (
        <NumberField path="pretest.sem" label="SEM (standard error of measurement)" unit="points" step={0.1} min={0} hint="Typical size of one person's measurement error, in test points." />
      )}
      <div className={`derived${stale ? ' is-stale' : ''}`} aria-live="polite">
        <h3>{population ? 'What follows for this population' : 'What follows for these groups'}</h3>
        {analytic && population ? (
          <dl>
            <dt>Reliability in the population</dt>
            <dd data-testid="derived-reliability-population">{fmtR(population.reliability, 3)}</dd>
            <dt>SEM</dt>
            <dd data-testid="derived-sem">{fmt(analytic.reliability.sem, 2)} points</dd>
          </dl>
        ) : analytic ? (
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

function OutcomeSection({ n }: { n: number }) {
  const selection = useMeanwardStore((s) => draftUsesSelection(s.draft));
  const oneGroup = useMeanwardStore((s) => s.draft.design === 'one-group');
  return (
    <Section title={`${n}. The outcome and the hoped-for effect`}>
      <NumberField
        path="outcome.posttestSD"
        label="Posttest SD"
        unit="points"
        step={0.5}
        min={0}
        hint={selection ? 'Spread of the outcome across the whole population, without the programme.' : 'Spread of the outcome within the comparison group.'}
      />
      <NumberField
        path="outcome.prePostCorrelation"
        label="Pre–post correlation"
        unit="−1 to 1"
        step={0.05}
        min={-0.99}
        max={0.99}
        hint={
          selection
            ? 'Correlation of pretest and outcome across the whole population, before selection (from earlier cohorts or the literature).'
            : 'Correlation of pretest and outcome within a group (from earlier cohorts or the literature).'
        }
      />
      <NumberField
        path="outcome.growthGap"
        label={oneGroup ? 'Change everyone shows anyway (not the programme)' : 'Growth gap (not caused by the programme)'}
        unit="points"
        step={0.5}
        hint={
          oneGroup
            ? 'How much the whole population would change between the two measurements without the programme (growth, season, practice); 0 if none.'
            : 'How much more the programme group would gain anyway (maturation, selection); 0 if none.'
        }
      />
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

function CovariatesSection({ n }: { n: number }) {
  return (
    <Section
      title={`${n}. Other covariates (optional)`}
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

function MatchingSection({ n }: { n: number }) {
  const selection = useMeanwardStore((s) => draftUsesSelection(s.draft));
  // With a rule, matching is on the pretest alone (the draft keeps another distance for existing groups).
  const typedDistance = useMeanwardStore((s) => s.draft.matching.distance);
  const clustered = useMeanwardStore((s) => draftUsesClusters(s.draft));
  const clusterLevel = useMeanwardStore((s) => (draftUsesClusters(s.draft) && s.draft.matching.level === 'clusters'));
  const distance = selection || clustered ? 'pretest' : typedDistance;
  const hasCovariates = useMeanwardStore((s) => s.draft.covariates.length > 0);
  // Core's suggestion when the caliper's number is now a Mahalanobis distance.
  const caliperSuggestion = useMeanwardStore((s) => s.analytic?.caliperSuggestion);
  const member = clusterLevel ? 'programme cluster' : 'programme member';
  return (
    <Section
      title={`${n}. The matching plan`}
      intro={
        clusterLevel
          ? 'Matching clusters on their observed pretest means: each programme cluster gets comparison clusters with a similar mean.'
          : distance === 'pretest'
          ? 'Matching on the observed pretest: each programme member gets comparison partners with a similar score.'
          : 'Matching on all measured variables at once: each programme member gets comparison partners who are close on the chosen distance.'
      }
    >
      {!selection && !clustered && (hasCovariates || distance !== 'pretest') && (
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
        label={MATCHING_WORDS.methodQuestion(clusterLevel)}
        hint="Among the candidates within the caliper: always the closest, or any one of them drawn at random."
        options={matchingChoices(MATCHING_WORDS.method[distance === 'pretest' ? 'pretest' : 'distance'])}
      />
      <NumberField
        path="matching.caliper"
        label="Caliper"
        unit={clusterLevel ? 'SDs of the cluster means' : (CALIPER_UNIT[distance] ?? CALIPER_UNIT.pretest)}
        step={0.05}
        min={0.01}
        hint={
          distance === 'propensity'
            ? 'How far apart partners may be: the largest allowed difference in the logit of the propensity score; 0.2 SD is a common choice (Austin 2011). Programme members with no partner this close are dropped.'
            : distance === 'mahalanobis'
              ? 'How far apart partners may be: the largest allowed Mahalanobis distance on the measured variables. Programme members with no partner this close are dropped.'
              : clusterLevel
              ? 'How far apart partners may be: the largest allowed difference between the observed pretest means of partner clusters. Programme clusters with no partner this close are dropped.'
              : 'How far apart partners may be: the largest allowed pretest difference. Programme members with no partner this close are dropped.'
        }
      />
      {distance === 'mahalanobis' && caliperSuggestion && (
        <p className="field-hint caliper-unit-note" data-testid="caliper-unit-note" role="note">
          {caliperSuggestion.note} Suggested caliper: <strong>{caliperSuggestion.value.toFixed(2)}</strong>.
        </p>
      )}
      <NumberField path="matching.ratio" label={MATCHING_WORDS.ratioLabel(clusterLevel)} unit="1 to 5" step={1} min={1} max={5} inputMode="numeric" hint={`How many comparison ${clusterLevel ? 'clusters' : 'people'} each ${member} is matched to.`} />
      <CheckField
        path="matching.replacement"
        label={MATCHING_WORDS.replacementQuestion(clusterLevel)}
        hint={
          clusterLevel
            ? 'Ticked (matching with replacement): more programme clusters find a partner, but some comparison clusters count twice.'
            : 'Ticked (matching with replacement): more programme members find a partner, but some comparison people count twice.'
        }
      />
      <ChoiceField
        path="matching.order"
        label={MATCHING_WORDS.orderQuestion}
        hint={`Matters when each comparison ${clusterLevel ? 'cluster' : 'person'} can be used only once: whoever picks first gets the closest partners.`}
        options={matchingChoices(MATCHING_WORDS.order)}
      />
    </Section>
  );
}

function AnalysisSection({ n }: { n: number }) {
  // A one-group study has no corrected ANCOVA: its assumed reliability is kept, not shown.
  const oneGroup = useMeanwardStore((s) => s.draft.design === 'one-group');
  return (
    <Section title={`${n}. The analysis`}>
      <NumberField path="analysis.alpha" label="Significance level (alpha, two-sided)" unit="0 to 0.5" step={0.01} min={0.001} max={0.5} hint="Usually 0.05." />
{!oneGroup && (
        <NumberField path="analysis.assumedReliability" label="Assumed reliability for the corrected ANCOVA" unit="0 to 1" step={0.01} min={0.01} max={0.99} hint="The reliability the analyst will plug into the correction; a wrong guess leaves some bias." />
      )}
      <NumberField path="analysis.tolerableBiasShare" label="Tolerable share of the effect" unit="0 to 1" step={0.05} min={0.01} max={1} hint="How large an artefact you could live with, as a share of the hoped-for effect (0.25 = a quarter)." />
      <NumberField path="analysis.targetPower" label="Target power" unit="0 to 1" step={0.05} min={0.5} max={0.99} hint="Used for the sample size needed; leave empty for 0.8." />
    </Section>
  );
}

function SimulationSection({ n }: { n: number }) {
  const autoRun = useMeanwardStore((s) => s.simulation.autoRun);
  const setAutoRun = useMeanwardStore((s) => s.setAutoRun);
  const id = useId();
  return (
    <Section title={`${n}. The simulation`} intro="A Monte Carlo check of the formulas with finite pools, the caliper and the matching order. Run it from the results panel.">
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
