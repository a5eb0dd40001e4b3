import stdNormalCdf from '@stdlib/stats-base-dists-normal-cdf';
import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { methodsText, type MethodsFigure, type MethodsText } from '../../src/core/methodsText';
import type { Plan } from '../../src/core/plan';
import { PLANNING_CAUTION } from '../../src/core/planningCaution';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { CLINIC_HIGH_READINGS, SCHOOLS_MATCHED_ON_MEANS, SCREENED_READING_SUPPORT } from '../../src/io/examplePlans';
import { formatMethodsFigure, methodsMarkdown, methodsPlainText } from '../../src/report/methodsTextRender';
import { simulatePlan } from '../../src/sim/simulatePlan';
import type { SimulationResult } from '../../src/sim/types';

/** A plan as the planner holds it after validation (selection plans get their derived groups). */
function valid(plan: Plan): Plan {
  const v = validatePlan(plan);
  if (!v.ok) throw new Error(`invalid test plan: ${JSON.stringify(v.problems)}`);
  return v.plan;
}

function figures(m: MethodsText): MethodsFigure[] {
  return m.paragraphs.flatMap((p) => p.pieces.filter((x): x is MethodsFigure => typeof x !== 'string'));
}

/** The value at a dotted path ("analytic.analyses.ancova.bias", "remedies.0.remainingBias"). */
function at(root: Record<string, unknown>, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o as Record<string, unknown> | undefined)?.[k], root);
}

/**
 * Every figure in the text is the very number core (or the engine, or the
 * plan) holds at the path it names: nothing recomputed. Exact equality.
 */
function expectFiguresFromResults(m: MethodsText, root: Record<string, unknown>): void {
  const figs = figures(m);
  expect(figs.length).toBeGreaterThan(8);
  for (const f of figs) {
    expect(Number.isFinite(f.value), f.source).toBe(true);
    expect(at(root, f.source), f.source).toBe(f.value);
  }
}

/** The caution sentence and the references: every in-text citation is listed, every listed work is cited. */
function expectCautionAndReferences(m: MethodsText): void {
  const text = methodsPlainText(m);
  expect(m.caution).toBe(PLANNING_CAUTION);
  expect(text).toContain('not a substitute for a statistician or an ethics board');
  expect(m.references.length).toBeGreaterThan(2);
  const body = m.paragraphs.map((p) => p.pieces.filter((x) => typeof x === 'string').join('')).join(' ');
  for (const r of m.references) {
    expect(body, r.citation).toContain(r.citation);
    // The entry starts with the first author's surname and gives the year (APA-like; common practice).
    expect(r.entry.startsWith(r.citation.split(/[ ,&]/)[0]!), r.entry).toBe(true);
    expect(r.entry).toContain(`(${r.citation.slice(-4)})`);
  }
  const inText = [...body.matchAll(/\(([^()]*\d{4}[^()]*)\)/g)].flatMap((x) => x[1]!.split('; '));
  for (const c of inText) expect(m.references.map((r) => r.citation), c).toContain(c);
}

/** The figure read from a path, as shown. */
function shown(m: MethodsText, source: string): string {
  const f = figures(m).find((x) => x.source === source);
  if (f === undefined) throw new Error(`no figure from ${source}`);
  return formatMethodsFigure(f);
}

describe('methods text for the demo (invented falls-prevention plan)', () => {
  const plan = demoPlan();
  const analytic = analysePlan(plan);
  const m = methodsText(plan, analytic);
  const text = methodsPlainText(m);

  it('every figure is the core result at its path; caution and references present', () => {
    expectFiguresFromResults(m, { analytic, plan });
    expectCautionAndReferences(m);
  });

  it('states the matched-difference artefact beta(1 - rho)Delta = −2.00 (Thorndike 1942 closed form, computed in REFERENCES: beta = .6·10/(10·.75) = .8, rho .75, gap −10)', () => {
    // Closed form, tolerance: the 2-decimal display.
    const beta = (0.6 * 10) / (10 * 0.75);
    const artefact = beta * (1 - 0.75) * (44 - 54);
    expect(artefact).toBeCloseTo(-2, 12);
    expect(shown(m, 'analytic.analyses.matchedDifference.bias')).toBe('−2.00');
    expect(text).toContain('matched post-test difference −2.00 (−80% of the effect)');
    // Gain score: (beta − 1)Delta = (0.8 − 1)(−10) = +2.00 (Campbell & Erlebacher 1970 form; computed).
    expect(shown(m, 'analytic.analyses.gainScore.bias')).toBe('+2.00');
  });

  it('says where the reliability came from, or that it is still to be stated', () => {
    expect(text).toContain('reliability of 0.75 in a population whose SD is 10 points');
    expect(text).toContain('to be stated');
  });

  it('a biased primary analysis gets no required n (more people do not help)', () => {
    expect(analytic.analyses.matchedDifference!.verdict).not.toBe('negligible');
    expect(figures(m).some((f) => f.source.endsWith('requiredNPerGroup'))).toBe(false);
    expect(text).toContain('more people would not help');
  });

  it('a pilot source is named with its interval, and Cronbach (1951) and Feldt (1965) are cited', () => {
    const piloted: Plan = {
      ...plan,
      provenance: { 'pretest.reliability': { source: 'pilot', note: 'from pilot file wave1.csv, alpha = .75, n = 212', interval: { lower: 0.7, upper: 0.8, level: 0.95 } } },
    };
    const pm = methodsText(piloted, analysePlan(piloted));
    const ptext = methodsPlainText(pm);
    expect(ptext).toContain('estimated from pilot data (from pilot file wave1.csv, alpha = .75, n = 212)');
    expect(ptext).toContain('a 95% confidence interval from .700 to .800');
    expect(pm.references.map((r) => r.citation)).toEqual(expect.arrayContaining(['Cronbach, 1951', 'Feldt, 1965']));
    expectCautionAndReferences(pm);
  });

  it('with a simulation, its figures are the engine’s own (a short seeded run)', () => {
    const sim: SimulationResult = simulatePlan(plan, { replications: 40, seed: 7 });
    const sm = methodsText(plan, analytic, sim);
    expectFiguresFromResults(sm, { analytic, plan, simulation: sim });
    const simFigures = figures(sm).filter((f) => f.source.startsWith('simulation.'));
    expect(simFigures.map((f) => f.source)).toEqual(
      expect.arrayContaining(['simulation.replications', 'simulation.analyses.matchedDifference.meanEstimate', 'simulation.matching.discardedProgrammeShare']),
    );
    expect(methodsPlainText(sm)).toContain('A Monte Carlo simulation of the planned procedure (40 replications, seed 7)');
  });

  it('Markdown carries the same paragraphs, the caution and the references', () => {
    const md = methodsMarkdown(m);
    expect(md).toContain('**Design and matching.**');
    expect(md).toContain('−2.00 (−80% of the effect)');
    expect(md).toContain('## References');
    expect(md).toContain('- Thorndike, R. L. (1942)');
    expect(md).toContain('not a substitute for a statistician or an ethics board');
  });
});

describe('methods text for a selection example (invented screened reading support)', () => {
  const plan = valid(SCREENED_READING_SUPPORT);
  const analytic = analysePlan(plan);
  const m = methodsText(plan, analytic);
  const text = methodsPlainText(m);

  it('every figure is core’s; caution and references present, Goldberger (1972) for regression discontinuity', () => {
    expectFiguresFromResults(m, { analytic, plan });
    expectCautionAndReferences(m);
    expect(m.references.map((r) => r.citation)).toContain('Goldberger, 1972');
  });

  it('states the rule and the selected share Φ((85 − 100)/SD_screener) = 18% (truncated normal; Johnson, Kotz & Balakrishnan 1994)', () => {
    // Screener SD: true variance .85·15² over the screener's reliability .7 (classical test theory, common practice).
    const screenerSD = Math.sqrt((0.85 * 225) / 0.7);
    const share = stdNormalCdf((85 - 100) / screenerSD, 0, 1);
    expect(share).toBeCloseTo(0.1821, 3);
    expect(shown(m, 'analytic.design.selectedShare')).toBe('18%');
    expect(text).toContain('below 85');
  });

  it('regression discontinuity on the rule’s score is unbiased (common practice: adjusting for the assignment variable removes selection bias)', () => {
    expect(shown(m, 'analytic.analyses.regressionDiscontinuity.bias')).toBe('0.00');
  });
});

describe('methods text for the one-group example (invented clinic readings)', () => {
  const plan = valid(CLINIC_HIGH_READINGS);
  const analytic = analysePlan(plan);
  const m = methodsText(plan, analytic);

  it('every figure is core’s; caution and Barnett et al. (2005) cited; nobody is matched', () => {
    expectFiguresFromResults(m, { analytic, plan });
    expectCautionAndReferences(m);
    expect(m.references.map((r) => r.citation)).toContain('Barnett et al., 2005');
    expect(figures(m).some((f) => f.source.includes('matchedDifference'))).toBe(false);
    expect(methodsPlainText(m)).toContain('one-group pre–post study');
  });

  it('the change with no programme is −11.06 (Barnett et al. 2005, eq. 1, with the pre–post slope: (r − 1)·SD·φ(z)/(1 − Φ(z)), z = 1.25; computed)', () => {
    const z = (150 - 130) / 16;
    const phi = Math.exp(-z * z / 2) / Math.sqrt(2 * Math.PI);
    const change = (0.6 - 1) * 16 * phi / (1 - stdNormalCdf(z, 0, 1));
    expect(change).toBeCloseTo(-11.06, 2);
    expect(shown(m, 'analytic.design.noProgrammeChange')).toBe('−11.06');
  });
});

describe('methods text for the schools example (invented, clusters matched on their means)', () => {
  const plan = valid(SCHOOLS_MATCHED_ON_MEANS);
  const analytic = analysePlan(plan);
  const m = methodsText(plan, analytic);
  const text = methodsPlainText(m);

  it('every figure is core’s; caution, Kish (1965), Bliese (2000) and Bell & McCaffrey (2002) cited', () => {
    expectFiguresFromResults(m, { analytic, plan });
    expectCautionAndReferences(m);
    expect(m.references.map((r) => r.citation)).toEqual(expect.arrayContaining(['Kish, 1965', 'Bliese, 2000', 'Bell & McCaffrey, 2002']));
  });

  it('cluster-mean reliability .862 (Bliese 2000, ICC(2) = 25·.2/(1 + 24·.2)), design effect 7.00 (Kish 1965, 1 + 24·.25), artefact −1.10 (REFERENCES, computed)', () => {
    expect((25 * 0.2) / (1 + 24 * 0.2)).toBeCloseTo(0.8621, 4);
    expect(shown(m, 'analytic.reliability.clusterMean')).toBe('.862');
    expect(shown(m, 'analytic.clusters.designEffect.posttest')).toBe('7.00');
    expect(shown(m, 'analytic.analyses.matchedDifference.bias')).toBe('−1.10');
    expect(text).toContain('Each programme cluster will be matched to one comparison cluster');
  });
});
