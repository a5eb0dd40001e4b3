import type { AnalyticAnalysis, AnalyticResults, ArtefactVerdict } from './analyticResults';
import { ANALYSIS_DESCRIPTIONS } from './analysisDescriptions';
import { headlineAnalysisId, studyDesign } from './design/studyDesign';
import type { AnalysisId, Plan } from './plan';
import { PLANNING_CAUTION } from './planningCaution';
import { presentAnalyses } from './presentAnalyses';
import { procedureBasisNote } from './procedureBasisNote';

/**
 * How a figure in the methods text is to be written (formatting only; the
 * renderers in src/report/methodsTextRender.ts turn each kind into the same
 * string the screen shows).
 */
export type MethodsFigureKind =
  /** Points, 2 decimals: "2.50". */
  | 'points'
  /** Signed points: "−2.00", "+0.50". */
  | 'signed-points'
  /** A reliability or correlation, 3 decimals without the leading zero: ".750". */
  | 'reliability'
  /** A probability or rate as a percentage, 1 decimal: "83.1%". */
  | 'probability'
  /** A share as a whole percentage: "80%". */
  | 'share'
  /** A whole number with separators: "1,200". */
  | 'count'
  /** A value the researcher typed, written with its own digits. */
  | 'input';

/**
 * One number in the methods text, with the dotted path it was read from
 * ("analytic.analyses.matchedDifference.bias", "plan.analysis.alpha",
 * "simulation.matching.meanMatchedProgramme"), so a test can check that
 * every figure is the core's or the engine's own, never recomputed.
 */
export interface MethodsFigure {
  value: number;
  kind: MethodsFigureKind;
  source: string;
}

/** Running text: plain words and figures, in order. */
export type MethodsPiece = string | MethodsFigure;

export interface MethodsParagraph {
  /** A short heading, e.g. "Design and matching". */
  heading: string;
  pieces: MethodsPiece[];
}

/** One work cited: the in-text form and the full entry. */
export interface MethodsReference {
  /** In-text form as it appears in the paragraphs, e.g. "Thorndike, 1942". */
  citation: string;
  /** Reference-list entry (APA-like). */
  entry: string;
}

/**
 * A methods section in structured form, so every renderer (screen, Markdown,
 * Word) writes the same content.
 */
export interface MethodsText {
  title: string;
  paragraphs: MethodsParagraph[];
  /** The planning caution (PLANNING_CAUTION), always present. */
  caution: string;
  /** Works cited in the paragraphs, in order of first citation. */
  references: MethodsReference[];
}

/**
 * The simulated figures the methods text reads: a structural subset of the
 * engine's SimulationResult (src/sim/types.ts), so core does not import the engine.
 */
export interface MethodsSimulationFigures {
  seed: number;
  replications: number;
  partial?: true;
  analyses: Partial<Record<AnalysisId, { feasible?: boolean; meanEstimate?: number; meanEstimateMCSE?: number; rejectionRate?: number }>>;
  matching: { meanMatchedProgramme: number; discardedProgrammeShare: number };
}

/** Works the methods text may cite (volumes and pages from memory: check them before submitting). */
const WORKS = {
  thorndike: {
    citation: 'Thorndike, 1942',
    entry: 'Thorndike, R. L. (1942). Regression fallacies in the matched groups experiment. Psychometrika, 7, 85–102.',
  },
  campbell: {
    citation: 'Campbell & Erlebacher, 1970',
    entry:
      'Campbell, D. T., & Erlebacher, A. (1970). How regression artifacts in quasi-experimental evaluations can mistakenly make compensatory education look harmful. In J. Hellmuth (Ed.), Compensatory education: A national debate (Vol. 3). Brunner/Mazel.',
  },
  lord: {
    citation: 'Lord, 1960',
    entry: 'Lord, F. M. (1960). Large-sample covariance analysis when the control variable is fallible. Journal of the American Statistical Association, 55, 307–321.',
  },
  porter: {
    citation: 'Porter, 1967',
    entry: 'Porter, A. C. (1967). The effects of using fallible variables in the analysis of covariance (Doctoral dissertation). University of Wisconsin.',
  },
  kelley: { citation: 'Kelley, 1947', entry: 'Kelley, T. L. (1947). Fundamentals of statistics. Harvard University Press.' },
  cochranRubin: {
    citation: 'Cochran & Rubin, 1973',
    entry: 'Cochran, W. G., & Rubin, D. B. (1973). Controlling bias in observational studies: A review. Sankhyā, Series A, 35, 417–446.',
  },
  rosenbaumRubin: {
    citation: 'Rosenbaum & Rubin, 1985',
    entry:
      'Rosenbaum, P. R., & Rubin, D. B. (1985). Constructing a control group using multivariate matched sampling methods that incorporate the propensity score. The American Statistician, 39, 33–38.',
  },
  welch: {
    citation: 'Welch, 1947',
    entry: 'Welch, B. L. (1947). The generalization of "Student\'s" problem when several different population variances are involved. Biometrika, 34, 28–35.',
  },
  cohen: {
    citation: 'Cohen, 1988',
    entry: 'Cohen, J. (1988). Statistical power analysis for the behavioral sciences (2nd ed.). Lawrence Erlbaum.',
  },
  barnett: {
    citation: 'Barnett et al., 2005',
    entry:
      'Barnett, A. G., van der Pols, J. C., & Dobson, A. J. (2005). Regression to the mean: What it is and how to deal with it. International Journal of Epidemiology, 34, 215–220.',
  },
  goldberger: {
    citation: 'Goldberger, 1972',
    entry: 'Goldberger, A. S. (1972). Selection bias in evaluating treatment effects (Discussion paper). Institute for Research on Poverty, University of Wisconsin.',
  },
  kish: { citation: 'Kish, 1965', entry: 'Kish, L. (1965). Survey sampling. Wiley.' },
  bliese: {
    citation: 'Bliese, 2000',
    entry:
      'Bliese, P. D. (2000). Within-group agreement, non-independence, and reliability. In K. J. Klein & S. W. J. Kozlowski (Eds.), Multilevel theory, research, and methods in organizations. Jossey-Bass.',
  },
  bellMcCaffrey: {
    citation: 'Bell & McCaffrey, 2002',
    entry: 'Bell, R. M., & McCaffrey, D. F. (2002). Bias reduction in standard errors for linear regression with multi-stage samples. Survey Methodology, 28, 169–181.',
  },
  cronbach: {
    citation: 'Cronbach, 1951',
    entry: 'Cronbach, L. J. (1951). Coefficient alpha and the internal structure of tests. Psychometrika, 16, 297–334.',
  },
  feldt: {
    citation: 'Feldt, 1965',
    entry: 'Feldt, L. S. (1965). The approximate sampling distribution of Kuder-Richardson reliability coefficient twenty. Psychometrika, 30, 357–370.',
  },
} as const satisfies Record<string, MethodsReference>;

type WorkKey = keyof typeof WORKS;

/** What each verdict means, as a clause after "the expected artefact". */
const VERDICT_WORDS: Record<ArtefactVerdict, string> = {
  negligible: 'stays within the share of the effect the plan tolerates',
  hides: 'would hide part of the hoped-for effect',
  reverses: 'would reverse the sign of the hoped-for effect',
  inflates: 'would make the programme look better than it is',
  invents: 'would produce a difference although the hoped-for effect is zero',
};

/**
 * A methods section for a proposal or pre-registration, in plain academic
 * English, written from a plan and its results: the design (how people got
 * into the programme, clusters), matching, the assumed reliability and where
 * it came from (plan.provenance), the expected regression-toward-the-mean
 * artefact of each analysis and how the planned analysis deals with it, power,
 * and the works cited. Every figure is read from `analytic` (src/core), the
 * plan, or `simulation` (src/sim); nothing is recomputed here. The planning
 * caution (PLANNING_CAUTION) is always included. References: Thorndike (1942),
 * Campbell & Erlebacher (1970), Lord (1960), Porter (1967) and those the design calls for.
 *
 * @param plan a valid plan (validatePlan), the one `analytic` was computed from.
 * @param analytic analysePlan(plan) or analysePlannedProcedure(plan).
 * @param simulation optional full simulation of the same plan.
 * @returns paragraphs of text and figures, the caution and the references.
 * @example methodsText(demoPlan(), analysePlan(demoPlan())).paragraphs[0].heading // "Design and matching"
 */
export function methodsText(plan: Plan, analytic: AnalyticResults, simulation?: MethodsSimulationFigures | null): MethodsText {
  const cited: WorkKey[] = [];
  const cite = (...keys: WorkKey[]): string => {
    for (const k of keys) if (!cited.includes(k)) cited.push(k);
    return `(${keys.map((k) => WORKS[k].citation).join('; ')})`;
  };
  const paragraphs: MethodsParagraph[] = [
    designParagraph(plan, analytic, cite),
    reliabilityParagraph(plan, analytic, cite),
    artefactParagraph(plan, analytic, cite),
    powerParagraph(plan, analytic, simulation ?? null, cite),
  ];
  return {
    title: plan.title,
    paragraphs,
    caution: PLANNING_CAUTION,
    references: cited.map((k) => WORKS[k]),
  };
}

type Cite = (...keys: WorkKey[]) => string;

const fig = (value: number, kind: MethodsFigureKind, source: string): MethodsFigure => ({ value, kind, source });
const input = (value: number, source: string): MethodsFigure => fig(value, 'input', `plan.${source}`);
const res = (value: number, kind: MethodsFigureKind, source: string): MethodsFigure => fig(value, kind, `analytic.${source}`);

function designParagraph(plan: Plan, r: AnalyticResults, cite: Cite): MethodsParagraph {
  const d = studyDesign(plan);
  const p: MethodsPiece[] = [];
  const prog = plan.groups.programme;
  const comp = plan.groups.comparison;
  if (d.kind === 'selection' && d.shape === 'one-group') {
    p.push(`This is a one-group pre–post study of people selected from ${plan.population?.label ?? 'one population'} (`, input(plan.population?.poolSize ?? 0, 'population.poolSize'), ' people). ');
  } else {
    p.push(
      `The study compares ${prog.label} (pool of `, input(prog.poolSize, 'groups.programme.poolSize'),
      `) with ${comp.label} (pool of `, input(comp.poolSize, 'groups.comparison.poolSize'),
      ') in a non-randomised two-group design. ',
    );
  }
  p.push(`${r.design.rule} ${r.design.meaning} `);
  if (r.design.selectedShare !== null) p.push('The rule is expected to select ', res(r.design.selectedShare, 'share', 'design.selectedShare'), ' of the population. ');
  if (r.clusters !== undefined) {
    const c = r.clusters;
    p.push(
      'People sit in clusters of ', res(c.size.programme, 'count', 'clusters.size.programme'), ' (programme) and ',
      res(c.size.comparison, 'count', 'clusters.size.comparison'), ' (comparison); there are ',
      res(c.clustersPerGroup.programme, 'count', 'clusters.clustersPerGroup.programme'), ' programme and ',
      res(c.clustersPerGroup.comparison, 'count', 'clusters.clustersPerGroup.comparison'),
      ` comparison clusters, and the posttest is taken by ${c.cohort === 'same' ? 'the people who sat the pretest' : 'a new cohort of the same clusters'}. `,
      'With a pretest ICC of ', res(c.pretestICC, 'reliability', 'clusters.pretestICC'), ' and a posttest ICC of ',
      res(c.posttestICC, 'reliability', 'clusters.posttestICC'), ', the design effect on the posttest is ',
      res(c.designEffect.posttest, 'points', 'clusters.designEffect.posttest'), ` ${cite('kish')}. `,
    );
  }
  const matched = r.analyses.matchedDifference;
  if (matched !== undefined) {
    const m = plan.matching;
    const unit = r.clusters?.level === 'clusters' ? 'cluster' : 'member';
    const ratio = m.ratio === 1 ? 'one comparison partner' : `${m.ratio} comparison partners`;
    const how = m.method === 'nearest' ? 'the nearest available' : 'drawn at random from those';
    const order = m.replacement
      ? 'with replacement'
      : `without replacement, programme ${unit}s choosing ${m.order === 'lowest-first' ? 'lowest score first' : m.order === 'highest-first' ? 'highest score first' : 'in random order'}`;
    p.push(
      `Each programme ${unit} will be matched to ${ratio.replace('partner', unit === 'cluster' ? 'cluster' : 'partner')} (${how} within a caliper of `, input(m.caliper, 'matching.caliper'),
      ` ${caliperUnit(plan, r)}) on ${matchingBasis(plan, r, cite)}, ${order} ${cite('cochranRubin')}. `,
      'About ', res(matched.nProgramme, 'count', 'analyses.matchedDifference.nProgramme'), ' programme members are expected to find partners. ',
    );
  }
  return { heading: 'Design and matching', pieces: p };
}

function matchingBasis(plan: Plan, r: AnalyticResults, cite: Cite): string {
  if (r.clusters !== undefined) return r.clusters.level === 'clusters' ? "whole clusters' observed pretest means" : "people's own observed pretest scores";
  const distance = r.matchingDistance ?? plan.matching.distance ?? 'pretest';
  if (distance === 'propensity') return `the linear propensity score (logit) estimated from the measured covariates ${cite('rosenbaumRubin')}`;
  if (distance === 'mahalanobis') return 'the Mahalanobis distance on the measured covariates';
  return 'the observed pretest';
}

function caliperUnit(plan: Plan, r: AnalyticResults): string {
  if (r.clusters !== undefined) return r.clusters.level === 'clusters' ? 'SD of the cluster means' : "SD of the people's pretests";
  const distance = r.matchingDistance ?? plan.matching.distance ?? 'pretest';
  if (distance === 'propensity') return 'SD of the logit of the propensity score';
  if (distance === 'mahalanobis') return 'Mahalanobis-distance units';
  return 'SD of the pooled observed pretest';
}

function reliabilityParagraph(plan: Plan, r: AnalyticResults, cite: Cite): MethodsParagraph {
  const p: MethodsPiece[] = [];
  const t = plan.pretest;
  if (t.reliability !== undefined) {
    p.push('The pretest is assumed to have a reliability of ', input(t.reliability, 'pretest.reliability'));
    if (t.referenceSD !== undefined) p.push(' in a population whose SD is ', input(t.referenceSD, 'pretest.referenceSD'), ' points');
    p.push('. ');
  } else if (t.sem !== undefined) {
    p.push('The pretest is assumed to have a standard error of measurement (SEM) of ', input(t.sem, 'pretest.sem'), ' points. ');
  }
  const key = t.reliability !== undefined ? 'pretest.reliability' : 'pretest.sem';
  const prov = plan.provenance?.[key];
  if (prov === undefined || prov.source === 'entered') {
    p.push(prov !== undefined && prov.note.trim() !== '' ? `Source of this value: ${prov.note.trim()}. ` : 'Source of this value: [to be stated, e.g. the test manual or a pilot]. ');
  } else if (prov.source === 'pilot') {
    p.push(`The value was estimated from pilot data (${prov.note.trim()}) ${cite('cronbach')}`);
    if (prov.interval !== undefined) {
      p.push(
        ', with a ', fig(prov.interval.level, 'share', `plan.provenance.${key}.interval.level`), ' confidence interval from ',
        fig(prov.interval.lower, 'reliability', `plan.provenance.${key}.interval.lower`), ' to ',
        fig(prov.interval.upper, 'reliability', `plan.provenance.${key}.interval.upper`), ` ${cite('feldt')}`,
      );
    }
    p.push('. ');
  } else {
    p.push(`The value is that of an invented example (${prov.note.trim()}); replace it with the instrument's own figure. `);
  }
  if (r.design.shape === 'one-group') {
    p.push('Within the selected group this corresponds to a reliability of ', res(r.reliability.programme, 'reliability', 'reliability.programme'));
  } else {
    p.push(
      'Within the groups this corresponds to reliabilities of ', res(r.reliability.programme, 'reliability', 'reliability.programme'),
      ' (programme) and ', res(r.reliability.comparison, 'reliability', 'reliability.comparison'), ' (comparison)',
    );
  }
  p.push(', with an SEM of ', res(r.reliability.sem, 'points', 'reliability.sem'), ' points. ');
  if (r.reliability.clusterMean !== undefined) {
    p.push("A comparison cluster's observed mean has a reliability of ", res(r.reliability.clusterMean, 'reliability', 'reliability.clusterMean'), ` ${cite('bliese')}. `);
  }
  p.push(
    'The within-group pre–post correlation is assumed to be ', input(plan.outcome.prePostCorrelation, 'outcome.prePostCorrelation'),
    ' and the posttest SD ', input(plan.outcome.posttestSD, 'outcome.posttestSD'), ' points.',
  );
  return { heading: 'Pretest reliability', pieces: p };
}

function artefactParagraph(plan: Plan, r: AnalyticResults, cite: Cite): MethodsParagraph {
  const p: MethodsPiece[] = [];
  const oneGroup = r.design.shape === 'one-group';
  p.push(
    oneGroup
      ? `People selected for extreme baseline scores will on average score closer to the mean when measured again, with or without the programme ${cite('barnett')}. `
      : `When the groups differ in true pretest scores and the pretest is measured with error, matching or adjusting on it leaves an artefact of regression toward the mean ${cite('thorndike', 'campbell', 'kelley')}. `,
  );
  if (r.design.noProgrammeChange !== null) {
    p.push('Under the planning model the selected group is expected to change by ', res(r.design.noProgrammeChange, 'signed-points', 'design.noProgrammeChange'), ' points if the programme does nothing. ');
  }
  p.push('For a hoped-for effect of ', res(r.tau, 'signed-points', 'tau'), ' points, the expected artefact (bias) of each analysis is: ');
  const list = presentAnalyses(r.analyses);
  list.forEach(([id, a], i) => {
    p.push(`${lowerFirst(ANALYSIS_DESCRIPTIONS[id].name)} `, res(a.bias, 'signed-points', `analyses.${id}.bias`));
    if (a.biasShare !== null) p.push(' (', res(a.biasShare, 'share', `analyses.${id}.biasShare`), ' of the effect)');
    p.push(i === list.length - 1 ? '. ' : '; ');
  });
  if (plan.outcome.growthGap !== 0) {
    p.push('These include an assumed growth gap of ', input(plan.outcome.growthGap, 'outcome.growthGap'), ' points between the groups that is not the programme’s effect. ');
  }
  if (list.some(([id]) => id === 'correctedAncova')) {
    p.push(`The reliability-corrected ANCOVA assumes a reliability of `, input(plan.analysis.assumedReliability, 'analysis.assumedReliability'), ` ${cite('lord', 'porter')}. `);
  }
  if (list.some(([id]) => id === 'regressionDiscontinuity')) {
    p.push(`A regression discontinuity estimate is less precise than a randomised comparison of the same size ${cite('goldberger')}. `);
  }
  const head = headlineAnalysisId(plan);
  const h = r.analyses[head] as AnalyticAnalysis;
  p.push(
    `The planned primary analysis is the ${lowerFirst(ANALYSIS_DESCRIPTIONS[head].name)}, whose expected artefact ${VERDICT_WORDS[h.verdict]}. `,
    `${ANALYSIS_DESCRIPTIONS[head].assumption} `,
  );
  const least = leastBiased(list);
  if (least !== null && least !== head && h.verdict !== 'negligible') {
    p.push(`Of the analyses considered, the ${lowerFirst(ANALYSIS_DESCRIPTIONS[least].name)} is expected to be least affected. `);
  }
  const remedy = r.remedies[0];
  if (h.verdict !== 'negligible' && remedy !== undefined) {
    p.push(
      `To deal with the artefact, the design change ranked first is: ${lowerFirst(stripStop(remedy.title))}. ${remedy.summary} `,
      'With it the expected artefact is ', res(remedy.remainingBias, 'signed-points', 'remedies.0.remainingBias'), ' points',
    );
    if (remedy.remainingBiasShare !== null) p.push(' (', res(remedy.remainingBiasShare, 'share', 'remedies.0.remainingBiasShare'), ' of the effect)');
    p.push(`, assuming that ${lowerFirst(stripStop(remedy.assumption))}.`);
  }
  return { heading: 'Expected artefact and how the analysis deals with it', pieces: p };
}

function powerParagraph(plan: Plan, r: AnalyticResults, sim: MethodsSimulationFigures | null, cite: Cite): MethodsParagraph {
  const p: MethodsPiece[] = [];
  const head = headlineAnalysisId(plan);
  const h = r.analyses[head] as AnalyticAnalysis;
  const name = lowerFirst(ANALYSIS_DESCRIPTIONS[head].name);
  if (!h.feasible || h.power === null) {
    p.push(`Power cannot be given for the ${name}: ${h.infeasibleReason ?? 'it cannot be carried out with the planned pools.'} `);
  } else {
    p.push(
      'With a two-sided test at α = ', input(plan.analysis.alpha, 'analysis.alpha'), ` ${cite('welch')}, the ${name} has an expected standard error of `,
      res(h.se ?? 0, 'points', `analyses.${head}.se`), ' points and power of ', res(h.power, 'probability', `analyses.${head}.power`),
      ' to detect the hoped-for effect with the artefact included',
    );
    if (h.powerWithoutBias !== null) p.push(' (', res(h.powerWithoutBias, 'probability', `analyses.${head}.powerWithoutBias`), ' without it)');
    p.push(` ${cite('cohen')}. `);
    if (h.falsePositiveRate !== null) {
      p.push('If the programme had no effect, the artefact would make the test significant with probability ', res(h.falsePositiveRate, 'probability', `analyses.${head}.falsePositiveRate`), '. ');
    }
    const target = plan.analysis.targetPower;
    if (h.verdict !== 'negligible') {
      p.push('Because the expected artefact is not negligible, more people would not help: they would only make the biased estimate more precise. ');
    } else if (h.requiredNPerGroup !== null && target !== undefined) {
      p.push('Power of ', fig(target, 'probability', 'plan.analysis.targetPower'), ' would need about ', res(h.requiredNPerGroup, 'count', `analyses.${head}.requiredNPerGroup`), ' people per group. ');
    }
    if (h.minimumDetectableEffect !== undefined && h.minimumDetectableEffect !== null) {
      p.push('The minimum detectable effect is ', res(h.minimumDetectableEffect, 'signed-points', `analyses.${head}.minimumDetectableEffect`), ' points. ');
    }
  }
  if (r.analyses.personLevelAncova !== undefined) p.push(`Person-level analyses will use cluster-robust (CR2) standard errors ${cite('bellMcCaffrey')}. `);
  p.push(`${procedureBasisNote(r)} `);
  if (sim !== null) {
    const s = sim.analyses[head];
    p.push(
      `A Monte Carlo simulation of the planned procedure (`, fig(sim.replications, 'count', 'simulation.replications'),
      sim.partial === true ? ' replications, stopped early' : ' replications', ', seed ', fig(sim.seed, 'input', 'simulation.seed'), ')',
    );
    if (s !== undefined && s.feasible !== false && s.meanEstimate !== undefined && s.meanEstimateMCSE !== undefined && s.rejectionRate !== undefined) {
      p.push(
        ` gave a mean estimate of `, fig(s.meanEstimate, 'signed-points', `simulation.analyses.${head}.meanEstimate`),
        ' points (Monte Carlo SE ', fig(s.meanEstimateMCSE, 'points', `simulation.analyses.${head}.meanEstimateMCSE`),
        ') and a rejection rate of ', fig(s.rejectionRate, 'probability', `simulation.analyses.${head}.rejectionRate`),
        ` for the ${name}`,
      );
      if (head === 'matchedDifference') {
        p.push(
          '; on average ', fig(sim.matching.meanMatchedProgramme, 'count', 'simulation.matching.meanMatchedProgramme'),
          ' programme members were matched and ', fig(sim.matching.discardedProgrammeShare, 'share', 'simulation.matching.discardedProgrammeShare'),
          ' of the programme pool was discarded',
        );
      }
      p.push('.');
    } else {
      p.push(` found the ${name} could not be carried out with the planned pools.`);
    }
  }
  return { heading: 'Power', pieces: p };
}

/** The analysis with the smallest absolute expected artefact (first in display order on a tie), or null. */
function leastBiased(list: [AnalysisId, AnalyticAnalysis][]): AnalysisId | null {
  let best: [AnalysisId, AnalyticAnalysis] | null = null;
  for (const entry of list) if (best === null || Math.abs(entry[1].bias) < Math.abs(best[1].bias)) best = entry;
  return best === null ? null : best[0];
}

function lowerFirst(s: string): string {
  // Keep acronyms (ANCOVA) as they are.
  return /^[A-Z][a-z]/.test(s) ? s[0]!.toLowerCase() + s.slice(1) : s;
}

function stripStop(s: string): string {
  return s.trim().replace(/[.:]+$/, '');
}
