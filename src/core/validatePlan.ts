import type { Plan } from './plan';
import { FIELD_RULES, type FieldRule, PLAN_FORMAT, PLAN_LIMITS, PLAN_VERSION, planSchema } from './planSchema';
import type { CovariateCheckInput } from './multivariate/covariateModelProblems';
import { formatApart } from './inputChecks';
import { showControlCharacters } from './visibleText';
import { derivedGroups } from './design/derivedGroups';
import { engine, MissingEngineError } from './engineRegistry';

/** One thing wrong with a plan: the field (dotted path) and a message a researcher understands. */
export interface PlanProblem {
  /** Dotted path, e.g. "pretest.reliability"; "" for the plan as a whole. */
  field: string;
  message: string;
}

export type PlanCheck = { ok: true; plan: Plan } | { ok: false; problems: PlanProblem[] };

/**
 * Check anything that claims to be a plan and report every problem at once.
 *
 * Field rules (type, range) come from planSchema; cross-field rules follow
 * classical test theory (Lord & Novick 1968): the SEM must be smaller than
 * each group's pretest SD, and an observed pre–post correlation cannot exceed
 * the square root of the pretest's within-group reliability (Spearman 1904).
 * With covariates, covariateModelProblems adds the checks that involve the
 * covariates, their correlation matrix and reliabilities (see there).
 * Unknown extra fields are ignored (forward compatibility); a different
 * format or version is reported alone, since the rest would be noise.
 * Defaults are filled in (matching.order "random", tolerableBiasShare 0.25,
 * targetPower 0.8).
 *
 * @param input parsed JSON (any value).
 * @returns { ok: true, plan } with defaults filled, or { ok: false, problems }.
 *   Never throws: should a check itself fail unexpectedly, the plan is
 *   refused with one plain message (no program text).
 * @example
 *   validatePlan({ ...demo, pretest: { reliability: 1.4 } }).problems[0].message
 *   // "Pretest reliability must be a number between 0 and 1 (exclusive); got 1.4."
 */
export function validatePlan(input: unknown): PlanCheck {
  try {
    return checkPlan(input);
  } catch (e) {
    // A plan whose covariate or cluster checks are not registered (src/core/engineRegistry.ts) is
    // not checked at all: the caller loads the engine and asks again (never a false message).
    if (e instanceof MissingEngineError) throw e;
    // Last resort: every value is range-checked first, so this is a fault of ours, not the plan's.
    return fail(
      '',
      'This plan could not be checked: one of its values made a check fail unexpectedly. Check values near the ends of their ranges (docs/plan-file.md lists them), and please report this plan.',
    );
  }
}

function checkPlan(input: unknown): PlanCheck {
  if (!isRecord(input)) {
    return fail('', `This is not a Meanward plan: a plan is a set of named fields, but this is ${describeKind(input)}.`);
  }
  if (input.format !== PLAN_FORMAT) {
    return fail(
      'format',
      input.format === undefined
        ? `This is not a Meanward plan: it has no "format" field (a plan file says "format": "${PLAN_FORMAT}").`
        : `This is not a Meanward plan: its "format" must be "${PLAN_FORMAT}"; got ${show(input.format)}.`,
    );
  }
  if (input.version !== PLAN_VERSION) {
    const v = input.version;
    const message =
      typeof v === 'number' && Number.isInteger(v) && v > PLAN_VERSION
        ? `This plan was written for version ${v} of the plan file, newer than this Meanward reads (version ${PLAN_VERSION}). Use a newer Meanward, or re-save the plan as version ${PLAN_VERSION}.`
        : `Plan file version must be ${PLAN_VERSION}; got ${show(v)}.`;
    return fail('version', message);
  }

  const problems: PlanProblem[] = [];
  const bad = new Set<string>();
  // With a selection rule the groups follow from the population and the rule: only their labels are read.
  const selection = isSelectionInput(input);
  const labels = selection ? groupLabels(input.groups) : null;
  const source: Record<string, unknown> = { ...input };
  if (selection) delete source.groups;
  const parsed = planSchema.safeParse(source);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const field = issue.path.map(String).join('.');
      if (bad.has(field)) continue; // one message per field
      bad.add(field);
      problems.push({ field, message: fieldMessage(field, valueAtPath(source, issue.path)) });
    }
  }
  problems.push(...(selection ? selectionProblems(source, bad) : groupsProblems(source, bad)));
  problems.push(...crossFieldProblems(source, bad, selection));
  problems.push(...clusterProblems(source, bad, selection));
  if (problems.length > 0 || !parsed.success) return { ok: false, problems };
  const plan = parsed.data as Plan;
  if (plan.clusters !== undefined) {
    // The two-level model itself: ICCs that contradict the reliability or the slope.
    const clusters = engine('clusters');
    try {
      clusters.clusterModel(plan);
    } catch (e) {
      if (e instanceof clusters.ClusterModelError) return fail(e.field, e.message);
      throw e;
    }
  }
  if (!selection) return { ok: true, plan };
  // The selection model itself: a rule that leaves too few people in a group, or inputs that contradict each other.
  try {
    plan.groups = derivedGroups(plan, labels);
  } catch (e) {
    return fail('assignment.cutOff', e instanceof Error ? e.message : String(e));
  }
  return { ok: true, plan };
}

/** Whether raw input asks for a selection rule or a one-group study (then `population` replaces `groups`). */
function isSelectionInput(input: Record<string, unknown>): boolean {
  const a = input.assignment;
  const rule = isRecord(a) ? a.rule : undefined;
  return rule === 'cut-off' || rule === 'probability' || input.design === 'one-group';
}

/** Labels a file gives its groups, kept when a selection rule derives the rest. */
function groupLabels(groups: unknown): { programme?: string; comparison?: string } {
  const label = (who: string): string | undefined => {
    const g = isRecord(groups) ? groups[who] : undefined;
    const l = isRecord(g) ? g.label : undefined;
    return typeof l === 'string' && l.trim() !== '' && l.length <= PLAN_LIMITS.labelMaxLength ? l : undefined;
  };
  return { programme: label('programme'), comparison: label('comparison') };
}

/** Without a selection rule the two groups must be given. */
function groupsProblems(input: Record<string, unknown>, bad: Set<string>): PlanProblem[] {
  if (input.groups !== undefined || bad.has('groups')) return [];
  return [
    {
      field: 'groups',
      message:
        'The groups section is missing: give the programme and comparison pools, or, if a rule decided who got the programme, give the rule (assignment) and the population it picked from.',
    },
  ];
}

/** The fields a selection rule needs, and what it cannot yet be combined with. */
function selectionProblems(input: Record<string, unknown>, bad: Set<string>): PlanProblem[] {
  const out: PlanProblem[] = [];
  const a = isRecord(input.assignment) ? input.assignment : undefined;
  const need = (field: string, why: string) => {
    if (bad.has(field)) return;
    if (valueAt(input, field) === undefined) out.push({ field, message: `${fieldRule(field)?.label ?? field} is missing; ${why}` });
  };
  if (input.design === 'one-group' && (a === undefined || a.rule === 'existing-groups')) {
    out.push({
      field: 'assignment.rule',
      message:
        'A one-group study needs the rule that selected its people: "cut-off" or "probability" (with basis, cutOff and side). With no selection at all, a pre–post change has no regression artefact to plan for.',
    });
    return out;
  }
  if (!bad.has('population') && input.population === undefined) {
    out.push({
      field: 'population',
      message: 'The population section is missing: with a selection rule, give the one population people are picked from (label, poolSize, pretestMean, pretestSD).',
    });
  }
  if (a !== undefined && !bad.has('assignment')) {
    need('assignment.basis', 'it must be "pretest", "screener" or "true-score".');
    need('assignment.cutOff', "it must be a number on the pretest's scale.");
    need('assignment.side', 'it must be "below" or "above".');
    if (a.rule === 'probability') need('assignment.spread', "a probability rule needs the spread of its ogive, a number greater than 0 on the pretest's scale.");
    if (a.basis === 'screener') need('assignment.screenerReliability', 'a rule on a screener needs its reliability, a number between 0 and 1 (exclusive).');
    // Far below a millionth the screener's SD is infinite in floating point: say so rather than fail later.
    const sr = a.screenerReliability;
    if (a.basis === 'screener' && typeof sr === 'number' && sr > 0 && sr < PLAN_LIMITS.screenerReliabilityMin && !bad.has('assignment.screenerReliability')) {
      out.push({
        field: 'assignment.screenerReliability',
        message: `Screener reliability must be at least ${PLAN_LIMITS.screenerReliabilityMin.toFixed(6)}: a screener that measures nothing but error cannot be modelled; got ${sr}.`,
      });
    }
  }
  if (Array.isArray(input.covariates) && input.covariates.length > 0) {
    out.push({
      field: 'covariates',
      message: 'Covariates cannot yet be combined with a selection rule or a one-group design: remove the covariates, or describe the groups as existing groups.',
    });
  }
  const distance = valueAt(input, 'matching.distance');
  if (distance !== undefined && distance !== 'pretest' && !bad.has('matching.distance')) {
    out.push({
      field: 'matching.distance',
      message: `With a selection rule, matching is on the observed pretest only; got ${show(distance)}. Set the matching distance to "pretest".`,
    });
  }
  return out;
}

/**
 * What a clusters section needs and what it cannot yet be combined with:
 * each pool a whole number (at least 2) of clusters; matching clusters needs
 * a clusters section, matching people needs the same people at posttest; no
 * selection rule, covariates or propensity/Mahalanobis distance yet.
 */
function clusterProblems(input: Record<string, unknown>, bad: Set<string>, selection: boolean): PlanProblem[] {
  const out: PlanProblem[] = [];
  const level = valueAt(input, 'matching.level');
  const clusters = input.clusters;
  if (clusters === undefined || bad.has('clusters')) {
    if (level === 'clusters' && clusters === undefined) {
      out.push({
        field: 'matching.level',
        message: 'Matching clusters needs a clusters section (size, pretestICC, cohort): without it there are no clusters to match. Add the clusters, or set the matching level to "people".',
      });
    }
    return out;
  }
  if (selection) {
    out.push({
      field: 'clusters',
      message: 'Clusters cannot yet be combined with a selection rule or a one-group design: remove the clusters section, or describe the groups as existing groups of clusters.',
    });
  }
  if (Array.isArray(input.covariates) && input.covariates.length > 0) {
    out.push({
      field: 'covariates',
      message: 'Covariates cannot yet be combined with clusters: remove the covariates, or remove the clusters section.',
    });
  }
  const distance = valueAt(input, 'matching.distance');
  if (distance !== undefined && distance !== 'pretest' && !bad.has('matching.distance')) {
    out.push({
      field: 'matching.distance',
      message: `With clusters, matching is on the observed pretest only (cluster means, or people's own scores); got ${show(distance)}. Set the matching distance to "pretest".`,
    });
  }
  const size = bad.has('clusters.size') ? undefined : valueAt(input, 'clusters.size');
  if (typeof size === 'number' && Number.isInteger(size) && !selection) {
    for (const who of ['programme', 'comparison'] as const) {
      const field = `groups.${who}.poolSize`;
      const pool = bad.has(field) ? undefined : valueAt(input, field);
      if (typeof pool !== 'number' || !Number.isInteger(pool)) continue;
      if (pool % size !== 0) {
        const below = Math.floor(pool / size) * size;
        out.push({
          field,
          message: `The ${who} pool size counts people and must be a whole number of clusters of ${size}; got ${pool} (${below > 0 ? `${below} or ${below + size}` : `${size}`} would do).`,
        });
      } else if (pool / size < PLAN_LIMITS.clustersPerGroupMin) {
        out.push({
          field,
          message: `The ${who} group needs at least ${PLAN_LIMITS.clustersPerGroupMin} clusters, or nothing can be said about how its clusters vary; got ${pool / size} (${pool} people in clusters of ${size}).`,
        });
      }
    }
    const ratio = valueAt(input, 'matching.ratio');
    const nC = valueAt(input, 'groups.comparison.poolSize');
    if (level === 'clusters' && typeof ratio === 'number' && typeof nC === 'number' && nC % size === 0 && ratio > nC / size) {
      out.push({
        field: 'matching.ratio',
        message: `Matching ratio must be at most the number of comparison clusters (${nC / size}) when clusters are matched; got ${ratio}.`,
      });
    }
  }
  const cohort = valueAt(input, 'clusters.cohort');
  if ((level === undefined || level === 'people') && cohort === 'new' && !bad.has('matching.level')) {
    out.push({
      field: 'matching.level',
      message:
        'Matching people needs the same people at the posttest, but the clusters section says a new cohort sits it: nobody who is matched would be measured again. Set the matching level to "clusters" (match schools on their means), or the cohort to "same".',
    });
  }
  return out;
}

/**
 * The rule for a dotted path. List items ("covariates.1.sd") use the rule
 * registered with "*" for the index ("covariates.*.sd"), and "{n}" in its
 * label becomes the item's 1-based number ("Covariate 2 SD").
 */
export function fieldRule(field: string): FieldRule | undefined {
  const direct = FIELD_RULES[field];
  if (direct) return direct;
  const indices: number[] = [];
  const generic = field
    .split('.')
    .map((part, i) => {
      if (/^\d+$/.test(part)) {
        indices.push(Number(part));
        return '*';
      }
      // provenance keys are dotted paths themselves: one star stands for the key
      return i === 1 && field.startsWith('provenance.') ? '*' : part;
    })
    .join('.');
  const rule = FIELD_RULES[generic] ?? (field.startsWith('provenance.') ? provenanceRule(field) : undefined);
  if (!rule) return undefined;
  return { ...rule, label: rule.label.replace('{n}', String((indices[0] ?? 0) + 1)) };
}

function provenanceRule(field: string): FieldRule | undefined {
  const last = field.split('.').pop() ?? '';
  return FIELD_RULES[`provenance.*.${last}`] ?? FIELD_RULES['provenance.*'];
}

/** The message for a field that failed its own rule. */
function fieldMessage(field: string, value: unknown): string {
  const rule = fieldRule(field);
  const label = rule?.label ?? `The field "${field}"`;
  const what = rule?.rule ?? 'valid';
  if (value === undefined) return `${label} is missing; it must be ${what}.`;
  if (rule?.rule === 'a section of named fields') return `${label} must be ${what}; got ${describeKind(value)}.`;
  if (typeof value === 'string' && what.startsWith('text')) return `${label} must be ${what}; got ${value.length} characters.`;
  return `${label} must be ${what}; got ${show(value)}.`;
}

function crossFieldProblems(input: Record<string, unknown>, bad: Set<string>, selection: boolean): PlanProblem[] {
  const out: PlanProblem[] = [];
  // A field's value for cross-checks, only when it passed its own rule.
  const ok = (field: string): number | undefined => {
    if (bad.has(field) || [...bad].some((b) => field.startsWith(`${b}.`))) return undefined;
    const v = valueAt(input, field);
    return typeof v === 'number' && Number.isFinite(v) ? v : undefined;
  };
  const present = (field: string) => valueAt(input, field) !== undefined;

  // Either reliability or SEM, not both, not neither.
  const pretestUsable = !bad.has('pretest');
  if (pretestUsable) {
    const hasRel = present('pretest.reliability');
    const hasSem = present('pretest.sem');
    if (hasRel && hasSem) {
      out.push({
        field: 'pretest',
        message: `Give the pretest either a reliability or an SEM, not both; got reliability ${show(valueAt(input, 'pretest.reliability'))} and SEM ${show(valueAt(input, 'pretest.sem'))}.`,
      });
    } else if (!hasRel && !hasSem) {
      out.push({
        field: 'pretest',
        message:
          'Give the pretest either a reliability (a number between 0 and 1, exclusive) or an SEM (in test points, from 0.000001 to 1000000); neither was given.',
      });
    }
  }

  // The SEM, given or derived, must be smaller than each group's pretest SD.
  // With a selection rule the pretest is described in the whole population (one SD for both checks).
  const sdP = ok(selection ? 'population.pretestSD' : 'groups.programme.pretestSD');
  const sdC = ok(selection ? 'population.pretestSD' : 'groups.comparison.pretestSD');
  let sem: number | undefined;
  let semField = 'pretest.sem';
  let semFrom = '';
  if (pretestUsable && present('pretest.sem') && !present('pretest.reliability')) {
    sem = ok('pretest.sem');
  } else if (pretestUsable && present('pretest.reliability') && !present('pretest.sem')) {
    const rel = ok('pretest.reliability');
    const ref = present('pretest.referenceSD') ? ok('pretest.referenceSD') : sdC;
    if (rel !== undefined && ref !== undefined) {
      sem = ref * Math.sqrt(1 - rel);
      semField = 'pretest.reliability';
      semFrom = ` (from reliability ${fmt(rel)} in a population with SD ${fmt(ref)})`;
    }
  }
  let rhoC: number | undefined;
  if (sem !== undefined) {
    const groups: Array<[string, number | undefined]> = [
      ['programme', sdP],
      ['comparison', sdC],
    ];
    for (const [who, sd] of selection ? groups.slice(1) : groups) {
      if (sd !== undefined && !(sem < sd)) {
        const [semText, sdText] = formatApart(sem, sd);
        out.push({
          field: semField,
          message: selection
            ? `The pretest's SEM must be smaller than the population's pretest SD, or the pretest would measure nothing but error; got an SEM of ${semText} points${semFrom} against a population SD of ${sdText}.`
            : `The pretest's SEM must be smaller than each group's pretest SD, or the pretest would measure nothing but error in that group; got an SEM of ${semText} points${semFrom} against the ${who} group's pretest SD of ${sdText}.`,
        });
      }
    }
    if (sdC !== undefined && sem < sdC) rhoC = 1 - (sem * sem) / (sdC * sdC);
  }

  // A correlation with a fallible pretest cannot exceed the root of its reliability.
  const r = ok('outcome.prePostCorrelation');
  if (r !== undefined && rhoC !== undefined && r * r > rhoC + 1e-12) {
    // Enough digits that the limit and the value never print alike (e.g. 0.866 vs 0.8663).
    const [limit, , got] = formatApart(Math.sqrt(rhoC), Math.abs(r), r);
    out.push({
      field: 'outcome.prePostCorrelation',
      message: `Pre–post correlation must be at most ${limit} in size with this pretest: a correlation with a fallible pretest cannot exceed the square root of its ${selection ? 'reliability' : 'within-group reliability'} (${fmt(rhoC)} in the ${selection ? 'population' : 'comparison group'}); got ${got}.`,
    });
  }

  // An effect in SD units beyond a few SDs is almost certainly a points value.
  const effect = ok('outcome.hypothesisedEffect');
  if (effect !== undefined && valueAt(input, 'outcome.effectScale') === 'sd' && Math.abs(effect) > PLAN_LIMITS.effectSDMax) {
    out.push({
      field: 'outcome.hypothesisedEffect',
      message: `Hypothesised effect in posttest-SD units must be between -${PLAN_LIMITS.effectSDMax} and ${PLAN_LIMITS.effectSDMax}; got ${formatApart(-PLAN_LIMITS.effectSDMax, PLAN_LIMITS.effectSDMax, effect)[2]}. If it is in posttest points, set the effect scale to "points".`,
    });
  }

  // Matching must be able to form at least one matched set.
  const ratio = ok('matching.ratio');
  const nC = ok('groups.comparison.poolSize');
  if (ratio !== undefined && nC !== undefined && ratio > nC) {
    out.push({
      field: 'matching.ratio',
      message: `Matching ratio must be at most the comparison pool size (${fmt(nC)} people), or not even one programme member can get their partners; got ${fmt(ratio)}.`,
    });
  }

  // Random choice within a very wide caliper is hardly matching at all.
  const caliper = ok('matching.caliper');
  if (
    caliper !== undefined &&
    valueAt(input, 'matching.method') === 'random-within-caliper' &&
    caliper > PLAN_LIMITS.randomCaliperMax
  ) {
    out.push({
      field: 'matching.caliper',
      message: `With a random partner within the caliper, the caliper must be at most ${PLAN_LIMITS.randomCaliperMax} SDs of the pretest, or partners are barely matched at all; got ${formatApart(PLAN_LIMITS.randomCaliperMax, caliper)[1]}.`,
    });
  }

  // Several covariates: the matrix, the reliabilities and the outcome correlations together.
  const covariates = input.covariates;
  if (!bad.has('covariates') && (Array.isArray(covariates) || present('covariateCorrelations'))) {
    const isBad = (field: string): boolean => [...bad].some((b) => field === b || field.startsWith(`${b}.`));
    const items = Array.isArray(covariates) ? covariates : [];
    const item = (j: number, key: string): unknown => {
      const c = items[j];
      return isBad(`covariates.${j}.${key}`) || !isRecord(c) ? undefined : c[key];
    };
    const num = (x: unknown): number | undefined => (typeof x === 'number' && Number.isFinite(x) ? x : undefined);
    const bool = (x: unknown): boolean | undefined => (typeof x === 'boolean' ? x : undefined);
    const rawMatrix = input.covariateCorrelations;
    const check: CovariateCheckInput = {
      covariates: items.map((_, j) => ({
        name: typeof item(j, 'name') === 'string' ? (item(j, 'name') as string) : undefined,
        sd: num(item(j, 'sd')),
        reliability: num(item(j, 'reliability')),
        outcomeCorrelation: num(item(j, 'outcomeCorrelation')),
        measured: bool(item(j, 'measured')),
        exact: bool(item(j, 'exact')),
      })),
      correlations: rawMatrix === undefined
          ? undefined
          : [...bad].some((b) => b === 'covariateCorrelations' || b.startsWith('covariateCorrelations.'))
            ? null
            : (rawMatrix as number[][]),
      pretestSD: { programme: sdP, comparison: sdC },
      sem,
      prePostCorrelation: r,
      poolSize: { programme: ok('groups.programme.poolSize'), comparison: nC },
      assumedReliability: ok('analysis.assumedReliability'),
    };
    out.push(...engine('covariates').covariateModelProblems(check));
  }
  return out;
}

function fail(field: string, message: string): PlanCheck {
  return { ok: false, problems: [{ field, message }] };
}

function isRecord(x: unknown): x is Record<string, unknown> {
  return typeof x === 'object' && x !== null && !Array.isArray(x);
}

/** The value at a path of keys (list items by index; provenance keys contain dots). */
function valueAtPath(root: unknown, path: readonly PropertyKey[]): unknown {
  let cur: unknown = root;
  for (const key of path) {
    if (Array.isArray(cur) && typeof key === 'number') cur = cur[key];
    else if (isRecord(cur)) cur = cur[String(key)];
    else return undefined;
  }
  return cur;
}

function valueAt(root: unknown, field: string): unknown {
  if (field === '') return root;
  let cur: unknown = root;
  for (const key of field.split('.')) {
    if (!isRecord(cur)) return undefined;
    cur = cur[key];
  }
  return cur;
}

function describeKind(x: unknown): string {
  if (x === null) return 'null';
  if (Array.isArray(x)) return 'a list';
  if (typeof x === 'string') return `the text ${show(x)}`;
  if (typeof x === 'number' || typeof x === 'boolean') return `the value ${show(x)}`;
  if (x === undefined) return 'nothing';
  return `a ${typeof x}`;
}

/** A received value, shown as the user typed it (text quoted, long text cut). */
function show(x: unknown): string {
  if (typeof x === 'string') return showControlCharacters(JSON.stringify(x.length > 40 ? `${x.slice(0, 40)}…` : x), 'json');
  // A non-finite number (possible in a plan built in memory, never in JSON) in plain words, not program text.
  if (typeof x === 'number') return Number.isFinite(x) ? String(x) : Number.isNaN(x) ? 'not a number' : x > 0 ? 'an infinitely large number' : 'an infinitely large negative number';
  if (x === null) return 'null';
  if (x === undefined) return 'nothing';
  if (Array.isArray(x)) return 'a list';
  if (typeof x === 'object') return 'a section of fields';
  return String(x);
}

function fmt(x: number): string {
  return Number.isInteger(x) ? String(x) : x.toFixed(3).replace(/0+$/, '').replace(/\.$/, '');
}
