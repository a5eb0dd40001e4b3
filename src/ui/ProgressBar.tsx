/**
 * A progress bar with its percentage beside it (the number is for sight; screen readers get
 * `valueText`). The fill scales on the compositor (transform), so a repaint never re-lays out the page.
 * @example <ProgressBar label="Simulation progress" pct={40} valueText="40% of replications done" />
 */
export function ProgressBar({ label, pct, valueText }: { label: string; pct: number; valueText: string }) {
  return (
    <div className="progress-wrap">
      <div className="progress" role="progressbar" aria-label={label} aria-valuemin={0} aria-valuemax={100} aria-valuenow={pct} aria-valuetext={valueText}>
        <div className="progress-fill" style={{ transform: `scaleX(${pct / 100})` }} />
      </div>
      <span aria-hidden="true">{pct}%</span>
    </div>
  );
}
