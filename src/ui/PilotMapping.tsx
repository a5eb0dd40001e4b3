import { useId } from 'react';
import type { ColumnFacts } from '../pilot/pilotWorkerProtocol';
import { useMeanwardStore } from '../state/store';

/** A column's name in a list of choices, flagged when it holds text (it cannot be a score). */
function columnOption(c: ColumnFacts) {
  return (
    <option key={c.name} value={c.name}>
      {c.name}
      {c.looksNumeric ? '' : ' (has text)'}
    </option>
  );
}

/**
 * The column mapping: the group column and the programme group's value; the
 * pretest as one total column or as items (summed or averaged); optional
 * retest and posttest columns. Remembered for the session by the file's
 * column names.
 */
export function PilotMappingForm() {
  const summary = useMeanwardStore((s) => s.pilot.summary)!;
  const m = useMeanwardStore((s) => s.pilot.mapping);
  const remembered = useMeanwardStore((s) => s.pilot.mappingRemembered);
  const status = useMeanwardStore((s) => s.pilot.status);
  const set = useMeanwardStore((s) => s.setPilotMapping);
  const estimate = useMeanwardStore((s) => s.estimateFromPilot);
  const ids = { group: useId(), value: useId(), total: useId(), combine: useId(), retest: useId(), posttest: useId(), kind: useId() };
  const cols = summary.columns;
  const groupCol = cols.find((c) => c.name === m.group);
  const others = groupCol ? groupCol.distinct.filter((v) => v !== m.programmeValue) : [];
  const scoreCols = cols.filter((c) => c.name !== m.group);
  return (
    <form
      className="pilot-mapping"
      aria-label="Pilot column mapping"
      onSubmit={(e) => {
        e.preventDefault();
        void estimate();
      }}
      noValidate
    >
      {remembered && <p className="field-hint">Restored from the last file with these columns in this session.</p>}
      <div className="pilot-map-grid">
        <div className="field">
          <label htmlFor={ids.group} className="field-label">
            Group column
          </label>
          <select id={ids.group} value={m.group} onChange={(e) => set({ group: e.target.value })}>
            <option value="">— choose —</option>
            {cols.map((c) => (
              <option key={c.name} value={c.name}>
                {c.name}
              </option>
            ))}
          </select>
        </div>
        <div className="field">
          <label htmlFor={ids.value} className="field-label">
            Programme group is
          </label>
          <select id={ids.value} value={m.programmeValue} onChange={(e) => set({ programmeValue: e.target.value })} disabled={!groupCol}>
            {!groupCol && <option value="">— choose the group column first —</option>}
            {groupCol?.distinct.map((v) => (
              <option key={v} value={v}>
                {v}
              </option>
            ))}
          </select>
          <p className="field-hint">
            {groupCol
              ? groupCol.moreDistinct
                ? `“${groupCol.name}” has more than ${groupCol.distinct.length} different values: is it really the group column? Every value other than the programme’s counts as comparison.`
                : others.length > 0
                  ? `Comparison group: ${others.map((v) => `“${v}”`).join(', ')}.`
                  : 'This column has only one value: the file needs rows from both groups.'
              : 'Rows with this value form the programme group; all others the comparison group.'}
          </p>
        </div>
      </div>

      <fieldset className="pilot-pretest">
        <legend>Pretest</legend>
        <div className="mode-switch" role="radiogroup" aria-label="The pretest is given as">
          <label>
            <input type="radio" name={ids.kind} checked={m.pretestKind === 'total'} onChange={() => set({ pretestKind: 'total' })} />
            One total-score column
          </label>
          <label>
            <input type="radio" name={ids.kind} checked={m.pretestKind === 'items'} onChange={() => set({ pretestKind: 'items' })} />
            Item columns
          </label>
        </div>
        {m.pretestKind === 'total' ? (
          <div className="field">
            <label htmlFor={ids.total} className="field-label">
              Pretest total column
            </label>
            <select id={ids.total} value={m.pretestColumn} onChange={(e) => set({ pretestColumn: e.target.value })}>
              <option value="">— choose —</option>
              {scoreCols.map(columnOption)}
            </select>
            <p className="field-hint">With a total only, the reliability cannot be estimated unless a retest column is given.</p>
          </div>
        ) : (
          <>
            <fieldset className="pilot-items">
              <legend>Item columns ({m.itemColumns.length} ticked)</legend>
              <div className="pilot-item-list">
                {scoreCols.map((c) => (
                  <label key={c.name}>
                    <input
                      type="checkbox"
                      checked={m.itemColumns.includes(c.name)}
                      onChange={(e) =>
                        set({
                          itemColumns: e.target.checked
                            ? cols.map((x) => x.name).filter((n) => n === c.name || m.itemColumns.includes(n))
                            : m.itemColumns.filter((n) => n !== c.name),
                        })
                      }
                    />
                    {c.name}
                    {c.looksNumeric ? '' : ' (has text)'}
                  </label>
                ))}
              </div>
            </fieldset>
            <div className="field">
              <label htmlFor={ids.combine} className="field-label">
                Pretest score = the items’
              </label>
              <select id={ids.combine} value={m.combine} onChange={(e) => set({ combine: e.target.value as 'sum' | 'mean' })}>
                <option value="sum">sum</option>
                <option value="mean">mean</option>
              </select>
            </div>
          </>
        )}
      </fieldset>

      <div className="pilot-map-grid">
        <div className="field">
          <label htmlFor={ids.retest} className="field-label">
            Retest column (optional)
          </label>
          <select id={ids.retest} value={m.retest} onChange={(e) => set({ retest: e.target.value })}>
            <option value="">none</option>
            {scoreCols.map(columnOption)}
          </select>
          <p className="field-hint">The same test taken again: gives a test–retest reliability.</p>
        </div>
        <div className="field">
          <label htmlFor={ids.posttest} className="field-label">
            Posttest column (optional)
          </label>
          <select id={ids.posttest} value={m.posttest} onChange={(e) => set({ posttest: e.target.value })}>
            <option value="">none</option>
            {scoreCols.map(columnOption)}
          </select>
          <p className="field-hint">Gives the posttest SD and the pre–post correlation.</p>
        </div>
      </div>
      <button type="submit" className="primary" disabled={status === 'estimating' || status === 'reading'}>
        {status === 'estimating' ? 'Estimating…' : 'Estimate'}
      </button>
    </form>
  );
}
