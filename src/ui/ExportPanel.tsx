import { isSelectionDesign } from '../core/design/studyDesign';
import { useId, useMemo, useState } from 'react';
import { version as APP_VERSION } from '../../package.json';
import { downloadFile, downloadFileName, standaloneSvg, svgToPngBlob } from '../io/chartExport';
import { estimatesCsv } from '../io/csvExport';
import { serializePlan } from '../io/planFile';
import type { ReportChart } from '../report/buildReportPdf';
import { CAUTION_LINE } from '../report/reportText';
import { useMeanwardStore } from '../state/store';
import { exportableBalanceChart } from './exportableCharts';

type Status = { kind: 'idle' } | { kind: 'busy'; text: string } | { kind: 'done'; text: string } | { kind: 'error'; text: string };

/**
 * Downloads: the PDF summary, the plan file, the simulated estimates as CSV,
 * and each chart as SVG or PNG. Every button says why when it is unavailable
 * (plan has problems, no simulation yet). The PDF code loads only when used.
 */
export function ExportPanel() {
  const plan = useMeanwardStore((s) => s.validPlan);
  const problems = useMeanwardStore((s) => s.problems.length);
  const analytic = useMeanwardStore((s) => s.analytic);
  const simState = useMeanwardStore((s) => s.simulation);
  const [status, setStatus] = useState<Status>({ kind: 'idle' });
  const variants = useMeanwardStore((s) => s.variants);
  const compareIds = useMeanwardStore((s) => s.compareIds);
  const compared = compareIds.map((id) => variants.find((v) => v.id === id)).filter((v) => v !== undefined);
  const [withComparison, setWithComparison] = useState(true);
  // The design explorer's last grid, once it has figures and is not still running (the PDF leaves out a grid of another plan, and says so).
  const explorer = useMeanwardStore((s) => (s.explorer.status !== 'running' && s.explorer.result?.cells.some((c) => c.status === 'done') ? s.explorer.result : null));
  const [charts, setCharts] = useState<ReportChart[] | null>(null);
  const reasonId = useId();
  const simReasonId = useId();

  const sim = simState.result && !simState.stale ? simState.result : null;
  const planReason =
    problems > 0
      ? `Exports are unavailable while the plan has ${problems === 1 ? 'a problem' : `${problems} problems`}: fix the fields marked in the form first.`
      : analytic === null
        ? 'Exports become available once the plan has been analysed.'
        : null;
  const simReason = planReason
    ? planReason
    : sim === null
      ? simState.status === 'running'
        ? 'The simulation is still running; the estimates file will be ready when it finishes.'
        : 'Run the simulation first: the estimates file lists each simulated study.'
      : null;

  // Chart drawings depend on the results only; redraw them when those change.
  const chartsKey = useMemo(() => ({ plan, analytic, sim }), [plan, analytic, sim]);
  const [chartsFor, setChartsFor] = useState<typeof chartsKey | null>(null);
  const currentCharts = chartsFor === chartsKey ? charts : null;

  const run = async (label: string, job: () => Promise<string>) => {
    // Buttons stay focusable while a job runs (aria-disabled): a second press waits for the first.
    if (status.kind === 'busy') return;
    setStatus({ kind: 'busy', text: `${label}…` });
    try {
      setStatus({ kind: 'done', text: await job() });
    } catch (e) {
      setStatus({ kind: 'error', text: `${label} failed: ${e instanceof Error ? e.message : String(e)}` });
    }
  };

  const loadCharts = async (): Promise<ReportChart[]> => {
    if (!analytic) return [];
    if (currentCharts) return currentCharts;
    const { reportCharts } = await import('../report/reportCharts');
    const drawn = reportCharts(plan, analytic, sim);
    setCharts(drawn);
    setChartsFor(chartsKey);
    return drawn;
  };

  const onPdf = () =>
    run('Making the PDF summary', async () => {
      if (!analytic) throw new Error('the plan has not been analysed');
      const [{ buildReportPdf }, drawn, { reportComparison }] = await Promise.all([
        import('../report/buildReportPdf'),
        loadCharts(),
        import('../report/reportComparison'),
      ]);
      const comparison =
        withComparison && compared.length >= 2 ? reportComparison(compared.map((v) => ({ name: v.name, plan: v.plan, analysisId: v.analysisId }))) : null;
      const bytes = await buildReportPdf({
        ...(comparison ? { comparison } : {}),
        ...(explorer ? { explorer } : {}),
        plan,
        analytic,
        simulation: sim,
        charts: drawn.filter((c) => c.svg !== ''),
        appVersion: APP_VERSION,
        generatedAt: new Date(),
      });
      downloadFile(bytes, downloadFileName(plan.title, 'summary', 'pdf'), 'application/pdf');
      return sim
        ? 'PDF summary downloaded.'
        : 'PDF summary downloaded, with closed-form figures only: run the simulation to add simulated figures.';
    });

  const onPlan = () =>
    run('Saving the plan file', async () => {
      downloadFile(serializePlan(plan), downloadFileName(plan.title, 'plan', 'json'), 'application/json');
      return 'Plan file downloaded.';
    });

  const onCsv = () =>
    run('Saving the estimates', async () => {
      if (!sim) throw new Error('no simulation yet');
      downloadFile(estimatesCsv(sim), downloadFileName(plan.title, 'estimates', 'csv'), 'text/csv');
      return `Estimates of ${sim.replications} simulated studies downloaded (CSV).`;
    });

  const onChart = (id: string, format: 'svg' | 'png') =>
    run(`Saving the chart as ${format.toUpperCase()}`, async () => {
      const chart = (await loadCharts()).find((c) => c.id === id);
      if (!chart || chart.svg === '') throw new Error(chart?.caption ?? 'the chart is not available');
      const name = downloadFileName(plan.title, `chart-${id}`, format);
      if (format === 'svg') downloadFile(standaloneSvg(chart.svg), name, 'image/svg+xml');
      else downloadFile(await svgToPngBlob(chart.svg, 2), name, 'image/png');
      return `Chart “${chart.title}” downloaded (${format.toUpperCase()}).`;
    });

  const busy = status.kind === 'busy';
  const chartIds: { id: string; name: string }[] = [
    { id: 'pretest', name: isSelectionDesign(plan) ? 'Who the rule selects' : 'Pretest distributions' },
    { id: 'estimates', name: 'Estimates by analysis' },
    { id: 'sensitivity', name: 'Sensitivity' },
    ...exportableBalanceChart(plan, analytic, sim),
  ];

  return (
    <div className="export-panel">
      <h2>Exports</h2>
      <p className="export-caution" data-testid="export-caution">
        <strong>Caution:</strong> {CAUTION_LINE}
      </p>
      {planReason && (
        <p id={reasonId} className="export-reason" role="note">
          {planReason}
        </p>
      )}
      {compared.length >= 2 && (
        <label className="export-option">
          <input type="checkbox" checked={withComparison} onChange={(e) => setWithComparison(e.target.checked)} /> Include the comparison of the{' '}
          {compared.length} candidate plans ticked in &ldquo;Candidate plans side by side&rdquo;
        </label>
      )}
      <div className="export-buttons" role="group" aria-label="Download" style={{ display: 'flex', flexWrap: 'wrap', gap: '0.5rem', margin: '0.4rem 0' }}>
        <button type="button" className="primary" onClick={() => void onPdf()} disabled={planReason !== null} aria-disabled={busy || undefined} aria-describedby={planReason ? reasonId : undefined}>
          Download PDF summary
        </button>
        <button type="button" onClick={() => void onPlan()} disabled={planReason !== null} aria-disabled={busy || undefined} aria-describedby={planReason ? reasonId : undefined}>
          Plan file (JSON)
        </button>
        <button type="button" onClick={() => void onCsv()} disabled={simReason !== null} aria-disabled={busy || undefined} aria-describedby={planReason ? reasonId : simReason ? simReasonId : undefined}>
          Estimates CSV
        </button>
      </div>
      {simReason && !planReason && (
        <p id={simReasonId} className="export-reason">
          {simReason}
        </p>
      )}
      {!planReason && !sim && (
        <p className="export-reason">The PDF summary will say that no simulation has been run and show the closed-form figures only.</p>
      )}
      <h3>Charts</h3>
      <ul className="export-charts" style={{ display: 'flex', flexWrap: 'wrap', gap: '0.4rem 1.5rem', listStyle: 'none', padding: 0 }}>
        {chartIds.map((c) => (
          <li key={c.id}>
            <span>{c.name}</span>{' '}
            <button type="button" onClick={() => void onChart(c.id, 'svg')} disabled={planReason !== null} aria-disabled={busy || undefined} aria-label={`${c.name} chart as SVG`} aria-describedby={planReason ? reasonId : undefined}>
              SVG
            </button>{' '}
            <button type="button" onClick={() => void onChart(c.id, 'png')} disabled={planReason !== null} aria-disabled={busy || undefined} aria-label={`${c.name} chart as PNG`} aria-describedby={planReason ? reasonId : undefined}>
              PNG
            </button>
          </li>
        ))}
      </ul>
      <p role="status" aria-live="polite" className={`export-status ${status.kind}`} data-testid="export-status">
        {status.kind === 'idle' ? '' : status.text}
      </p>
    </div>
  );
}
