import { extent } from 'd3-array';
import type { AnalysisId } from '../core/plan';
import { presentAnalyses } from '../core/presentAnalyses';
import { sensitivityCurve, type SensitivityVariable } from '../core/sensitivityCurve';
import type { ChartInput } from './chartTypes';
import type { Plan } from '../core/plan';
import { studyDesign } from '../core/design/studyDesign';

/** One analysis' expected-bias curve. */
export interface SensitivitySeries {
  id: AnalysisId;
  name: string;
  points: { x: number; bias: number }[];
  /** Expected bias under the plan as it stands (formula for unlimited pools, as the curve), posttest points. */
  currentBias: number;
}

/** Plain data for the "Sensitivity" chart (either mode). */
export interface SensitivityChartData {
  chart: 'sensitivity';
  mode: SensitivityVariable;
  title: string;
  xLabel: string;
  yLabel: string;
  series: SensitivitySeries[];
  /** Hoped-for effect, posttest points. */
  tau: number;
  /** Tolerated bias: ± tolerable share × |tau|. */
  band: { lower: number; upper: number };
  tolerableShare: number;
  /** x where the matched-difference artefact reaches the band's edge. */
  breakEvenX: number[];
  /** The plan's current x. */
  current: number;
  xDomain: [number, number];
  yDomain: [number, number];
  /** Pairs of analyses whose curves are identical on this axis (drawn on top of each other). */
  coincident: [AnalysisId, AnalysisId][];
  /** What the curve holds fixed while x varies (core's sensitivityCurve), shown with the chart. */
  holdsFixed: string;
}

const SENSITIVITY_TITLES: Record<SensitivityVariable, string> = {
  reliability: 'Sensitivity: expected bias against pretest reliability',
  pretestGap: 'Sensitivity: expected bias against the pretest group gap',
  cutOff: 'Sensitivity: expected bias against the cut-off',
  screenerReliability: 'Sensitivity: expected bias against the screener reliability',
};

/**
 * What the sensitivity chart can vary for a plan: reliability and the
 * pretest gap for existing groups (in clusters too); reliability and the cut-off when a rule
 * forms the groups, and the screener's reliability when the rule used one
 * (core's sensitivityCurve refuses the rest with a plain message).
 */
export function sensitivityModes(plan: Plan): SensitivityVariable[] {
  const d = studyDesign(plan);
  if (d.kind === 'existing-groups' || d.kind === 'clusters') return ['reliability', 'pretestGap'];
  return d.basis === 'screener' ? ['reliability', 'cutOff', 'screenerReliability'] : ['reliability', 'cutOff'];
}

/**
 * Transform plan + results into the sensitivity chart's data: expected bias of
 * each analysis against pretest reliability, the pretest group gap, the
 * cut-off or the screener's reliability (core's sensitivityCurve; see sensitivityModes), the tolerated band, break-even and current x.
 * Works from closed forms only (formula for unlimited pools and exact matching;
 * the simulation and the quick planned-procedure figures add nothing here),
 * so it depends on the plan alone. Pure and deterministic.
 */
export function sensitivityChartData({ plan, analytic }: ChartInput, mode: SensitivityVariable = 'reliability'): SensitivityChartData {
  const curve = sensitivityCurve(plan, mode);
  // One series per analysis the curve covers (the design's analyses).
  const series = presentAnalyses(analytic.analyses)
    .filter(([id]) => curve.points.every((p) => p.bias[id] !== undefined))
    .map(([id, a]) => ({
      id,
      name: a.name,
      points: curve.points.map((p) => ({ x: p.x, bias: p.bias[id] as number })),
      // The curves are the formula for unlimited pools and exact matching: mark this plan on the same scale.
      currentBias: a.formulaEstimate - analytic.tau,
    }));
  const ys = [curve.tolerableBand.lower, curve.tolerableBand.upper, curve.effect, -curve.effect, 0];
  for (const s of series) for (const p of s.points) ys.push(p.bias);
  const [y0, y1] = extent(ys) as [number, number];
  const pad = (y1 - y0 || 1) * 0.06;
  const xs = curve.points.map((p) => p.x);
  const coincident: [AnalysisId, AnalysisId][] = [];
  series.forEach((a, i) =>
    series.slice(i + 1).forEach((b) => {
      if (a.points.every((p, k) => Math.abs(p.bias - b.points[k]!.bias) <= 1e-9 * (1 + Math.abs(p.bias)))) coincident.push([a.id, b.id]);
    }),
  );
  return {
    chart: 'sensitivity',
    mode,
    title: SENSITIVITY_TITLES[mode],
    // The axis says which reliability scale it is (core's label): within-group for existing groups, the
    // same scale as the break-even figure in the text; the reference population for selection designs.
    xLabel: mode === 'reliability' || mode === 'screenerReliability' ? `${curve.xLabel} (0 to 1)` : curve.xLabel,
    yLabel: 'Expected bias (posttest points)',
    series,
    tau: curve.effect,
    band: curve.tolerableBand,
    tolerableShare: plan.analysis.tolerableBiasShare,
    breakEvenX: curve.breakEvenX,
    current: curve.current,
    xDomain: [Math.min(...xs), Math.max(...xs)],
    yDomain: [y0 - pad, y1 + pad],
    coincident,
    holdsFixed: curve.holdsFixed,
  };
}
