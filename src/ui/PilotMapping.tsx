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
  const ids = {
    group: useId(),
    value: useId(),
    total: useId(),
    combine: useId(),
    retest: useId(),
    posttest: useId(),
    kind: useId(),
    layout: useId(),
    id: useId(),
    occasion: useId(),
    preOcc: useId(),
    retestOcc: useId(),
    postOcc: useId(),
    min: useId(),
    max: useId(),
  };
  const cols = summary.columns;
  const groupCol = cols.find((c) => c.name === m.group);
  const others = groupCol ? groupCol.distinct.filter((v) => v !== m.programmeValue) : [];
  const scoreCols = cols.filter((c) => c.name !== m.group);
  const occasionCol = cols.find((c) => c.name === m.occasionColumn);
  const occasionValues = occasionCol?.distinct ?? [];
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
            {!groupCol ? <option value="">— choose the group column first —</option> : <option value="">— choose —</option>}
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

      <fieldset className="pilot-layout">
        <legend>Rows in the file</legend>
        <div className="mode-switch" role="radiogroup" aria-label="Rows in the file">
          <label>
            <input type="radio" name={ids.layout} checked={m.layout === 'wide'} onChange={() => set({ layout: 'wide' })} />
            One row per person
          </label>
          <label>
            <input type="radio" name={ids.layout} checked={m.layout === 'long'} onChange={() => set({ layout: 'long' })} />
            One row per person per occasion
          </label>
        </div>
        {m.layout === 'long' && (
          <div className="pilot-map-grid">
            <div className="field">
              <label htmlFor={ids.id} className="field-label">
                Person column
              </label>
              <select id={ids.id} value={m.idColumn} onChange={(e) => set({ idColumn: e.target.value })}>
                <option value="">— choose —</option>
                {cols.map(columnOption)}
              </select>
              <p className="field-hint">Rows with the same value here belong to one person.</p>
            </div>
            <div className="field">
              <label htmlFor={ids.occasion} className="field-label">
                Occasion column
              </label>
              <select
                id={ids.occasion}
                value={m.occasionColumn}
                onChange={(e) => set({ occasionColumn: e.target.value, pretestOccasion: '', retestOccasion: '', posttestOccasion: '' })}
              >
                <option value="">— choose —</option>
                {cols.map(columnOption)}
              </select>
            </div>
            {(
              [
                ['pretestOccasion', ids.preOcc, 'Pretest occasion', false],
                ['retestOccasion', ids.retestOcc, 'Retest occasion (optional)', true],
                ['posttestOccasion', ids.postOcc, 'Posttest occasion (optional)', true],
              ] as const
            ).map(([key, id, label, optional]) => (
              <div className="field" key={key}>
                <label htmlFor={id} className="field-label">
                  {label}
                </label>
                <select id={id} value={m[key]} onChange={(e) => set({ [key]: e.target.value })} disabled={!occasionCol}>
                  <option value="">{optional ? 'none' : '— choose —'}</option>
                  {occasionValues.map((v) => (
                    <option key={v} value={v}>
                      {v}
                    </option>
                  ))}
                </select>
              </div>
            ))}
            <p className="field-hint">
              The pretest columns are read from each person’s pretest row; the retest and posttest are the same score at those occasions.
            </p>
          </div>
        )}
      </fieldset>

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
            {m.itemColumns.length > 0 && (
              <fieldset className="pilot-items pilot-reverse" data-testid="pilot-reverse">
                <legend>Reverse-keyed items ({m.reverseColumns.filter((c) => m.itemColumns.includes(c)).length} ticked)</legend>
                <p className="field-hint">A ticked item is read as highest + lowest possible score − score, so a high score means the same on every item.</p>
                <div className="pilot-item-list">
                  {m.itemColumns.map((name) => (
                    <label key={name}>
                      <input
                        type="checkbox"
                        aria-label={`Reverse ${name}`}
                        checked={m.reverseColumns.includes(name)}
                        onChange={(e) =>
                          set({ reverseColumns: e.target.checked ? [...m.reverseColumns, name] : m.reverseColumns.filter((n) => n !== name) })
                        }
                      />
                      {name}
                    </label>
                  ))}
                </div>
                <div className="pilot-map-grid">
                  <div className="field">
                    <label htmlFor={ids.min} className="field-label">
                      Lowest possible item score
                    </label>
                    <input id={ids.min} type="text" inputMode="decimal" value={m.scaleMin} onChange={(e) => set({ scaleMin: e.target.value })} placeholder="e.g. 1" />
                  </div>
                  <div className="field">
                    <label htmlFor={ids.max} className="field-label">
                      Highest possible item score
                    </label>
                    <input id={ids.max} type="text" inputMode="decimal" value={m.scaleMax} onChange={(e) => set({ scaleMax: e.target.value })} placeholder="e.g. 6" />
                  </div>
                </div>
              </fieldset>
            )}
          </>
        )}
      </fieldset>

      {m.layout === 'wide' && <div className="pilot-map-grid">
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
      </div>}
      <button type="submit" className="primary" disabled={status === 'estimating' || status === 'reading'}>
        {status === 'estimating' ? 'Estimating…' : 'Estimate'}
      </button>
    </form>
  );
}
