import { useDeferredValue, useId, useRef, useState, type DragEvent } from 'react';
import { useMeanwardStore } from '../state/store';
// The pilot reader's actions (the store's pilot slice runs them once this chunk has loaded them).
import '../state/pilotSlice';
import { PilotEstimatesView } from './PilotEstimates';
import { PilotMappingForm } from './PilotMapping';
import { fmtInt } from './format';

const DELIMITER_NAMES: Record<string, string> = { ',': 'comma', '\t': 'tab', ';': 'semicolon' };

/** The pilot panel's body, loaded when the panel is first opened (see PilotPanel). */
export function PilotBody() {
  const pilot = useMeanwardStore((s) => s.pilot);
  const clear = useMeanwardStore((s) => s.clearPilot);
  // The mapping step and the estimates mount in a deferred (interruptible) render, so the
  // message that brings them never holds the page for one long task.
  const showMapping = useDeferredValue(pilot.summary !== null) && pilot.summary !== null;
  const showEstimates = useDeferredValue(pilot.estimates !== null) && pilot.estimates !== null;
  return (
    <div className="pilot-body">
      <p className="pilot-privacy">
        <strong>Your data stay on this computer.</strong> The file is read inside this browser tab; its rows are never sent anywhere and are not
        stored. Saving or sharing the plan keeps only the estimates you choose to use.
      </p>
      <div className="pilot-steps">
        <div className="pilot-step pilot-step-file">
          <h3>1. The file</h3>
          <PilotDropZone />
          {pilot.summary && <PilotFileFacts />}
          {pilot.status !== 'empty' && (
            <button type="button" className="pilot-close" onClick={clear}>
              Close the file
            </button>
          )}
        </div>
        {showMapping && (
          <div className="pilot-step pilot-step-map">
            <h3>2. Which columns mean what</h3>
            <PilotMappingForm />
          </div>
        )}
      </div>
      <p className="pilot-status" role="status" aria-live="polite" data-testid="pilot-status" data-status={pilot.status}>
        {/* A problem is shown (and announced) once, in the alert below. */}
        {pilot.problem ? '' : pilot.announcement}
      </p>
      {pilot.problem && (
        <div className="pilot-problem" role="alert" data-testid="pilot-problem">
          <strong>{problemTitle(pilot.problem.stage)}</strong> {pilot.problem.message}
        </div>
      )}
      {showEstimates && <PilotEstimatesView />}
    </div>
  );
}

function problemTitle(stage: 'read' | 'map' | 'estimate' | 'apply'): string {
  switch (stage) {
    case 'read':
      return 'The file could not be read; your plan is unchanged.';
    case 'map':
      return 'Not yet:';
    case 'estimate':
      return 'No estimates; your plan is unchanged.';
    case 'apply':
      return 'The plan was not changed.';
  }
}

/** A button that opens the file picker and also takes a dropped file. */
function PilotDropZone() {
  const read = useMeanwardStore((s) => s.readPilotFile);
  const status = useMeanwardStore((s) => s.pilot.status);
  const input = useRef<HTMLInputElement>(null);
  const [over, setOver] = useState(false);
  const hintId = useId();
  const take = (file: File | undefined) => {
    if (file) void read(file, file.name);
  };
  const onDrop = (e: DragEvent<HTMLButtonElement>) => {
    e.preventDefault();
    setOver(false);
    take(e.dataTransfer.files[0]);
  };
  const busy = status === 'reading';
  return (
    <div className="pilot-file">
      <button
        type="button"
        className={`pilot-drop${over ? ' is-over' : ''}`}
        aria-describedby={hintId}
        disabled={busy}
        onClick={() => input.current?.click()}
        onDragOver={(e) => {
          e.preventDefault();
          e.dataTransfer.dropEffect = 'copy';
          setOver(true);
        }}
        onDragLeave={() => setOver(false)}
        onDrop={onDrop}
      >
        <span className="pilot-drop-main">{busy ? 'Reading the file…' : 'Choose a pilot file'}</span>
        <span className="pilot-drop-sub">or drop a CSV or TSV file here</span>
      </button>
      <p id={hintId} className="field-hint">
        One row per person: a group column, the pretest (a total score or its items), and optionally a retest and a posttest. A first row of
        column names is recognised.
      </p>
      <input
        ref={input}
        type="file"
        className="visually-hidden"
        tabIndex={-1}
        aria-label="Pilot data file (CSV or TSV)"
        accept=".csv,.tsv,.tab,.txt,text/csv,text/tab-separated-values,text/plain"
        onChange={(e) => {
          take(e.target.files?.[0]);
          e.target.value = ''; // choosing the same file again reads it again
        }}
      />
    </div>
  );
}

/** What was read, and how: delimiter and header, both overridable. */
function PilotFileFacts() {
  const summary = useMeanwardStore((s) => s.pilot.summary)!;
  const options = useMeanwardStore((s) => s.pilot.readOptions);
  const setOptions = useMeanwardStore((s) => s.setPilotReadOptions);
  const delimId = useId();
  const headId = useId();
  const rows = summary.rowCount;
  return (
    <div className="pilot-facts">
      <p data-testid="pilot-file-facts">
        <strong>{summary.fileName}</strong>: {fmtInt(rows)} {rows === 1 ? 'row' : 'rows'} of data, {summary.columns.length} columns, separated by{' '}
        {DELIMITER_NAMES[summary.delimiter] ?? summary.delimiter}s;{' '}
        {summary.hasHeader ? 'the first row holds the column names' : 'no row of column names (columns are numbered)'}
        {summary.commentLines > 0 && `; ${summary.commentLines} comment ${summary.commentLines === 1 ? 'line' : 'lines'} (starting with #) skipped`}.
      </p>
      <div className="pilot-read-options">
        <div className="field">
          <label htmlFor={delimId} className="field-label">
            Columns separated by
          </label>
          <select
            id={delimId}
            value={options.delimiter}
            onChange={(e) => void setOptions({ delimiter: e.target.value as typeof options.delimiter })}
          >
            <option value="auto">Detect ({DELIMITER_NAMES[summary.delimiter] ?? summary.delimiter})</option>
            <option value=",">Commas</option>
            <option value={'\t'}>Tabs</option>
            <option value=";">Semicolons (decimal commas allowed)</option>
          </select>
        </div>
        <div className="field">
          <label htmlFor={headId} className="field-label">
            First row
          </label>
          <select
            id={headId}
            value={String(options.header)}
            onChange={(e) => {
              const v = e.target.value;
              void setOptions({ header: v === 'auto' ? 'auto' : v === 'true' });
            }}
          >
            <option value="auto">Detect ({summary.hasHeader ? 'names' : 'data'})</option>
            <option value="true">Holds the column names</option>
            <option value="false">Is already data</option>
          </select>
        </div>
      </div>
      <PilotPreview />
    </div>
  );
}

function PilotPreview() {
  const summary = useMeanwardStore((s) => s.pilot.summary)!;
  if (summary.preview.length === 0) return null;
  return (
    <details className="pilot-preview">
      <summary>First {summary.preview.length} rows of the file</summary>
      <div className="table-scroll">
        <table>
          <thead>
            <tr>
              {summary.columns.map((c) => (
                <th key={c.name} scope="col">
                  {c.name}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {summary.preview.map((row, i) => (
              <tr key={i}>
                {row.map((cell, j) => (
                  <td key={j}>{cell}</td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </details>
  );
}
