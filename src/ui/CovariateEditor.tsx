import { useId } from 'react';
import { PLAN_LIMITS } from '../core/planSchema';
import { useMeanwardStore, useMeanwardStoreApi } from '../state/store';
import { CorrelationMatrixEditor } from './CorrelationMatrixEditor';
import { CheckField, NumberField, TextField } from './fields';

/** Move keyboard focus, once React has drawn the change, to the first of the selectors that finds an enabled element. */
function focusSoon(...selectors: string[]) {
  setTimeout(() => {
    for (const sel of selectors) {
      const el = document.querySelector<HTMLElement>(sel);
      if (el && !(el as HTMLButtonElement).disabled) {
        el.focus();
        return;
      }
    }
  }, 0);
}

/** Problems about a covariate as a whole ("covariates.1"), or the list ("covariates"). */
function useWholeProblems(field: string): string[] {
  return useMeanwardStore((s) => s.problems)
    .filter((p) => p.field === field)
    .map((p) => p.message);
}

function CovariateCard({ index, count }: { index: number; count: number }) {
  const p = `covariates.${index}`;
  const name = useMeanwardStore((s) => s.draft.covariates[index]?.name ?? '');
  const measured = useMeanwardStore((s) => s.draft.covariates[index]?.measured ?? true);
  const exact = useMeanwardStore((s) => s.draft.covariates[index]?.exact ?? false);
  const move = useMeanwardStore((s) => s.moveCovariate);
  const remove = useMeanwardStore((s) => s.removeCovariate);
  const whole = useWholeProblems(p);
  const legendId = useId();
  const number = index + 1;
  const shown = name.trim() || `Covariate ${number}`;
  // Screen readers hear which covariate each box belongs to; the card's heading shows it on screen.
  const who = <span className="visually-hidden">Covariate {number}:</span>;
  const onMove = (step: -1 | 1) => {
    move(index, step);
    // Focus follows the moved covariate: the same button, or the other one at the end of the list.
    const card = `[data-covariate-card="${index + step}"]`;
    focusSoon(`${card} [data-move="${step}"]`, `${card} [data-move="${-step}"]`);
  };
  const onRemove = () => {
    remove(index);
    focusSoon(count > 1 ? `[data-covariate-card="${Math.max(0, index - 1)}"] legend` : '[data-add-covariate]');
  };
  return (
    <li className={`covariate-card${measured ? '' : ' is-unmeasured'}`} data-covariate-card={index}>
      <fieldset aria-labelledby={legendId}>
        <legend id={legendId} tabIndex={-1}>
          Covariate {number}: {shown}
          {!measured && <span className="covariate-tag"> not measured</span>}
          {exact && <span className="covariate-tag"> matched exactly</span>}
        </legend>
        {whole.map((m) => (
          <p key={m} className="field-error" role="alert">
            {m}
          </p>
        ))}
        <TextField path={`${p}.name`} label={<>{who} Name</>} hint="Shown in the matrix, the balance chart and the PDF." />
        <div className="field-pair">
          <NumberField path={`${p}.programmeMean`} label={<>{who} Programme mean</>} step={1} width="narrow" hint="Observed average, programme group." />
          <NumberField path={`${p}.comparisonMean`} label={<>{who} Comparison mean</>} step={1} width="narrow" hint="Observed average, comparison pool." />
        </div>
        <div className="field-pair">
          <NumberField path={`${p}.sd`} label={<>{who} SD within a group</>} step={0.5} min={0} width="narrow" hint="Spread within each group (the same in both)." />
          <NumberField path={`${p}.reliability`} label={<>{who} Reliability</>} step={0.01} min={0.01} max={1} width="narrow" hint="1 for a variable measured without error (age, a recorded category)." />
        </div>
        <NumberField
          path={`${p}.outcomeCorrelation`}
          label={<>{who} Correlation with the outcome</>}
          unit="−1 to 1"
          step={0.05}
          min={-0.99}
          max={0.99}
          width="narrow"
          hint="Within a group, between this covariate as measured and the posttest."
        />
        <CheckField
          path={`${p}.measured`}
          label={<>{who} Measured (used for matching and adjustment)</>}
          hint="Untick for a confounder you know of but will not observe: it is never matched or adjusted on, so the bias it carries remains."
        />
        <CheckField
          path={`${p}.exact`}
          label={<>{who} Match exactly (a category such as sex or school)</>}
          hint="Partners must share its value, whatever the distance. Needs reliability 1."
        />
        <div className="covariate-actions">
          <button type="button" data-move="-1" disabled={index === 0} onClick={() => onMove(-1)} aria-label={`Move covariate ${number} (${shown}) up`}>
            Move up
          </button>
          <button type="button" data-move="1" disabled={index === count - 1} onClick={() => onMove(1)} aria-label={`Move covariate ${number} (${shown}) down`}>
            Move down
          </button>
          <button type="button" className="danger" onClick={onRemove} aria-label={`Remove covariate ${number} (${shown})`}>
            Remove
          </button>
        </div>
      </fieldset>
    </li>
  );
}

/**
 * The covariates beyond the pretest: one card per covariate (add, remove,
 * reorder, mark measured or matched exactly), then their correlation matrix.
 * Every box keeps what was typed; messages come from the plan's validation.
 */
export function CovariateEditor() {
  const count = useMeanwardStore((s) => s.draft.covariates.length);
  const add = useMeanwardStore((s) => s.addCovariate);
  const store = useMeanwardStoreApi();
  const listProblems = useWholeProblems('covariates');
  const full = count >= PLAN_LIMITS.covariatesMax;
  const onAdd = () => {
    add();
    const n = store.getState().draft.covariates.length;
    focusSoon(`[name="covariates.${n - 1}.name"]`);
  };
  return (
    <div className="covariates" data-testid="covariates">
      {listProblems.map((m) => (
        <p key={m} className="field-error" role="alert">
          {m}
        </p>
      ))}
      {count === 0 ? (
        <p className="covariates-empty">None yet: matching and adjustment use the pretest alone (for example, add attendance, a deprivation index or an age band).</p>
      ) : (
        <ol className="covariate-list" aria-label="Covariates besides the pretest">
          {Array.from({ length: count }, (_, i) => (
            <CovariateCard key={i} index={i} count={count} />
          ))}
        </ol>
      )}
      <p className="covariate-add">
        <button type="button" data-add-covariate onClick={onAdd} disabled={full} aria-describedby="covariate-add-hint">
          Add a covariate
        </button>{' '}
        <span id="covariate-add-hint" className="field-hint">
          {full
            ? `A plan can have at most ${PLAN_LIMITS.covariatesMax} covariates besides the pretest.`
            : 'A new covariate starts neutral (no group difference, uncorrelated with everything), so results do not change until you enter its figures.'}
        </span>
      </p>
      {count > 0 && <CorrelationMatrixEditor />}
    </div>
  );
}
