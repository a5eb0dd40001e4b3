import type { Plan } from '../core/plan';
import { validatePlan, type PlanCheck } from '../core/validatePlan';

/**
 * The plan with its keys in the file's fixed order (format, version, title,
 * groups, the optional design, assignment and population, pretest, outcome,
 * matching, analysis, simulation, then the optional covariates,
 * covariateCorrelations, clusters and provenance) and absent optional fields left out,
 * so the same plan always gives the same text. With a selection rule the
 * groups written are the ones the rule forms (expected sizes, means and SDs,
 * for a reader of the file; only their labels are read back).
 */
export function canonicalPlan(plan: Plan): Plan {
  const group = (g: Plan['groups']['programme']) => ({
    label: g.label,
    poolSize: g.poolSize,
    pretestMean: g.pretestMean,
    pretestSD: g.pretestSD,
  });
  const pretest: Plan['pretest'] = {};
  if (plan.pretest.reliability !== undefined) pretest.reliability = plan.pretest.reliability;
  if (plan.pretest.referenceSD !== undefined) pretest.referenceSD = plan.pretest.referenceSD;
  if (plan.pretest.sem !== undefined) pretest.sem = plan.pretest.sem;
  const matching: Plan['matching'] = {
    method: plan.matching.method,
    caliper: plan.matching.caliper,
    ratio: plan.matching.ratio,
    replacement: plan.matching.replacement,
  };
  if (plan.matching.order !== undefined) matching.order = plan.matching.order;
  if (plan.matching.distance !== undefined) matching.distance = plan.matching.distance;
  if (plan.matching.level !== undefined) matching.level = plan.matching.level;
  const analysis: Plan['analysis'] = {
    alpha: plan.analysis.alpha,
    assumedReliability: plan.analysis.assumedReliability,
    tolerableBiasShare: plan.analysis.tolerableBiasShare,
  };
  if (plan.analysis.targetPower !== undefined) analysis.targetPower = plan.analysis.targetPower;
  const canonical: Plan = {
    format: plan.format,
    version: plan.version,
    title: plan.title,
    groups: { programme: group(plan.groups.programme), comparison: group(plan.groups.comparison) },
    ...(plan.design !== undefined ? { design: plan.design } : {}),
    ...(plan.assignment !== undefined ? { assignment: canonicalAssignment(plan.assignment) } : {}),
    ...(plan.population !== undefined
      ? {
          population: {
            label: plan.population.label,
            poolSize: plan.population.poolSize,
            pretestMean: plan.population.pretestMean,
            pretestSD: plan.population.pretestSD,
          },
        }
      : {}),
    pretest,
    outcome: {
      posttestSD: plan.outcome.posttestSD,
      prePostCorrelation: plan.outcome.prePostCorrelation,
      growthGap: plan.outcome.growthGap,
      hypothesisedEffect: plan.outcome.hypothesisedEffect,
      effectScale: plan.outcome.effectScale,
    },
    matching,
    analysis,
    simulation: { replications: plan.simulation.replications, seed: plan.simulation.seed },
  };
  if (plan.covariates !== undefined) {
    canonical.covariates = plan.covariates.map((c) => ({
      name: c.name,
      programmeMean: c.programmeMean,
      comparisonMean: c.comparisonMean,
      sd: c.sd,
      reliability: c.reliability,
      outcomeCorrelation: c.outcomeCorrelation,
      measured: c.measured,
      exact: c.exact,
    }));
  }
  if (plan.covariateCorrelations !== undefined) canonical.covariateCorrelations = plan.covariateCorrelations.map((row) => [...row]);
  if (plan.clusters !== undefined) {
    canonical.clusters = { size: plan.clusters.size, pretestICC: plan.clusters.pretestICC, cohort: plan.clusters.cohort };
    if (plan.clusters.posttestICC !== undefined) canonical.clusters.posttestICC = plan.clusters.posttestICC;
  }
  if (plan.provenance !== undefined) {
    // Keys sorted, so the same provenance always gives the same text; estimates only, never data rows.
    const provenance: NonNullable<Plan['provenance']> = {};
    for (const key of Object.keys(plan.provenance).sort()) {
      const entry = plan.provenance[key];
      if (!entry) continue;
      provenance[key] = { source: entry.source, note: entry.note };
      if (entry.interval) {
        provenance[key].interval = { lower: entry.interval.lower, upper: entry.interval.upper, level: entry.interval.level };
      }
    }
    canonical.provenance = provenance;
  }
  return canonical;
}

/** The assignment with its keys in a fixed order and absent fields left out. */
function canonicalAssignment(a: NonNullable<Plan['assignment']>): NonNullable<Plan['assignment']> {
  const out: NonNullable<Plan['assignment']> = { rule: a.rule };
  if (a.basis !== undefined) out.basis = a.basis;
  if (a.cutOff !== undefined) out.cutOff = a.cutOff;
  if (a.side !== undefined) out.side = a.side;
  if (a.spread !== undefined) out.spread = a.spread;
  if (a.screenerReliability !== undefined) out.screenerReliability = a.screenerReliability;
  return out;
}

/**
 * The plan file's text: JSON with a stable key order, two-space indent and a
 * trailing newline (the format "meanward-plan", version 1).
 * @example serializePlan(demoPlan()).startsWith('{\n  "format": "meanward-plan"') // true
 */
export function serializePlan(plan: Plan): string {
  return `${JSON.stringify(canonicalPlan(plan), null, 2)}\n`;
}

/**
 * Read a plan file's text: parse the JSON and validate it, reporting every
 * problem at once (see validatePlan). Text that is not JSON gets one message
 * with the line and column where reading stopped. Never throws, except MissingEngineError
 * when the plan's covariate or cluster checks are not registered (src/core/engineRegistry.ts).
 * @example parsePlanText('{').ok // false: "This file is not a plan file: it is not valid JSON ..."
 */
export function parsePlanText(text: string): PlanCheck {
  const body = text.replace(/^\uFEFF/, '');
  if (body.trim() === '') {
    return { ok: false, problems: [{ field: '', message: 'This file is empty: a plan file holds the plan as JSON text.' }] };
  }
  let data: unknown;
  try {
    data = JSON.parse(body);
  } catch (err) {
    const where = jsonErrorLocation(body, err);
    return {
      ok: false,
      problems: [{ field: '', message: `This file is not a plan file: it is not valid JSON${where}.` }],
    };
  }
  return validatePlan(data);
}

/** " (line L, column C)" for a JSON.parse error, from whatever the engine reports. */
function jsonErrorLocation(text: string, err: unknown): string {
  const msg = err instanceof Error ? err.message : String(err);
  const lc = /line (\d+) column (\d+)/i.exec(msg);
  if (lc) return ` (line ${lc[1]}, column ${lc[2]})`;
  const pos = /position (\d+)/i.exec(msg);
  let offset: number | undefined = pos ? Number(pos[1]) : undefined;
  if (offset === undefined && /end of (JSON )?(input|data)/i.test(msg)) offset = text.length;
  if (offset === undefined) return '';
  const before = text.slice(0, offset);
  const line = before.split('\n').length;
  const column = offset - before.lastIndexOf('\n');
  const ending = offset >= text.length ? ': the text ends too soon' : '';
  return ` (line ${line}, column ${column})${ending}`;
}
