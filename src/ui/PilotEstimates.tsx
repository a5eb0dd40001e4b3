import { useId, useMemo } from 'react';
import { pilotReliabilityOptions } from '../pilot/pilotPlanUpdate';
import type { Plan } from '../core/plan';
import type { GroupEstimates, Interval } from '../pilot/types';
import { FIELD_NAMES } from '../state/planDraft';
import { useMeanwardStore } from '../state/store';
import { fmt, fmtInt, fmtR, fmtSigned } from './format';

/** "0.81 (95% CI .76–.85)": an estimate and its interval, as given by src/pilot. */
function withInterval(x: { value: number; lower: number; upper: number; level: number }): string {
  return `${fmtR(x.value)} (${Math.round(x.level * 100)}% CI ${fmtR(x.lower)}–${fmtR(x.upper)})`;
}

/** A plan value for display: coefficients without the leading zero, scores to 2 decimals. */
function fieldValue(path: string, v: unknown): string {
  if (typeof v !== 'number') return '—';
  return /reliability|Correlation/.test(path) ? fmtR(v, 3) : fmt(v, 2);
}

function planValue(plan: Plan, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), plan);
}

function alphaText(a: Interval & { n: number; items?: number }): string {
  return `${withInterval(a)}, n = ${fmtInt(a.n)}${a.items !== undefined ? `, ${a.items} items` : ''}`;
}

/**
 * The estimates from the pilot file, per group and pooled, each with its n;
 * the reliability coefficients (which is which); rows left out and why; the
 * warnings; and the buttons that write them into the plan.
 */
export function PilotEstimatesView() {
  const e = useMeanwardStore((s) => s.pilot.estimates)!;
  const lastApply = useMeanwardStore((s) => s.pilot.lastApply);
  const P = e.groups.programme;
  const C = e.groups.comparison;
  const progName = e.mapping?.programmeValue ?? 'programme';
  const rel = e.reliability;
  const hasPost = P.posttestSD !== undefined || C.posttestSD !== undefined;
  const cell = (g: GroupEstimates, f: (g: GroupEstimates) => string | undefined) => <td>{f(g) ?? '—'}</td>;
  return (
    <div className="pilot-estimates" data-testid="pilot-estimates">
      <h3>3. What the file says</h3>
      <p className="pilot-rows" data-testid="pilot-rows">
        {fmtInt(e.rowsUsed)} of {fmtInt(e.rowsRead)} rows used
        {e.rowsDropped > 0 ? `; ${fmtInt(e.rowsDropped)} left out.` : '.'} {e.droppedReason}
      </p>
      {e.warnings.length > 0 && (
        <div className="pilot-warnings" data-testid="pilot-warnings">
          <h4>Read before using these values</h4>
          <ul>
            {e.warnings.map((w) => (
              <li key={w.code + w.message} data-code={w.code}>
                {w.message}
              </li>
            ))}
          </ul>
        </div>
      )}
      <div className="pilot-estimate-grid">
        <div className="pilot-estimate-main">
          <div className="table-scroll">
            <table className="pilot-table" data-testid="pilot-group-table">
              <caption>By group (and pooled within groups)</caption>
              <thead>
                <tr>
                  <th scope="col">Quantity</th>
                  <th scope="col">Programme (“{progName}”)</th>
                  <th scope="col">Comparison (“{e.groups.comparisonValue}”)</th>
                  <th scope="col">Pooled within groups</th>
                </tr>
              </thead>
              <tbody>
                <tr>
                  <th scope="row">People used (n)</th>
                  {cell(P, (g) => fmtInt(g.n))}
                  {cell(C, (g) => fmtInt(g.n))}
                  <td>{fmtInt(e.rowsUsed)}</td>
                </tr>
                <tr>
                  <th scope="row">Pretest mean</th>
                  {cell(P, (g) => fmt(g.pretestMean))}
                  {cell(C, (g) => fmt(g.pretestMean))}
                  <td>—</td>
                </tr>
                <tr>
                  <th scope="row">Pretest SD</th>
                  {cell(P, (g) => fmt(g.pretestSD))}
                  {cell(C, (g) => fmt(g.pretestSD))}
                  <td>{fmt(e.pooledWithinSD)}</td>
                </tr>
                {hasPost && (
                  <>
                    <tr>
                      <th scope="row">Posttest SD</th>
                      {cell(P, (g) => (g.posttestSD === undefined ? undefined : fmt(g.posttestSD)))}
                      {cell(C, (g) => (g.posttestSD === undefined ? undefined : fmt(g.posttestSD)))}
                      <td>—</td>
                    </tr>
                    <tr>
                      <th scope="row">Pre–post correlation</th>
                      {cell(P, (g) => (g.prePostCorrelation === undefined ? undefined : `${fmtR(g.prePostCorrelation)} (n = ${fmtInt(g.nPrePost)})`))}
                      {cell(C, (g) => (g.prePostCorrelation === undefined ? undefined : `${fmtR(g.prePostCorrelation)} (n = ${fmtInt(g.nPrePost)})`))}
                      <td>{e.prePostCorrelation ? `${fmtR(e.prePostCorrelation.value)} (n = ${fmtInt(e.prePostCorrelation.n)})` : '—'}</td>
                    </tr>
                  </>
                )}
              </tbody>
            </table>
          </div>
          {e.prePostByGroup && (
            <p className={e.prePostByGroup.differ ? 'pilot-note is-warning' : 'pilot-note'} data-testid="pilot-prepost-by-group">
              {e.prePostByGroup.message}
            </p>
          )}
          <dl className="pilot-gap" data-testid="pilot-gap">
            <dt>Pretest gap, programme minus comparison</dt>
            <dd>
              {fmtSigned(e.gap.points)} points; SMD {fmtSigned(e.gap.smd)} (on the pooled within-group SD {fmt(e.pooledWithinSD)})
            </dd>
          </dl>
        </div>
        <div className="pilot-estimate-side">
          <h4>Reliability of the pretest</h4>
          {!rel.alpha && !rel.splitHalf && !rel.testRetest ? (
            <p>None: map item columns (for alpha and split-half) or a retest column (for test–retest).</p>
          ) : (
            <dl className="pilot-reliability" data-testid="pilot-reliability">
              {rel.alpha && (
                <>
                  <dt>Cronbach’s alpha, pooled within groups (Feldt CI)</dt>
                  <dd data-testid="pilot-alpha">{alphaText(rel.alpha)}</dd>
                </>
              )}
              {rel.alphaByGroup && (
                <>
                  <dt>Alpha in each group</dt>
                  <dd>
                    programme {alphaText(rel.alphaByGroup.programme)}; comparison {alphaText(rel.alphaByGroup.comparison)}
                  </dd>
                </>
              )}
              {rel.splitHalf && (
                <>
                  <dt>Split-half (odd vs even items), stepped up by Spearman–Brown</dt>
                  <dd>
                    {fmtR(rel.splitHalf.spearmanBrown)} (correlation of the halves {fmtR(rel.splitHalf.halfCorrelation)}, n = {fmtInt(rel.splitHalf.n)})
                  </dd>
                </>
              )}
              {rel.testRetest && (
                <>
                  <dt>Test–retest correlation, pooled within groups (Fisher z CI)</dt>
                  <dd data-testid="pilot-retest">
                    {withInterval(rel.testRetest)}, n = {fmtInt(rel.testRetest.n)}
                  </dd>
                </>
              )}
            </dl>
          )}
          <p className="field-hint">
            Alpha and split-half describe how consistently the items measure on one occasion; test–retest describes how stable scores are over time
            (it also counts real change as error). Alpha is a lower bound to the reliability when the items do not all measure the true score
            equally (not tau-equivalent). Within-group values are what the plan needs: the spread of the two groups together would inflate them.
          </p>
          {e.itemTotal && e.itemTotal.length > 0 && (
            <details className="pilot-items-detail">
              <summary>Corrected item–total correlations</summary>
              <table className="pilot-table">
                <thead>
                  <tr>
                    <th scope="col">Item</th>
                    <th scope="col">Correlation with the rest</th>
                  </tr>
                </thead>
                <tbody>
                  {e.itemTotal.map((it) => (
                    <tr key={it.column} className={it.correctedCorrelation < 0 ? 'is-negative' : undefined}>
                      <th scope="row">{it.column}</th>
                      <td>{fmtR(it.correctedCorrelation)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </details>
          )}
        </div>
      </div>

      <PilotReliabilityChoice />
      <PilotIntoPlan />
      {lastApply && <PilotApplyReport />}
      <PilotOffers />
      <p className="caution">
        Pilot estimates carry the pilot’s sampling error and its population; a small or unusual pilot can mislead. They inform the plan; they
        do not replace a statistician’s judgement.
      </p>
    </div>
  );
}

/**
 * Which reliability goes into the plan: alpha, or the test–retest figure when
 * a retest was mapped, each with why (src/pilot's pilotReliabilityOptions).
 */
function PilotReliabilityChoice() {
  const e = useMeanwardStore((s) => s.pilot.estimates)!;
  const chosen = useMeanwardStore((s) => s.pilot.reliabilitySource);
  const choose = useMeanwardStore((s) => s.setPilotReliabilitySource);
  const name = useId();
  const options = pilotReliabilityOptions(e);
  if (options.length === 0) return null;
  const current = chosen ?? options.find((o) => o.recommended)?.source;
  return (
    <fieldset className="pilot-reliability-choice" data-testid="pilot-reliability-choice">
      <legend>Reliability for the plan</legend>
      {options.map((o) => (
        <label key={o.source} className="pilot-choice">
          <input type="radio" name={name} value={o.source} checked={current === o.source} onChange={() => choose(o.source)} />
          <span>
            <strong>
              {o.label}
              {o.recommended ? ' (suggested)' : ''}
            </strong>
            <span className="field-hint"> {o.why}</span>
          </span>
        </label>
      ))}
    </fieldset>
  );
}

/** Questions left by "Use these values": asked, never answered silently. */
function PilotOffers() {
  const offers = useMeanwardStore((s) => s.pilot.offers);
  const accept = useMeanwardStore((s) => s.acceptPilotOffer);
  const dismiss = useMeanwardStore((s) => s.dismissPilotOffer);
  if (offers.length === 0) return null;
  return (
    <div className="pilot-offers" role="group" aria-label="Also change?" data-testid="pilot-offers">
      {offers.map((o) => (
        <div key={o.path} className="pilot-offer" data-path={o.path}>
          <p>{o.message}</p>
          <button type="button" className="primary" onClick={() => accept(o.path)}>
            Use {fmtR(o.proposed, 3)} for the corrected ANCOVA
          </button>{' '}
          <button type="button" onClick={() => dismiss(o.path)}>
            Keep {fmtR(o.current, 3)}
          </button>
        </div>
      ))}
    </div>
  );
}

function PilotApplyReport() {
  const r = useMeanwardStore((s) => s.pilot.lastApply)!;
  const name = (path: string) => FIELD_NAMES[path] ?? path;
  return (
    <div className="pilot-report" data-testid="pilot-apply-report">
      {r.applied.length > 0 ? (
        <>
          <h4>Now in the plan{r.pessimistic ? ' (reliability at the lower end of its interval)' : ''}</h4>
          <ul>
            {r.applied.map((a) => (
              <li key={a.path} data-path={a.path}>
                <strong>{name(a.path)}</strong> {fieldValue(a.path, a.value)}: {a.note}
              </li>
            ))}
          </ul>
        </>
      ) : (
        <p>No plan field was changed.</p>
      )}
      {r.skipped.length > 0 && (
        <>
          <h4>Left as they were</h4>
          <ul>
            {r.skipped.map((s) => (
              <li key={s.path} data-path={s.path}>
                <strong>{name(s.path)}</strong>: {s.reason}
              </li>
            ))}
          </ul>
        </>
      )}
    </div>
  );
}

/**
 * What the buttons will write, before they are pressed: each field with its
 * value in the plan now and the pilot's value, and the fields that will be
 * left as they are, with the rule that keeps them out.
 */
function PilotIntoPlan() {
  const estimates = useMeanwardStore((s) => s.pilot.estimates);
  const plan = useMeanwardStore((s) => s.validPlan);
  const previewOf = useMeanwardStore((s) => s.previewPilotUpdate);
  const apply = useMeanwardStore((s) => s.applyPilotEstimates);
  const applyPessimistic = useMeanwardStore((s) => s.applyPessimisticPilotEstimates);
  // Recomputed when the plan or the estimates change (previewOf reads both from the store).
  const preview = useMemo(() => previewOf(), [previewOf, plan, estimates]);
  const name = (path: string) => FIELD_NAMES[path] ?? path;
  const low = preview?.pessimistic;
  const reliabilityLeftOut = preview?.update.skipped.some((k) => k.path === 'pretest.reliability') ?? false;
  return (
    <div className="pilot-into">
      <h3>4. Into the plan</h3>
      {preview && (
        <table className="pilot-table" data-testid="pilot-preview">
          <caption>What “Use these values” writes into the plan</caption>
          <thead>
            <tr>
              <th scope="col">Plan field</th>
              <th scope="col">In the plan now</th>
              <th scope="col">From the pilot</th>
            </tr>
          </thead>
          <tbody>
            {preview.update.applied.map((a) => (
              <tr key={a.path} data-path={a.path}>
                <th scope="row">{name(a.path)}</th>
                <td>{fieldValue(a.path, planValue(plan, a.path))}</td>
                <td>{fieldValue(a.path, a.value)}</td>
              </tr>
            ))}
            {preview.update.skipped.map((k) => (
              <tr key={k.path} data-path={k.path} className="is-skipped">
                <th scope="row">{name(k.path)}</th>
                <td>{fieldValue(k.path, planValue(plan, k.path))}</td>
                <td>
                  {fieldValue(k.path, k.value)}, left out. {k.reason.replace(/^Not written: /, '')}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <div className="pilot-apply">
        <button type="button" className="primary" onClick={apply}>
          Use these values
        </button>
        <button type="button" onClick={applyPessimistic} disabled={!low?.ok} aria-describedby="pilot-pessimistic-hint">
          Plan with the pessimistic reliability{low?.ok ? ` (${fmtR(low.reliability, 3)})` : ''}
        </button>
        <p id="pilot-pessimistic-hint" className="field-hint">
          {low?.ok
            ? 'Writes the same values, with the reliability at the lower end of its 95% confidence interval: the artefact the plan then shows is one the pilot cannot rule out.'
            : reliabilityLeftOut
              ? 'The pilot’s reliability is left out of the plan (see above), so there is no pessimistic value to plan with.'
              : (low?.reason ?? 'Needs a reliability with a confidence interval (item columns or a retest column).')}
        </p>
      </div>
    </div>
  );
}
