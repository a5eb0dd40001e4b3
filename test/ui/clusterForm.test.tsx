// @vitest-environment jsdom
// "People in clusters" on screen: the section shows its fields only when
// people are sampled in clusters, says how many clusters each pool makes,
// offers ICC presets labelled with their source, and the verdict names the
// reliability of a cluster's mean (λ), the cohort, the design effect and the
// clusters needed. Figures on screen are compared with what core returns,
// formatted by the planner's formatters (tolerance: none). λ is also checked
// against ICC(2) = n·ICC / (1 + (n − 1)·ICC) worked by hand (Bliese 2000;
// common practice) and the design effect against Kish (1965).
import { act, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { ICC_PRESETS } from '../../src/core/clusters/iccPresets';
import { SCHOOLS_MATCHED_ON_MEANS } from '../../src/io/examplePlans';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { fmt, fmtInt, fmtPct, fmtR, fmtSigned } from '../../src/ui/format';
import { controlledRunner } from '../state/helpers';
import { renderApp } from './renderApp';

describe('people in clusters: the form', () => {
  it('shows the cluster fields only when switched on, with the clusters each pool makes and presets with their source', async () => {
    const user = userEvent.setup();
    const { store } = renderApp();
    expect(screen.getByRole('group', { name: /^2\. The two groups/ })).toBeInTheDocument();
    const section = screen.getByRole('group', { name: /^3\. People in clusters/ });
    expect(within(section).queryByRole('textbox', { name: /^People tested per cluster/ })).toBeNull();
    await user.click(within(section).getByRole('checkbox', { name: /People are sampled in clusters/ }));
    expect(within(section).getByRole('textbox', { name: /^People tested per cluster/ })).toBeInTheDocument();
    // Nothing typed yet: plain "required" messages, the demo's results stay underneath.
    expect(store.getState().problems.find((p) => p.field === 'clusters.size')?.message).toBe('People tested per cluster is required.');
    await user.type(within(section).getByRole('textbox', { name: /^People tested per cluster/ }), '25');
    // A preset, labelled with its source, goes into the pretest ICC.
    const preset = ICC_PRESETS.find((p) => p.id === 'middle-unconditional')!;
    await user.selectOptions(within(section).getByRole('combobox', { name: /Typical ICCs to start from/ }), preset.id);
    expect(within(section).getByTestId('icc-presets')).toHaveTextContent(/Hedges & Hedberg \(2007\)/);
    expect(within(section).getByTestId('icc-presets')).toHaveTextContent(/from memory/);
    await user.click(within(section).getByRole('button', { name: 'Use as pretest ICC' }));
    expect(within(section).getByRole('textbox', { name: /^Pretest ICC/ })).toHaveValue(String(preset.icc));
    expect(within(section).getAllByTestId('field-source')[0]).toHaveTextContent(preset.label);
    // A pool that is not a whole number of clusters of 25: the pool size says so, and keeps what was typed.
    const pool = screen.getByRole('textbox', { name: /^Pool size, programme group/ });
    await user.clear(pool);
    await user.type(pool, '110');
    await user.tab();
    expect(screen.getAllByRole('alert').some((a) => /whole number of clusters of 25; got 110 \(100 or 125 would do\)/.test(a.textContent ?? ''))).toBe(true);
    expect(pool).toHaveValue('110');
  });

  it('the schools example: clusters per pool and λ from core, caliper in SDs of the cluster means', async () => {
    const { store } = renderApp();
    await act(async () => store.getState().loadExample('schools-matched-on-means'));
    const c = store.getState().analytic!.clusters!;
    expect(screen.getByTestId('cluster-count-programme')).toHaveTextContent(`750 people = ${fmtInt(c.clustersPerGroup.programme)} clusters of 25`);
    expect(screen.getByTestId('cluster-count-comparison')).toHaveTextContent(`2,000 people = ${fmtInt(c.clustersPerGroup.comparison)} clusters of 25`);
    expect(screen.getByTestId('derived-cluster-lambda')).toHaveTextContent(fmtR(c.clusterMeanReliability.comparison, 3));
    expect(screen.getByText('SDs of the cluster means')).toBeInTheDocument();
    expect(screen.queryByRole('group', { name: /Other covariates/ })).toBeNull();
  });
});

describe('people in clusters: verdict and table', () => {
  it('the verdict names λ and the cohort, the design effect, the clusters needed and the MDE, and keeps the caution', async () => {
    const { store } = renderApp();
    await act(async () => store.getState().loadExample('schools-matched-on-means'));
    const a = store.getState().analytic!;
    const c = a.clusters!;
    // Bliese (2000): ICC(2) = 25 × .2 / (1 + 24 × .2) = .862; Kish (1965): 1 + 24 × .25 = 7.
    expect(c.clusterMeanReliability.comparison).toBeCloseTo(5 / 5.8, 12);
    expect(c.designEffect.posttest).toBeCloseTo(7, 12);
    const verdict = screen.getByTestId('verdict');
    expect(within(verdict).getByTestId('verdict-cluster-lambda')).toHaveTextContent(`λ = ${fmtR(5 / 5.8, 3)}`);
    expect(within(verdict).getByTestId('verdict-cohort')).toHaveTextContent(/A new cohort sits the posttest/);
    expect(within(verdict).getByTestId('verdict-design-effect')).toHaveTextContent(`${fmt(7, 2)} for the posttest`);
    const md = a.analyses.matchedDifference!;
    // The matched-cluster artefact is not tolerable here, so no number of clusters is offered (more clusters do not remove a bias).
    expect(md.tolerability.artefactWithinShare).toBe(false);
    expect(md.clustersPerGroupNeeded).toBeNull();
    expect(within(verdict).getByTestId('verdict-clusters-needed')).toHaveTextContent('biased: more people do not help');
    expect(within(verdict).getByTestId('verdict-mde')).toHaveTextContent(`${fmtSigned(md.minimumDetectableEffect)} points`);
    expect(within(verdict).getByTestId('verdict-lead')).toHaveTextContent(/Matching on clusters’ observed pretest means/);
    expect(within(verdict).getByRole('note')).toHaveTextContent(/not replace advice from a statistician or review by an ethics board/);
    // The break-even figure is the reliability of a cluster's mean, with core's note on how many pupils per school reach it.
    expect(screen.getByTestId('break-even-cluster')).toHaveTextContent(`(λ) is at least ${fmtR(a.breakEven.reliability, 3)}`);
    expect(screen.getByTestId('break-even-cluster')).toHaveTextContent(`testing ${c.breakEvenClusterSize} people per cluster`);
    // Switch to the same pupils retested: the verdict says so.
    await act(async () => store.getState().setField('clusters.cohort', 'same'));
    expect(screen.getByTestId('verdict-cohort')).toHaveTextContent(/The same people sit the posttest/);
  });

  it('the table lists the four analyses with cluster-aware SEs and, after a simulation, the naive row with its coverage', async () => {
    const user = userEvent.setup();
    const runner = controlledRunner();
    const { store } = renderApp({ simulation: runner.runner });
    await act(async () => store.getState().loadExample('schools-matched-on-means'));
    const a = store.getState().analytic!;
    const table = screen.getByTestId('comparison-table');
    const pl = a.analyses.personLevelAncova!;
    expect(within(table).getByTestId('cluster-note-personLevelAncova')).toHaveTextContent(
      `Cluster-aware SE ${fmt(pl.se)} (df ${fmtInt(pl.df)}); ignoring the clustering it would be reported as ${fmt(pl.naiveSE)}`,
    );
    expect(within(table).queryByTestId('naive-personLevelAncova')).toBeNull();
    // A seeded simulation (60 replications: enough for figures; their accuracy is tested in test/sim/clusters.test.ts).
    const plan = store.getState().validPlan;
    const sim = simulatePlan(plan, { replications: 60, seed: 5 });
    await user.click(screen.getByRole('button', { name: /Run the simulation/ }));
    await act(async () => runner.runs[0]!.resolve(sim));
    const naive = sim.naivePersonLevel!.personLevelAncova;
    if (naive.feasible === false) throw new Error('naive figures expected');
    const row = screen.getByTestId('naive-personLevelAncova');
    expect(row).toHaveTextContent(/naive SE that ignores the clustering/);
    expect(row).toHaveTextContent(fmtPct(naive.coverage));
    expect(row).toHaveTextContent(`Its mean reported SE was ${fmt(naive.meanModelSE)}`);
  });
});
