import { MATCHED_ON } from '../core/matchedOnWords';
import { expectedMatchedRegion } from '../core/expectedMatchedRegion';
import { matchedSampleMeans } from '../core/matchedSampleMeans';
import { matchedTrueScoreMeans, type MatchedTrueScoreMeans } from '../core/matchedTrueScoreMeans';
import { observedPretestDensity } from '../core/observedPretestDensity';
import type { ChartInput } from './chartTypes';
import { selectionPretestView, type SelectionPretestView } from './selectionPretestView';
import { studyDesign } from '../core/design/studyDesign';
import { clusterModel } from '../core/clusters/clusterModel';
import { clusterMeansModel } from '../core/clusters/analyseClusterPlan';
import type { ModelParameters } from '../core/modelParameters';

export type GroupKey = 'programme' | 'comparison';

/** One group's observed-pretest curve. */
export interface PretestGroupCurve {
  label: string;
  mean: number;
  observedSD: number;
  reliability: number;
  /** Density per test point at evenly spaced scores. */
  points: { x: number; density: number }[];
}

/** A scatter of one group's matched members in the example replication. */
export interface ExampleMarks {
  observed: number;
  trueScore: number;
}

/**
 * Plain data for the "Pretest distributions" chart: two existing groups
 * (GroupsPretestChartData) or, when a rule forms the groups, the population
 * and the rule (SelectionPretestChartData).
 */
export type PretestChartData = GroupsPretestChartData | SelectionPretestChartData;

/** The pretest chart of a plan whose groups a rule forms (see SelectionPretestView). */
export interface SelectionPretestChartData {
  chart: 'pretest';
  title: string;
  xLabel: string;
  selection: SelectionPretestView;
}

/** The pretest chart of two existing groups: their curves, the matched region and the matched members. */
export interface GroupsPretestChartData {
  chart: 'pretest';
  title: string;
  xLabel: string;
  xDomain: [number, number];
  yMax: number;
  groups: Record<GroupKey, PretestGroupCurve>;
  /** Where programme members are expected to find partners, or where they did in the example study. */
  region: { lower: number; upper: number; source: 'closed-form' | 'example' } | null;
  /**
   * Matched members' mean observed pretest and their expected true-score means
   * (Kelley). Closed form: exact matching from an unlimited pool. With a
   * simulation: Kelley's expectation at the example study's matched observed means.
   */
  kelley: MatchedTrueScoreMeans & { source: 'closed-form' | 'example' };
  /** The example simulated study's matched members, when a simulation exists. */
  example: {
    programme: ExampleMarks[];
    comparison: ExampleMarks[];
    discarded: number;
    means: { observed: Record<GroupKey, number>; trueScore: Record<GroupKey, number> };
  } | null;
  /** Always null here: a plan whose groups a rule forms gets SelectionPretestChartData. */
  selection: null;
  /**
   * What the curves and dots are: people's scores, or clusters' observed
   * pretest means (clusters matched on their means: one dot per cluster,
   * reliability λ of a cluster mean).
   */
  units: 'people' | 'clusters';
}

const GRID = 121;

/**
 * Transform plan + results into the pretest-distributions chart's data.
 * Pure and deterministic; every statistic comes from src/core or the simulation.
 */
export function pretestChartData(input: ChartInput): PretestChartData {
  const selection = selectionPretestView(input.plan);
  if (selection) {
    return {
      chart: 'pretest',
      title: 'Who the rule selects, and where they would score when measured again without the programme',
      xLabel: 'Score on the pretest scale (test points)',
      selection,
    };
  }
  return groupsPretestChartData(input);
}

/**
 * The two-existing-groups form of the pretest chart's data (pretestChartData
 * gives it for every plan without a selection rule).
 */
export function groupsPretestChartData({ plan, analytic, simulation }: ChartInput): GroupsPretestChartData {
  // Clusters matched on their means: the cluster means' model from core (their SDs, λ), so the picture shows what was matched.
  const design = studyDesign(plan);
  const units: GroupsPretestChartData['units'] = design.kind === 'clusters' && design.level === 'clusters' ? 'clusters' : 'people';
  const m: ModelParameters = units === 'clusters' ? clusterMeansModel(clusterModel(plan)) : analytic.model;
  const keys: GroupKey[] = ['programme', 'comparison'];
  const lo = Math.min(m.mean.programme - 3.5 * m.observedSD.programme, m.mean.comparison - 3.5 * m.observedSD.comparison);
  const hi = Math.max(m.mean.programme + 3.5 * m.observedSD.programme, m.mean.comparison + 3.5 * m.observedSD.comparison);
  let yMax = 0;
  const groups = {} as Record<GroupKey, PretestGroupCurve>;
  for (const g of keys) {
    const points = Array.from({ length: GRID }, (_, i) => {
      const x = lo + ((hi - lo) * i) / (GRID - 1);
      return { x, density: observedPretestDensity(x, m.mean[g], m.observedSD[g]) };
    });
    for (const p of points) yMax = Math.max(yMax, p.density);
    groups[g] = {
      label: plan.groups[g].label,
      mean: m.mean[g],
      observedSD: m.observedSD[g],
      reliability: m.reliability[g],
      points,
    };
  }

  const pairs = simulation?.example.pairs ?? [];
  let region: GroupsPretestChartData['region'] = null;
  let kelley: GroupsPretestChartData['kelley'];
  let example: GroupsPretestChartData['example'] = null;
  if (simulation && pairs.length > 0) {
    const means = matchedSampleMeans(pairs);
    kelley = { ...matchedTrueScoreMeans(m, means.observed), source: 'example' };
    const matchedX = pairs.map((p) => p.programme.observed);
    region = { lower: Math.min(...matchedX), upper: Math.max(...matchedX), source: 'example' };
    example = {
      programme: pairs.map((p) => ({ observed: p.programme.observed, trueScore: p.programme.trueScore })),
      comparison: pairs.flatMap((p) => p.comparison.map((c) => ({ observed: c.observed, trueScore: c.trueScore }))),
      discarded: simulation.example.discarded.length,
      means: { observed: means.observed, trueScore: means.trueScore },
    };
  } else {
    kelley = { ...matchedTrueScoreMeans(m), source: 'closed-form' };
    const r = expectedMatchedRegion(m, plan.matching.caliper, plan.matching.ratio);
    region = r ? { ...r, source: 'closed-form' } : null;
  }
  const clusters = units === 'clusters';
  const distance = plan.matching.distance ?? 'pretest';
  return {
    chart: 'pretest',
    title: clusters
      ? 'Cluster means on the pretest: matched on the observed mean, apart on the true mean'
      : distance === 'pretest'
        ? 'Pretest distributions: matched on the observed score, apart on the true score'
        : `Pretest distributions: matched on ${MATCHED_ON[distance]}, apart on the true pretest score`,
    xLabel: clusters ? 'Observed pretest mean of a cluster (test points)' : 'Observed pretest score (test points)',
    xDomain: [lo, hi],
    yMax,
    groups,
    region,
    kelley,
    example,
    selection: null,
    units,
  };
}
