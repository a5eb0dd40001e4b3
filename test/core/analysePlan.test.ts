import { describe, expect, it } from 'vitest';
import stdTCdf from '@stdlib/stats-base-dists-t-cdf';
import stdTQuantile from '@stdlib/stats-base-dists-t-quantile';
import { analysePlan } from '../../src/core/analysePlan';
import { TWO_GROUP_ANALYSIS_IDS } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';

// The demo plan (invented scenario): programme 10 points below, SD 10, reliability .75 (SEM 5),
// r = .6 → beta = 0.8, effect 2.5 points.

describe('analysePlan on the demo plan', () => {
  const r = analysePlan(demoPlan());

  it('returns only finite numbers (no NaN or Infinity reaches an output)', () => {
    const walk = (v: unknown, path: string): void => {
      if (typeof v === 'number') expect(Number.isFinite(v), path).toBe(true);
      else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) walk(x, `${path}.${k}`);
    };
    walk(r, 'results');
  });

  it('matched difference: bias beta(1 − rho)Delta = 0.8·0.25·(−10) = −2 (Thorndike 1942; Campbell & Erlebacher 1970); tolerance 1e-9', () => {
    expect(r.analyses.matchedDifference!.bias).toBeCloseTo(-2, 9);
    expect(r.analyses.matchedDifference!.biasSD).toBeCloseTo(-0.2, 9);
    expect(r.analyses.matchedDifference!.biasShare as number).toBeCloseTo(-0.8, 9);
    // 2.5 − 2 = 0.5 > 0: shrunk toward zero, not reversed.
    expect(r.analyses.matchedDifference!.verdict).toBe('hides');
  });
  it('ANCOVA −2 (Lord 1960), gain score +2 ((beta − 1)Delta), corrected ANCOVA with rho\' = .75 → 0 (Porter 1967)', () => {
    expect(r.analyses.ancova!.bias).toBeCloseTo(-2, 9);
    expect(r.analyses.gainScore!.bias).toBeCloseTo(2, 9);
    expect(r.analyses.gainScore!.verdict).toBe('inflates');
    expect(r.analyses.correctedAncova!.bias).toBeCloseTo(0, 9);
    expect(r.analyses.correctedAncova!.verdict).toBe('negligible');
  });
  it('power of the unbiased corrected ANCOVA equals its power without bias; a hiding bias cuts power', () => {
    const c = r.analyses.correctedAncova!;
    expect(c.power).toBeCloseTo(c.powerWithoutBias!, 9);
    expect(r.analyses.ancova!.power).toBeLessThan(r.analyses.ancova!.powerWithoutBias!);
    expect(r.analyses.gainScore!.power).toBeGreaterThan(r.analyses.gainScore!.powerWithoutBias!);
  });
  it('false-positive rate of the ANCOVA matches an independent normal-mixture bound: between α and 1', () => {
    const a = r.analyses.ancova!;
    // Independent check with @stdlib: P(|T| > t_crit) for T ≈ t_df shifted by bias/se (location-shift
    // approximation, close to the noncentral t at the Welch–Satterthwaite df ≈ 235); tolerance .01.
    const df = a.df!;
    const tc = stdTQuantile(0.975, df);
    const shift = a.bias / a.se!;
    const approx = stdTCdf(-tc - shift, df) + 1 - stdTCdf(tc - shift, df);
    expect(a.falsePositiveRate).toBeCloseTo(approx, 2);
  });
  it('break-even comparison reliability 1 − .25·2.5/(0.8·10) = 0.921875, 4 parallel forms (Spearman–Brown)', () => {
    expect(r.breakEven.reliability as number).toBeCloseTo(0.921875, 9);
    expect(r.breakEven.alreadyMet).toBe(false);
    expect(r.breakEven.parallelForms).toBe(4);
  });
  it('has every analysis, in TWO_GROUP_ANALYSIS_IDS order, with names and assumptions', () => {
    expect(Object.keys(r.analyses)).toEqual([...TWO_GROUP_ANALYSIS_IDS]);
    for (const id of TWO_GROUP_ANALYSIS_IDS) {
      expect(r.analyses[id]!.name.length).toBeGreaterThan(5);
      expect(r.analyses[id]!.assumption).toMatch(/Unbiased only if/);
    }
  });
  it('the matched analysis assumes fewer programme members than the pool (some go unmatched)', () => {
    const m = r.analyses.matchedDifference!;
    expect(m.nProgramme).toBeLessThan(180);
    expect(m.nProgramme).toBeGreaterThan(100);
  });
});

describe('analysePlan: inputs that contradict each other', () => {
  it('r² > rho throws the explanatory message', () => {
    const p = demoPlan();
    p.outcome.prePostCorrelation = 0.9; // .81 > .75
    expect(() => analysePlan(p)).toThrow(/cannot exceed the square root of its reliability \(0\.866\)/);
  });
  it('an SEM as large as a group SD throws a message naming the group', () => {
    const p = demoPlan();
    p.pretest = { sem: 10 };
    expect(() => analysePlan(p)).toThrow(/not smaller than the programme group's pretest SD/);
  });
  it('a programme that does nothing: verdict "invents", biasShare and wrong-sign rate null, break-even null with a note', () => {
    const p = demoPlan();
    p.outcome.hypothesisedEffect = 0;
    const r = analysePlan(p);
    expect(r.analyses.matchedDifference!.verdict).toBe('invents');
    expect(r.analyses.matchedDifference!.biasShare).toBeNull();
    expect(r.analyses.matchedDifference!.wrongSignRate).toBeNull();
    expect(r.analyses.matchedDifference!.requiredNPerGroup).toBeNull();
    expect(r.breakEven.reliability).toBeNull();
    expect(r.breakEven.note).toMatch(/false-positive rate/);
    // With no effect, rejections are false positives: the artefact pushes them well above α.
    expect(r.analyses.matchedDifference!.falsePositiveRate).toBeGreaterThan(0.3);
  });
});
