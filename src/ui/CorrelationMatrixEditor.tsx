import { useId, type KeyboardEvent } from 'react';
import { canonicalField, cellOfField, correlationPath, matrixName } from '../state/covariateDraft';
import type { FieldProblem } from '../state/planDraft';
import { useMeanwardStore } from '../state/store';

/** Problems the matrix shows: cell problems by canonical path, and those about the matrix as a whole. */
export function matrixProblems(problems: readonly FieldProblem[]): { cells: Map<string, string>; whole: string[] } {
  const cells = new Map<string, string>();
  const whole: string[] = [];
  for (const p of problems) {
    if (cellOfField(p.field)) {
      const key = canonicalField(p.field);
      if (!cells.has(key)) cells.set(key, p.message);
    } else if (p.field === 'covariateCorrelations' || /^covariateCorrelations\.\d+$/.test(p.field)) {
      whole.push(p.message);
    }
  }
  return { cells, whole };
}

const STEP = 0.05;

/**
 * The observed within-group correlations among the pretest and the
 * covariates, as an editable symmetric grid: typing in cell (i, j) fills
 * (j, i); the diagonal is fixed at 1. A cell named by a problem is marked in
 * both positions, and its message is listed under the grid and linked to the
 * cell (aria-describedby). Up and down arrow keys step a value by 0.05.
 */
export function CorrelationMatrixEditor() {
  const covariates = useMeanwardStore((s) => s.draft.covariates);
  const matrix = useMeanwardStore((s) => s.draft.covariateCorrelations);
  const problems = useMeanwardStore((s) => s.problems);
  const setCorrelation = useMeanwardStore((s) => s.setCorrelation);
  const baseId = useId();
  const n = covariates.length + 1;
  const { cells, whole } = matrixProblems(problems);
  const messageId = (path: string) => `${baseId}-${path.replace(/\./g, '-')}`;
  const hintId = `${baseId}-hint`;
  const onKeyDown = (i: number, j: number, value: string) => (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key !== 'ArrowUp' && e.key !== 'ArrowDown') return;
    const current = Number(value.trim().replace(',', '.'));
    if (value.trim() === '' || !Number.isFinite(current)) return;
    e.preventDefault();
    const next = Math.max(-0.99, Math.min(0.99, current + (e.key === 'ArrowUp' ? STEP : -STEP)));
    setCorrelation(i, j, String(Number(next.toFixed(2))));
  };
  return (
    <div className="correlation-matrix" data-testid="correlation-matrix">
      <h3 id={`${baseId}-title`}>Correlations among the pretest and the covariates</h3>
      <p id={hintId} className="field-hint">
        Observed correlations within a group (from a pilot, an earlier cohort or the literature). Typing in one cell fills its mirror across the
        diagonal. Arrow up and down step a value by 0.05.
      </p>
      <div className="table-scroll">
        <table aria-labelledby={`${baseId}-title`}>
          <thead>
            <tr>
              <td />
              {Array.from({ length: n }, (_, j) => (
                <th key={j} scope="col">
                  <abbr title={matrixName(covariates, j)}>{j === 0 ? 'Pre' : j}</abbr>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {Array.from({ length: n }, (_, i) => (
              <tr key={i}>
                <th scope="row" title={matrixName(covariates, i)}>
                  {i === 0 ? 'Pretest' : `${i}. ${matrixName(covariates, i)}`}
                </th>
                {Array.from({ length: n }, (_, j) => {
                  if (i === j) {
                    return (
                      <td key={j} className="matrix-diagonal">
                        1
                      </td>
                    );
                  }
                  const path = correlationPath(i, j);
                  const problem = cells.get(path);
                  const value = matrix[i]?.[j] ?? '';
                  return (
                    <td key={j} className={problem ? 'cell-invalid' : undefined}>
                      <input
                        type="text"
                        inputMode="decimal"
                        autoComplete="off"
                        spellCheck={false}
                        // The upper-triangle cell carries the plan path (problem links focus it).
                        name={i < j ? path : `covariateCorrelations.${i}.${j}`}
                        aria-label={`Correlation of ${matrixName(covariates, i)} and ${matrixName(covariates, j)}`}
                        aria-invalid={problem ? true : undefined}
                        aria-describedby={problem ? `${messageId(path)} ${hintId}` : hintId}
                        value={value}
                        onChange={(e) => setCorrelation(i, j, e.target.value, 'typing')}
                        onKeyDown={onKeyDown(i, j, value)}
                      />
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {(cells.size > 0 || whole.length > 0) && (
        <div className="matrix-problems" role="group" aria-label="Problems in the correlation matrix">
          {whole.map((m) => (
            <p key={m} className="field-error" role="alert">
              {m}
            </p>
          ))}
          {[...cells.entries()].map(([path, m]) => {
            const [i, j] = cellOfField(path)!;
            return (
              <p key={path} id={messageId(path)} className="field-error" role="alert">
                <span className="matrix-cell-name">
                  {matrixName(covariates, i)} × {matrixName(covariates, j)}:
                </span>{' '}
                {m}
              </p>
            );
          })}
        </div>
      )}
    </div>
  );
}
