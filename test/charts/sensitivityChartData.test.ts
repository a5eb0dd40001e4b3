import { describe, expect, it } from 'vitest';
import { sensitivityChartData } from '../../src/charts/sensitivityChartData';
import { closedFormInput } from './fixtures';

describe('sensitivityChartData', () => {
  it("the matched-difference curve crosses the tolerated band's edge at core's break-even reliability", () => {
    const input = closedFormInput();
    const d = sensitivityChartData(input, 'reliability');
    const matched = d.series.find((s) => s.id === 'matchedDifference')!;
    const edge = d.band.upper;
    // Band = tolerable share × |tau| = 0.25 × 2.5 = 0.625 points (demo plan; common practice arithmetic).
    expect(edge).toBeCloseTo(0.625, 12);
    expect(d.breakEvenX).toHaveLength(1);
    const be = d.breakEvenX[0]!;
    // Grid points below the break-even lie outside the band, points above inside (monotone artefact,
    // Thorndike 1942 closed form beta (1 - rho) Delta). Exact comparison on the grid.
    for (const p of matched.points) {
      if (p.x < be - 1e-9) expect(Math.abs(p.bias)).toBeGreaterThan(edge);
      if (p.x > be + 1e-9) expect(Math.abs(p.bias)).toBeLessThan(edge);
    }
    // Linear interpolation between the bracketing grid points meets the edge at be within 0.005
    // reliability units (the curve is smooth and the grid step is 0.0175).
    const i = matched.points.findIndex((p) => p.x > be);
    const a = matched.points[i - 1]!;
    const b = matched.points[i]!;
    const xCross = a.x + ((Math.abs(a.bias) - edge) / (Math.abs(a.bias) - Math.abs(b.bias))) * (b.x - a.x);
    expect(Math.abs(xCross - be)).toBeLessThan(0.005);
    // Core's break-even is a within-group reliability: 1 - 0.625 / (0.8 × 10) = 0.921875
    // (breakEvenReliability example). On this axis (reliability in the reference population, SD 10,
    // true-score variance held at 75 as the instrument changes) it maps to 75 / (75 + SEM^2) with
    // SEM^2 = 75 (1 - rho*) / rho* (classical test theory, Lord & Novick 1968: reliability = true
    // over observed variance). The demo's reference population has the comparison group's SD, so the
    // two scales coincide (computed: 0.921875). Tolerance 1e-9.
    const rhoStar = input.analytic.breakEven.reliability!;
    expect(rhoStar).toBeCloseTo(0.921875, 9);
    const sem2 = (75 * (1 - rhoStar)) / rhoStar;
    expect(be).toBeCloseTo(75 / (75 + sem2), 9);
    expect(be).toBeCloseTo(0.921875, 9);
  });

  it('marks the current reliability with the closed-form biases (demo: matched difference -2.0)', () => {
    // Thorndike 1942 / Campbell & Erlebacher 1970 (computed): beta (1 - rho) Delta = 0.8 × 0.25 × (-10) = -2.
    // Tolerance 1e-9.
    const d = sensitivityChartData(closedFormInput(), 'reliability');
    expect(d.current).toBeCloseTo(0.75, 9);
    expect(d.series.find((s) => s.id === 'matchedDifference')!.currentBias).toBeCloseTo(-2, 9);
    // Kelley 1947: a perfectly reliable pretest leaves no matching artefact.
    const last = d.series.find((s) => s.id === 'matchedDifference')!.points.at(-1)!;
    expect(last.x).toBe(1);
    expect(Math.abs(last.bias)).toBeLessThan(1e-9);
    // Equal within-group reliabilities: matched difference and ANCOVA coincide (DESIGN.md closed-form table).
    expect(d.coincident).toContainEqual(['matchedDifference', 'ancova']);
  });

  it('pretest-gap mode: matched-difference bias is linear in the gap with slope beta (1 - rho)', () => {
    // Thorndike 1942 closed form: bias = beta (1 - rho) Delta; demo beta 0.8, rho .75 → slope 0.2. Tolerance 1e-9.
    const d = sensitivityChartData(closedFormInput(), 'pretestGap');
    expect(d.mode).toBe('pretestGap');
    expect(d.current).toBe(-10);
    for (const p of d.series.find((s) => s.id === 'matchedDifference')!.points) expect(p.bias).toBeCloseTo(0.2 * p.x, 9);
    // Break-even gaps: ± 0.625 / 0.2 = ± 3.125 points, those inside the drawn range.
    for (const x of d.breakEvenX) expect(Math.abs(x)).toBeCloseTo(3.125, 9);
  });
});
