import * as z from 'zod/mini';

/**
 * The plan file's schema (format "meanward-plan", version 1) and, beside it,
 * the plain-language rule for every field. The schema checks each field on
 * its own (type and range); checks that involve several fields (for example
 * a pre–post correlation that the pretest's reliability makes impossible)
 * live in validatePlan.ts. Messages never come from zod: validatePlan turns
 * each schema problem into "<field> must be <rule>; got <value>." using
 * FIELD_RULES below, so the rule text and the schema come from one place.
 *
 * Ranges are those a researcher would accept (common practice): SDs > 0,
 * reliabilities in (0, 1), |correlation| < 1, alpha in (0, 0.5),
 * caliper in (0, 5] SDs, pools of 2 to 100000 people. Quantities in test or
 * posttest points (means, SDs, SEM, gaps, effects) are kept within
 * PLAN_LIMITS.pointsMax in size and SDs at least PLAN_LIMITS.sdMin, so that
 * squares and products of them (variances, covariances) stay far inside the
 * range of double-precision numbers and every analysis can be computed.
 */

// No generated code: zod's fast path compiles parsers with `new Function`, and even its probe for
// whether that is allowed is reported as a violation under the page's Content-Security-Policy
// (script-src 'self', no 'unsafe-eval'). Validation speed is not a concern at plan size.
z.config({ jitless: true });

/** Plain-language name of a field and the rule it must meet (sentence fragments). */
export interface FieldRule {
  /** What the field is, e.g. "Pretest reliability". */
  label: string;
  /** What it must be, e.g. "between 0 and 1 (exclusive)". */
  rule: string;
}

/** The plan file's format name and the only version this build reads. */
export const PLAN_FORMAT = 'meanward-plan';
export const PLAN_VERSION = 1;

/** Limits shared by the schema, the messages and the documentation. */
export const PLAN_LIMITS = {
  titleMaxLength: 200,
  labelMaxLength: 80,
  poolSizeMin: 2,
  poolSizeMax: 100_000,
  caliperMax: 5,
  ratioMax: 5,
  /** The engine needs at least two replications to estimate its own Monte Carlo error. */
  replicationsMin: 2,
  replicationsMax: 100_000,
  seedMax: 4_294_967_295,
  effectSDMax: 3,
  /** With random choice within the caliper, wider than this is barely matching at all. */
  randomCaliperMax: 2,
  /** Covariates beyond the pretest. */
  covariatesMax: 8,
  covariateNameMaxLength: 60,
  provenanceNoteMaxLength: 300,
  /**
   * Largest size of a mean, gap or effect in test (or posttest, or covariate)
   * units, and largest SD or SEM. A million points covers every real scale
   * (IQ-type scores, percentages, reaction times in ms, incomes in thousands);
   * squares of it (1e12) and their products stay exact to many digits.
   */
  pointsMax: 1_000_000,
  /** Smallest SD or SEM: a millionth of a point (rescale the units when a scale is finer). */
  sdMin: 0.000_001,
  /** Smallest significance level: one in a million (normal quantiles stay accurate far beyond it). */
  alphaMin: 0.000_001,
  /** Narrowest caliper, in SDs: a ten-thousandth of an SD (far tighter than any matching in practice). */
  caliperMin: 0.0001,
  /** Lowest reliability the corrected ANCOVA may assume: it divides by it. */
  assumedReliabilityMin: 0.01,
  /**
   * Lowest screener reliability (checked by validatePlan across fields, since
   * the schema's own bound is "above 0"): a millionth. Far below it the
   * screener's SD runs to infinity in floating point and the analyses on it
   * cannot be computed.
   */
  screenerReliabilityMin: 0.000_001,
  /** People tested per cluster: at least 2 (a cluster of one has no within-cluster spread). */
  clusterSizeMin: 2,
  clusterSizeMax: 10_000,
  /** Fewest clusters per group: a group of one cluster has no between-cluster spread. */
  clustersPerGroupMin: 2,
} as const;

/** Bounds of a mean, gap or effect in points: within ±PLAN_LIMITS.pointsMax. */
const POINTS = { gte: -PLAN_LIMITS.pointsMax, lte: PLAN_LIMITS.pointsMax } as const;
/** Bounds of an SD or SEM in points: PLAN_LIMITS.sdMin to PLAN_LIMITS.pointsMax. */
const SD = { gte: PLAN_LIMITS.sdMin, lte: PLAN_LIMITS.pointsMax } as const;

/** Defaults filled in when a plan file leaves optional fields out. */
export const PLAN_DEFAULTS = {
  order: 'random',
  tolerableBiasShare: 0.25,
  targetPower: 0.8,
} as const;

/** Rules keyed by dotted path ("pretest.reliability"). Filled as the schema is built. */
export const FIELD_RULES: Record<string, FieldRule> = {};

/*
 * The schema is built with zod's smaller functional build (zod/mini): the planner checks every edit
 * on the page's first screen, and the full build would add about 20 kB of gzip there. Each helper
 * below does what the full build's method of the same name does.
 */

/** The schema with a description for the JSON Schema (the full build's `.describe`). */
function describe<T extends z.ZodMiniType>(schema: T, description: string): T {
  z.globalRegistry.add(schema, { description });
  return schema;
}

/** The schema, optional. */
const optional = <T extends z.ZodMiniType>(schema: T) => z.optional(schema);

/** The schema, filled with `value` when left out. */
const withDefault = <T extends z.ZodMiniType>(schema: T, value: z.output<T>) => z._default(schema, value as never);

interface NumberBounds {
  gt?: number;
  gte?: number;
  lt?: number;
  lte?: number;
  integer?: boolean;
}

function numberRuleText(b: NumberBounds): string {
  const lo = b.gt ?? b.gte;
  const hi = b.lt ?? b.lte;
  if (b.integer) {
    if (lo !== undefined && hi !== undefined) return `a whole number from ${lo} to ${hi}`;
    return 'a whole number';
  }
  if (lo !== undefined && hi !== undefined) {
    if (b.gt !== undefined && b.lt !== undefined) return `a number between ${lo} and ${hi} (exclusive)`;
    if (b.gte !== undefined && b.lte !== undefined) return `a number from ${lo} to ${hi}`;
    if (b.gt !== undefined) return `a number greater than ${lo} and at most ${hi}`;
    return `a number at least ${lo} and less than ${hi}`;
  }
  if (b.gt !== undefined) return `a number greater than ${b.gt}`;
  if (b.gte !== undefined) return `a number at least ${b.gte}`;
  return 'a number';
}

function num(path: string, label: string, description: string, b: NumberBounds = {}) {
  FIELD_RULES[path] = { label, rule: numberRuleText(b) };
  let s = z.number();
  if (b.integer) s = s.check(z.int());
  if (b.gt !== undefined) s = s.check(z.gt(b.gt));
  if (b.gte !== undefined) s = s.check(z.gte(b.gte));
  if (b.lt !== undefined) s = s.check(z.lt(b.lt));
  if (b.lte !== undefined) s = s.check(z.lte(b.lte));
  return describe(s, description);
}

function text(path: string, label: string, description: string, min: number, max: number) {
  FIELD_RULES[path] = {
    label,
    rule: min > 0 ? `text of ${min} to ${max} characters` : `text of at most ${max} characters`,
  };
  return describe(z.string().check(z.minLength(min), z.maxLength(max)), description);
}

function oneOf<const T extends readonly [string, ...string[]]>(path: string, label: string, description: string, values: T) {
  const listed = values.map((v) => `"${v}"`);
  const rule = listed.length === 2 ? `${listed[0]} or ${listed[1]}` : `one of ${listed.join(', ')}`;
  FIELD_RULES[path] = { label, rule };
  return describe(z.enum(values), description);
}

function section<T extends z.core.$ZodLooseShape>(path: string, label: string, description: string, shape: T) {
  FIELD_RULES[path] = { label, rule: 'a section of named fields' };
  return describe(z.object(shape), description);
}

function group(who: 'programme' | 'comparison') {
  const p = `groups.${who}`;
  const Who = who === 'programme' ? 'Programme group' : 'Comparison group';
  return section(p, `The ${who} group`, `The ${who} group's pool.`, {
    label: text(`${p}.label`, `${Who} name`, 'Plain-language name shown on screen and in reports.', 1, PLAN_LIMITS.labelMaxLength),
    poolSize: num(`${p}.poolSize`, `${Who} pool size`, 'Number of people available in this pool.', {
      integer: true,
      gte: PLAN_LIMITS.poolSizeMin,
      lte: PLAN_LIMITS.poolSizeMax,
    }),
    pretestMean: num(`${p}.pretestMean`, `${Who} pretest mean`, 'Mean of the observed pretest in this group, in test points.', POINTS),
    pretestSD: num(`${p}.pretestSD`, `${Who} pretest SD`, 'Within-group SD of the observed pretest, in test points.', SD),
  });
}

/** The zod schema of a version-1 plan file. Unknown extra fields are accepted and dropped. */
export const planSchema = z
  .object({
    format: describe(z.literal(PLAN_FORMAT), 'Always "meanward-plan".'),
    version: describe(z.literal(PLAN_VERSION), 'Plan file version; this build reads version 1.'),
    title: text('title', 'Title', 'A short title for the study plan.', 0, PLAN_LIMITS.titleMaxLength),
    groups: section(
      'groups',
      'The groups section',
      'The two pools: programme (non-randomised treated group) and comparison. Required unless a selection rule forms the groups from `population` (then only the labels are read).',
      {
        programme: group('programme'),
        comparison: group('comparison'),
      },
    ).apply(optional),
    design: oneOf('design', 'Study design', 'Two groups compared, or one group re-measured with no comparison group (default "two-groups").', [
      'two-groups',
      'one-group',
    ] as const).apply(optional),
    assignment: section('assignment', 'The assignment section', 'How people got into the programme (default: existing groups).', {
      rule: oneOf('assignment.rule', 'Assignment rule', 'Existing groups, a sharp cut-off, or a probability that changes smoothly across the cut-off.', [
        'existing-groups',
        'cut-off',
        'probability',
      ] as const),
      basis: oneOf('assignment.basis', 'What the rule looked at', 'The observed pretest, a separate screener, or the true score (judgement of real need).', [
        'pretest',
        'screener',
        'true-score',
      ] as const).apply(optional),
      cutOff: num('assignment.cutOff', 'Cut-off', "The cut-off on the pretest's scale (the screener and the true score share the pretest's mean).", POINTS).apply(optional),
      side: oneOf('assignment.side', 'Who is selected', 'Those below the cut-off, or those above it, go into the programme.', ['below', 'above'] as const).apply(optional),
      spread: num('assignment.spread', 'Spread of the selection probability', 'For "probability": the SD of the normal ogive, on the pretest\u2019s scale.', SD).apply(optional),
      screenerReliability: num('assignment.screenerReliability', 'Screener reliability', 'For basis "screener": its reliability in the population.', {
        gt: 0,
        lt: 1,
      }).apply(optional),
    }).apply(optional),
    population: section('population', 'The population section', 'With a selection rule or a one-group design: the one population people are picked from.', {
      label: text('population.label', 'Population name', 'Plain-language name of the population.', 1, PLAN_LIMITS.labelMaxLength),
      poolSize: num('population.poolSize', 'Population size', 'People in the population the rule picks from.', {
        integer: true,
        gte: PLAN_LIMITS.poolSizeMin,
        lte: PLAN_LIMITS.poolSizeMax,
      }),
      pretestMean: num('population.pretestMean', 'Population pretest mean', 'Mean of the observed pretest in the population, test points.', POINTS),
      pretestSD: num('population.pretestSD', 'Population pretest SD', 'SD of the observed pretest in the population, test points.', SD),
    }).apply(optional),
    pretest: section(
      'pretest',
      'The pretest section',
      'The pretest instrument: give either reliability (with optional referenceSD) or sem, not both.',
      {
        reliability: num(
          'pretest.reliability',
          'Pretest reliability',
          'Reliability of the pretest as reported for a population with SD referenceSD.',
          { gt: 0, lt: 1 },
        ).apply(optional),
        referenceSD: num(
          'pretest.referenceSD',
          'Reference SD of the pretest',
          'SD of the population the reliability was estimated in, test points (default: the comparison group pretest SD).',
          SD,
        ).apply(optional),
        sem: num('pretest.sem', 'Pretest SEM', 'Standard error of measurement of the pretest, test points.', SD).apply(optional),
      },
    ),
    outcome: section('outcome', 'The outcome section', 'The posttest (outcome) and the hoped-for effect.', {
      posttestSD: num('outcome.posttestSD', 'Posttest SD', 'Within-group SD of the posttest (comparison group), posttest points.', SD),
      prePostCorrelation: num(
        'outcome.prePostCorrelation',
        'Pre–post correlation',
        'Within-group correlation of observed pretest and posttest (comparison group).',
        { gt: -1, lt: 1 },
      ),
      growthGap: num(
        'outcome.growthGap',
        'Growth gap',
        'Programme-minus-comparison growth that is not the programme effect, posttest points.',
        POINTS,
      ),
      hypothesisedEffect: num('outcome.hypothesisedEffect', 'Hypothesised effect', 'The programme effect the study hopes to detect.', POINTS),
      effectScale: oneOf('outcome.effectScale', 'Effect scale', 'Whether the effect is in posttest points or posttest-SD units.', [
        'points',
        'sd',
      ] as const),
    }),
    matching: section('matching', 'The matching section', 'How comparison partners are chosen on the observed pretest.', {
      method: oneOf('matching.method', 'Matching method', 'Nearest partner, or a random partner within the caliper.', [
        'nearest',
        'random-within-caliper',
      ] as const),
      caliper: num('matching.caliper', 'Caliper', 'Caliper width in SDs of the pooled observed pretest.', {
        gte: PLAN_LIMITS.caliperMin,
        lte: PLAN_LIMITS.caliperMax,
      }),
      ratio: num('matching.ratio', 'Matching ratio', 'Comparison partners per programme member.', {
        integer: true,
        gte: 1,
        lte: PLAN_LIMITS.ratioMax,
      }),
      replacement: (() => {
        FIELD_RULES['matching.replacement'] = { label: 'Matching with replacement', rule: 'true or false' };
        return describe(z.boolean(), 'Whether a comparison member may serve more than one programme member.');
      })(),
      order: oneOf('matching.order', 'Matching order', 'Order in which programme members take partners (without replacement).', [
        'random',
        'lowest-first',
        'highest-first',
      ] as const).apply(withDefault, PLAN_DEFAULTS.order),
      distance: oneOf(
        'matching.distance',
        'Matching distance',
        'What closeness is measured on: the observed pretest, the linear propensity score on all measured covariates, or the Mahalanobis distance on them (default "pretest").',
        ['pretest', 'propensity', 'mahalanobis'] as const,
      ).apply(optional),
      level: oneOf(
        'matching.level',
        'Matching level',
        'With clusters: match whole clusters on their observed pretest means, or people across clusters on their own pretests (default "people").',
        ['clusters', 'people'] as const,
      ).apply(optional),
    }),
    analysis: section('analysis', 'The analysis section', 'Significance level, assumed reliability, tolerance and target power.', {
      alpha: num('analysis.alpha', 'Significance level (alpha)', 'Two-sided significance level.', { gte: PLAN_LIMITS.alphaMin, lt: 0.5 }),
      assumedReliability: num(
        'analysis.assumedReliability',
        'Assumed reliability for the corrected ANCOVA',
        'Reliability assumed by the reliability-corrected (Porter) ANCOVA.',
        { gte: PLAN_LIMITS.assumedReliabilityMin, lte: 1 },
      ),
      tolerableBiasShare: num(
        'analysis.tolerableBiasShare',
        'Tolerable bias share',
        'Share of the hypothesised effect an artefact may reach and still be tolerated.',
        { gt: 0, lte: 1 },
      ).apply(withDefault, PLAN_DEFAULTS.tolerableBiasShare),
      targetPower: num('analysis.targetPower', 'Target power', 'Power the study aims for when the required n is computed.', {
        gte: 0.5,
        lte: 0.99,
      }).apply(withDefault, PLAN_DEFAULTS.targetPower),
    }),
    simulation: section('simulation', 'The simulation section', 'Monte Carlo settings.', {
      replications: num('simulation.replications', 'Number of simulated replications', 'Monte Carlo replications.', {
        integer: true,
        gte: PLAN_LIMITS.replicationsMin,
        lte: PLAN_LIMITS.replicationsMax,
      }),
      seed: num('simulation.seed', 'Simulation seed', 'Random seed (unsigned 32-bit integer); same plan and seed, same numbers.', {
        integer: true,
        gte: 0,
        lte: PLAN_LIMITS.seedMax,
      }),
    }),
    clusters: section('clusters', 'The clusters section', 'People nested in clusters (schools, classes, clinics): both pools are made of whole clusters.', {
      size: num('clusters.size', 'Cluster size', 'People tested per cluster; each pool size must be a multiple of it.', {
        integer: true,
        gte: PLAN_LIMITS.clusterSizeMin,
        lte: PLAN_LIMITS.clusterSizeMax,
      }),
      pretestICC: num('clusters.pretestICC', 'Pretest ICC', 'Intraclass correlation of the observed pretest within a group.', { gt: 0, lt: 1 }),
      posttestICC: num('clusters.posttestICC', 'Posttest ICC', 'Intraclass correlation of the observed posttest within the comparison group (default: the pretest ICC).', {
        gt: 0,
        lt: 1,
      }).apply(optional),
      cohort: oneOf('clusters.cohort', 'Posttest cohort', 'Whether the posttest is taken by the same people as the pretest, or by a new cohort of the same clusters.', [
        'same',
        'new',
      ] as const),
    }).apply(optional),
    covariates: (() => {
      FIELD_RULES.covariates = { label: 'The covariates list', rule: `a list of at most ${PLAN_LIMITS.covariatesMax} covariates` };
      const c = 'covariates.*';
      FIELD_RULES[c] = { label: 'Covariate {n}', rule: 'a section of named fields' };
      return z
        .array(
          z
            .object({
              name: text(`${c}.name`, 'Covariate {n} name', 'Plain-language name of the covariate.', 1, PLAN_LIMITS.covariateNameMaxLength),
              programmeMean: num(`${c}.programmeMean`, 'Covariate {n} programme mean', 'Mean of the observed covariate in the programme group.', POINTS),
              comparisonMean: num(`${c}.comparisonMean`, 'Covariate {n} comparison mean', 'Mean of the observed covariate in the comparison group.', POINTS),
              sd: num(`${c}.sd`, 'Covariate {n} SD', 'Within-group SD of the observed covariate (both groups).', SD),
              reliability: num(`${c}.reliability`, 'Covariate {n} reliability', 'Within-group reliability; 1 for an error-free variable.', {
                gt: 0,
                lte: 1,
              }),
              outcomeCorrelation: num(
                `${c}.outcomeCorrelation`,
                'Covariate {n} correlation with the outcome',
                'Within-group correlation of the observed covariate with the outcome.',
                { gt: -1, lt: 1 },
              ),
              measured: (() => {
                FIELD_RULES[`${c}.measured`] = { label: 'Covariate {n} "measured"', rule: 'true or false' };
                return describe(z.boolean(), 'false: a known confounder that is never observed (never matched or adjusted on).');
              })(),
              exact: (() => {
                FIELD_RULES[`${c}.exact`] = { label: 'Covariate {n} "exact"', rule: 'true or false' };
                return describe(z.boolean(), 'true: a binary or categorical variable matched exactly (needs reliability 1).');
              })(),
            })
            .apply(describe, 'A covariate beyond the pretest.'),
        )
        .check(z.maxLength(PLAN_LIMITS.covariatesMax))
        .apply(optional)
        .apply(describe, 'Covariates beyond the pretest (the pretest is covariate 0).');
    })(),
    covariateCorrelations: (() => {
      FIELD_RULES.covariateCorrelations = {
        label: 'The covariate correlation matrix',
        rule: 'a square list of rows, pretest first, one row and column per covariate',
      };
      FIELD_RULES['covariateCorrelations.*'] = { label: 'Row {n} of the covariate correlation matrix', rule: 'a list of numbers' };
      FIELD_RULES['covariateCorrelations.*.*'] = {
        label: 'A covariate correlation',
        rule: 'a number from -1 to 1',
      };
      return z
        .array(z.array(z.number().check(z.gte(-1), z.lte(1))))
        .apply(optional)
        .apply(describe, 'Observed within-group correlations among the pretest and the covariates, pretest first (symmetric, ones on the diagonal).');
    })(),
    provenance: (() => {
      FIELD_RULES.provenance = { label: 'The provenance section', rule: 'a set of entries keyed by field path' };
      FIELD_RULES['provenance.*'] = { label: 'A provenance entry', rule: 'a section of named fields' };
      FIELD_RULES['provenance.*.source'] = { label: 'A provenance source', rule: '"entered", "example" or "pilot"' };
      FIELD_RULES['provenance.*.note'] = {
        label: 'A provenance note',
        rule: `text of at most ${PLAN_LIMITS.provenanceNoteMaxLength} characters`,
      };
      return z
        .record(
          z.string(),
          z.object({
            source: z.enum(['entered', 'example', 'pilot']).apply(describe, 'Where the value came from.'),
            note: z.string().check(z.maxLength(PLAN_LIMITS.provenanceNoteMaxLength)).apply(describe, 'Plain words shown beside the value.'),
            interval: z
              .object({
                lower: z.number(),
                upper: z.number(),
                level: z.number().check(z.gt(0), z.lt(1)),
              })
              .apply(optional)
              .apply(describe, 'Confidence interval of the estimate, when the source gives one.'),
          }),
        )
        .apply(optional)
        .apply(describe, 'Where values came from, keyed by dotted field path (e.g. "pretest.reliability"). Holds estimates only, never data rows.');
    })(),
  })
  .apply(describe, 'A Meanward study plan (version 1).');

/**
 * The plan file's JSON Schema (draft 2020-12), generated from planSchema; the
 * committed public/meanward-plan.schema.json must equal this.
 * @returns a plain JSON-serialisable object describing the input file (defaults optional).
 * @example planJsonSchema().properties.format // { const: "meanward-plan", ... }
 */
export function planJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(planSchema, { io: 'input' }) as unknown as {
    properties: { pretest: Record<string, unknown> };
  } & Record<string, unknown>;
  // Either reliability or SEM, not both: validatePlan checks this across fields;
  // the JSON Schema says it too, for editors that read it.
  schema.properties.pretest.oneOf = [
    { required: ['reliability'], not: { required: ['sem'] } },
    { required: ['sem'], not: { required: ['reliability'] } },
  ];
  return { ...schema, title: 'Meanward plan file, version 1' };
}
