import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { main } from '../../src/cli/main';
import { covariateBreakEven } from '../../src/core/multivariate/covariateBreakEven';
import { covariateCorrectedAncovaEstimate } from '../../src/core/multivariate/covariateCorrectedAncovaEstimate';
import { covariateMatchedEstimate } from '../../src/core/multivariate/covariateMatchedEstimate';
import { chiSquareCdf, covariateMatchedShare, mahalanobisBallProbability } from '../../src/core/multivariate/covariateMatchedShare';
import { covariateModelWithSem } from '../../src/core/multivariate/adjustCovariateModel';
import { deriveCovariateModel } from '../../src/core/multivariate/covariateModel';
import { expectedCovariateBalance } from '../../src/core/multivariate/expectedCovariateBalance';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
import { normalCdf } from '../../src/core/distributions';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { afterSchoolMaths, covariate, identity, planWithCovariates } from './multivariateFixture';

const close = (a: number, b: number, abs: number): void => {
  expect(Math.abs(a - b)).toBeLessThanOrEqual(abs);
};

describe('analysePlan with covariates (the invented after-school maths example)', () => {
  const plan = afterSchoolMaths();
  const r = analysePlan(plan);
  const cm = deriveCovariateModel(plan);

  it('the example is a valid plan, unchanged by validation', () => {
    expect(validatePlan(plan)).toEqual({ ok: true, plan });
  });

  it('reports the unmeasured part: what the corrected ANCOVA with the true reliabilities leaves (1e-9)', () => {
    const u = r.unmeasuredBias!;
    close(u.points, covariateCorrectedAncovaEstimate(cm, cm.reliability.pooled[0]!) - cm.effect - cm.growthGap, 1e-9);
    close(u.share!, u.points / r.tau, 1e-12);
    close(u.sd, u.points / plan.outcome.posttestSD, 1e-12);
    expect(u.covariates).toEqual(['Family engagement']);
    // The unmeasured confounder is lower in the programme and raises the outcome: the part is negative.
    expect(u.points).toBeLessThan(-0.5);
    expect(r.matchingDistance).toBe('propensity');
    expect(r.analyses.matchedDifference!.name).toBe('Matched post-test difference (matched on the propensity score)');
  });

  it('propensity matching, Mahalanobis matching and ANCOVA on all measured covariates agree (equal covariances; Rosenbaum & Rubin 1983; 1e-9)', () => {
    close(r.analyses.matchedDifference!.expectedEstimate, r.analyses.ancova!.expectedEstimate, 1e-9);
    close(covariateMatchedEstimate(cm, 'mahalanobis'), r.analyses.ancova!.expectedEstimate, 1e-9);
    // Matching on the pretest alone leaves more (the other covariates' gaps flow through).
    expect(Math.abs(covariateMatchedEstimate(cm, 'pretest') - cm.effect)).toBeGreaterThan(Math.abs(r.analyses.matchedDifference!.bias));
  });

  it('remedies: measuring the confounder is offered; matching on all measured covariates when the plan matches on the pretest', () => {
    const ids = r.remedies.map((x) => x.id);
    expect(ids).toContain('measure-confounders');
    expect(ids).not.toContain('match-all-measured');
    const measure = r.remedies.find((x) => x.id === 'measure-confounders')!;
    expect(measure.title).toBe('Measure Family engagement and match on it too');
    expect(Math.abs(measure.remainingBias)).toBeLessThan(Math.abs(r.analyses.matchedDifference!.bias));
    const sorted = r.remedies.map((x) => Math.abs(x.remainingBias));
    expect([...sorted].sort((a, b) => a - b)).toEqual(sorted);

    const onPretest = structuredClone(plan);
    onPretest.matching.distance = 'pretest';
    const r2 = analysePlan(onPretest);
    const all = r2.remedies.find((x) => x.id === 'match-all-measured')!;
    close(all.remainingBias, r.analyses.matchedDifference!.bias, 1e-9);
    expect(all.summary).toContain('Attendance and Deprivation index');
  });

  it('break-even: null with a note when even a perfect pretest leaves too much; otherwise the artefact equals the tolerance there (1e-6)', () => {
    expect(r.breakEven.reliability).toBeNull();
    expect(r.breakEven.note).toMatch(/^Even a perfectly reliable pretest would leave a matched-difference artefact of −1\.\d\d points/);
    // The demo (invented) plus one well-measured covariate, matched on Mahalanobis distance.
    const measured = planWithCovariates(
      [covariate({ programmeMean: 83, comparisonMean: 85, reliability: 0.9, outcomeCorrelation: 0.2 })],
      [
        [1, 0.3],
        [0.3, 1],
      ],
    );
    const m = deriveModelParameters(measured);
    const cmm = deriveCovariateModel(measured, m);
    const be = covariateBreakEven(cmm, m, 'mahalanobis', 0.25);
    expect(be.reliability).not.toBeNull();
    expect(be.alreadyMet).toBe(false);
    expect(be.note).toMatch(/^The comparison group's within-group reliability must rise from 0\.75 to 0\.9\d+: the average of \d+ parallel pretests would do it/);
    const rho = be.reliability!;
    const tvC = cmm.sigmaT.comparison[0]![0]!;
    const at = covariateModelWithSem(cmm, 0, Math.sqrt((tvC * (1 - rho)) / rho));
    close(Math.abs(covariateMatchedEstimate(at, 'mahalanobis') - cmm.effect - cmm.growthGap), 0.25 * Math.abs(cmm.effect), 1e-6);
  });

  it('every figure is finite, and the CLI prints the unmeasured part (text and --json)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'meanward-covariates-'));
    const file = join(dir, 'maths.json');
    writeFileSync(file, JSON.stringify(plan));
    let stdout = '';
    let stderr = '';
    const io = { stdout: { write: (s: string) => (stdout += s) }, stderr: { write: (s: string) => (stderr += s) } };
    expect(await main(['run', file, '--json', '--no-sim'], io)).toBe(0);
    const json = JSON.parse(stdout) as { analytic: typeof r };
    expect(json.analytic.unmeasuredBias).toEqual(JSON.parse(JSON.stringify(r.unmeasuredBias)));
    expect(json.analytic.analyses.ancova!.expectedEstimate).toBe(r.analyses.ancova!.expectedEstimate);
    stdout = '';
    expect(await main(['run', file, '--no-sim'], io)).toBe(0);
    expect(stdout).toContain(
      `Unmeasured part of the bias (Family engagement): ${r.unmeasuredBias!.points.toFixed(2)} points (${r.unmeasuredBias!.sd.toFixed(3)} SD), ` +
        `${(r.unmeasuredBias!.share! * 100).toFixed(1)}% of the effect. No analysis of the measured covariates removes it.`,
    );
    expect(stdout).toContain('Family engagement          no     no        0.800');
    expect(stderr).toBe('');
  });
});

describe('expected balance after matching', () => {
  it('pretest only (demo, reliability .75, gap −10, SDs 10): observed SMD −1 → 0, true SMD −1.155 → −0.289 (Kelley 1947; computed, 1e-9)', () => {
    const p = demoPlan();
    p.matching.distance = 'propensity';
    const [b] = expectedCovariateBalance(deriveCovariateModel(p), 'propensity');
    close(b!.observedSMDBefore, -1, 1e-9);
    close(b!.observedSMDAfter, 0, 1e-9);
    close(b!.trueSMDBefore, -1 / Math.sqrt(0.75), 1e-9);
    close(b!.trueSMDAfter, (-0.25 * 10) / Math.sqrt(75), 1e-9);
    close(b!.varianceRatioAfter, 1, 1e-9);
  });

  it('an unmeasured covariate uncorrelated with the pretest keeps its gap and variance; a correlated one moves by r·(pretest shift) (1e-9)', () => {
    const p = planWithCovariates(
      [
        covariate({ name: 'Apart', programmeMean: 4, comparisonMean: 5, sd: 2, reliability: 0.8, outcomeCorrelation: 0.2, measured: false }),
        covariate({ name: 'Linked', programmeMean: 5, comparisonMean: 5, sd: 2, reliability: 1, outcomeCorrelation: 0.1, measured: false }),
      ],
      [
        [1, 0, 0.5],
        [0, 1, 0],
        [0.5, 0, 1],
      ],
    );
    const cm = deriveCovariateModel(p);
    const [, apart, linked] = expectedCovariateBalance(cm, 'pretest');
    close(apart!.observedSMDAfter, apart!.observedSMDBefore, 1e-9);
    close(apart!.varianceRatioAfter, 1, 1e-9);
    // Matching on X_0 moves partners' means of 'Linked' by cov(X_0, Z)/var(X_0) × (−10) = 0.5·2/10 × (−10) = −1
    // relative to the comparison mean, so the gap after is 0 − (−1) = +1, SMD 1/2 (normal regression; computed).
    close(linked!.observedSMDAfter, 0.5, 1e-9);
    // Variance of partners' Z: 4 − 1 + 1 = 4 (equal pretest variances), ratio 1.
    close(linked!.varianceRatioAfter, 1, 1e-9);
    // Zero group gap on 'Linked', yet the matched samples differ on it: the reason the property
    // "an unmeasured covariate with no gap changes nothing" needs it uncorrelated with the others.
    expect(analysePlan(p).unmeasuredBias!.points).not.toBe(0);
  });
});

describe('matched share for Mahalanobis matching (an approximation; its pieces checked)', () => {
  it('chi-square CDF in closed form against jstat (a general-purpose library), df 1–9, 1e-10', () => {
    for (let df = 1; df <= 9; df++) {
      for (const y of [0.01, 0.3, 1, 2.5, 7, 15, 40]) close(chiSquareCdf(y, df), jStat.chisquare.cdf(y, df), 1e-10);
    }
  });

  it('ball probability: centred ball = chi-square CDF (jstat, 5e-6); q = 1 = Φ(d + c) − Φ(d − c) (1e-12); a brute-force 2-D grid (2e-4, the error of the grid itself)', () => {
    for (const q of [2, 3, 5]) for (const c of [0.2, 0.7, 1.5]) close(mahalanobisBallProbability(q, c, 0), jStat.chisquare.cdf(c * c, q), 5e-6);
    for (const d of [0, 0.5, 2]) close(mahalanobisBallProbability(1, 0.4, d), normalCdf(d + 0.4) - normalCdf(d - 0.4), 1e-12);
    // Brute force: midpoint rule on a 600 × 600 grid over the disc of radius c around (d, 0).
    for (const [c, d] of [
      [0.5, 1],
      [1.2, 0.3],
    ] as const) {
      const n = 600;
      const h = (2 * c) / n;
      let s = 0;
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          const x = -c + (i + 0.5) * h;
          const y = -c + (j + 0.5) * h;
          if (x * x + y * y <= c * c) s += Math.exp(-((x + d) ** 2 + y * y) / 2) / (2 * Math.PI);
        }
      }
      close(mahalanobisBallProbability(2, c, d), s * h * h, 2e-4);
    }
  });

  it('behaves as a share: in [0, 1], grows with the caliper and the comparison pool, 1 with replacement and a huge pool', () => {
    const p = planWithCovariates(
      [covariate({ outcomeCorrelation: 0.2 }), covariate({ name: 'Second', programmeMean: 0, comparisonMean: 0, sd: 1, outcomeCorrelation: 0 })],
      identity(3),
    );
    p.matching.distance = 'mahalanobis';
    const m = deriveModelParameters(p);
    const cm = deriveCovariateModel(p, m);
    const share = (caliper: number, replacement: boolean, cmx = cm) => covariateMatchedShare(cmx, m, { caliper, ratio: 1, replacement }, 'mahalanobis');
    let last = 0;
    for (const c of [0.05, 0.1, 0.2, 0.5, 1, 2]) {
      const s = share(c, false);
      expect(s).toBeGreaterThanOrEqual(last);
      expect(s).toBeLessThanOrEqual(1);
      last = s;
    }
    const big = { ...cm, n: { programme: 100, comparison: 100_000 } };
    expect(share(1, true, big)).toBeGreaterThan(0.999);
  });
});
