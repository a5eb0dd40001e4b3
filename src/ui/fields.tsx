import { useId, type KeyboardEvent, type ReactNode } from 'react';
import { draftProvenance } from '../state/draftSlice';
import { selectProblemFor } from '../state/selectors';
import { useMeanwardStore } from '../state/store';

/** Read a dotted path from the draft. */
function readPath(obj: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), obj);
}

function decimals(step: number): number {
  const s = String(step);
  const i = s.indexOf('.');
  return i < 0 ? 0 : s.length - i - 1;
}

/** What every field needs: its ids, the typed value, its problem and the setter. */
function useFieldBinding<V>(path: string) {
  const id = useId();
  const value = useMeanwardStore((s) => readPath(s.draft, path)) as V;
  const problem = useMeanwardStore(selectProblemFor(path));
  const setField = useMeanwardStore((s) => s.setField);
  const typeField = useMeanwardStore((s) => s.typeField);
  // Where the value came from (e.g. a pilot file), when the plan records it.
  const recorded = useMeanwardStore((s) => draftProvenance(s.draft)?.[path]);
  // Values from a pilot file, and starting values taken from a preset (recorded as entered, with their source), say where they came from.
  const source = recorded?.source === 'pilot' || recorded?.source === 'entered' ? recorded : undefined;
  const hintId = `${id}-hint`;
  const errId = `${id}-err`;
  const srcId = `${id}-src`;
  const described = [problem ? errId : '', hintId, source ? srcId : ''].filter(Boolean).join(' ');
  const inputAria = {
    'aria-invalid': problem ? true : undefined,
    'aria-describedby': described,
  } as const;
  return { id, value, problem, setField, typeField, hintId, errId, inputAria, source, srcId };
}

/** Where a value came from, under its field (recorded for values from a pilot file). */
function SourceNote({ srcId, source }: { srcId: string; source: { note: string } | undefined }) {
  if (!source) return null;
  return (
    <p id={srcId} className="field-source" data-testid="field-source">
      {source.note}
    </p>
  );
}

/** The hint under a field and, when there is one, its problem (announced). */
function FieldNotes({ hintId, errId, hint, problem }: { hintId: string; errId: string; hint: ReactNode; problem: string | undefined | null }) {
  return (
    <>
      <p id={hintId} className="field-hint">
        {hint}
      </p>
      {problem && (
        <p id={errId} className="field-error" role="alert">
          {problem}
        </p>
      )}
    </>
  );
}

interface NumberFieldProps {
  /** Dotted plan path, e.g. "pretest.reliability". */
  path: string;
  label: ReactNode;
  /** Unit shown after the box ("points", "SD of the pooled pretest"…). */
  unit?: string;
  /** Short plain-language hint under the label. */
  hint: ReactNode;
  /** Amount the arrow keys add or take away. */
  step: number;
  /** Smallest value the arrow keys go down to. */
  min?: number;
  max?: number;
  /** Optional extra text after the message (e.g. derived values). */
  after?: ReactNode;
  inputMode?: 'decimal' | 'numeric';
  width?: 'narrow' | 'normal';
}

/**
 * A labelled text box for a number. It is a text input, not type=number, so
 * whatever the user types stays exactly as typed even when it is not (yet) a
 * valid number; the store validates it and the message appears beside it.
 * Up and down arrow keys step the value.
 */
export function NumberField({ path, label, unit, hint, step, min, max, after, inputMode = 'decimal', width = 'normal' }: NumberFieldProps) {
  const { id, value, problem, setField, typeField, hintId, errId, inputAria, source, srcId } = useFieldBinding<string>(path);
  const onKeyDown = (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key !== 'ArrowUp' && e.key !== 'ArrowDown') return;
    const current = Number(value.trim().replace(',', '.'));
    if (value.trim() === '' || !Number.isFinite(current)) return;
    e.preventDefault();
    let next = current + (e.key === 'ArrowUp' ? step : -step);
    if (min !== undefined) next = Math.max(min, next);
    if (max !== undefined) next = Math.min(max, next);
    // Round to the step's decimals so repeated steps never show 0.30000000000000004.
    setField(path, String(Number(next.toFixed(decimals(step)))));
  };
  const notes = (
    <>
      <FieldNotes hintId={hintId} errId={errId} hint={hint} problem={problem} />
      <SourceNote srcId={srcId} source={source} />
      {after}
    </>
  );
  return (
    <LabelledField path={path} id={id} label={label} problem={problem} notes={notes}>
      <div className="field-input-row">
        <input
          id={id}
          name={path}
          type="text"
          inputMode={inputMode}
          autoComplete="off"
          spellCheck={false}
          className={width === 'narrow' ? 'input-narrow' : undefined}
          value={value}
          {...inputAria}
          onChange={(e) => typeField(path, e.target.value)}
          onKeyDown={onKeyDown}
        />
        {unit && <span className="field-unit">{unit}</span>}
      </div>
    </LabelledField>
  );
}

/** The frame every labelled field shares: the label above the control, then its hint and problem. */
function LabelledField({
  path,
  id,
  label,
  problem,
  notes,
  children,
}: {
  path: string;
  id: string;
  label: ReactNode;
  problem: string | undefined;
  notes: ReactNode;
  children: ReactNode;
}) {
  return (
    <div className={`field${problem ? ' field-invalid' : ''}`} data-field={path}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      {children}
      {notes}
    </div>
  );
}

/** A field's plan path, its label and its plain-language hint. */
interface BasicFieldProps {
  path: string;
  label: ReactNode;
  hint: ReactNode;
}

/** A labelled free-text box (names and titles). */
export function TextField({ path, label, hint }: BasicFieldProps) {
  const { id, value, problem, typeField, hintId, errId, inputAria } = useFieldBinding<string>(path);
  const notes = <FieldNotes hintId={hintId} errId={errId} hint={hint} problem={problem} />;
  return (
    <LabelledField path={path} id={id} label={label} problem={problem} notes={notes}>
      <input
        id={id}
        name={path}
        type="text"
        autoComplete="off"
        value={value}
        {...inputAria}
        onChange={(e) => typeField(path, e.target.value)}
      />
    </LabelledField>
  );
}

interface ChoiceFieldProps<T extends string> extends BasicFieldProps {
  options: { value: T; label: string }[];
}

/** A labelled drop-down for a string-union option. */
export function ChoiceField<T extends string>({ path, label, hint, options }: ChoiceFieldProps<T>) {
  const { id, value, problem, setField, hintId, errId, inputAria } = useFieldBinding<string>(path);
  const notes = <FieldNotes hintId={hintId} errId={errId} hint={hint} problem={problem} />;
  return (
    <LabelledField path={path} id={id} label={label} problem={problem} notes={notes}>
      <select
        id={id}
        name={path}
        value={value}
        {...inputAria}
        onChange={(e) => setField(path, e.target.value)}
      >
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </LabelledField>
  );
}

/** A labelled checkbox for a yes/no option. */
export function CheckField({ path, label, hint }: BasicFieldProps) {
  const { id, value, problem, setField, hintId, errId, inputAria } = useFieldBinding<boolean>(path);
  return (
    <div className={`field field-check${problem ? ' field-invalid' : ''}`} data-field={path}>
      <div className="field-input-row">
        <input
          id={id}
          name={path}
          type="checkbox"
          checked={value}
          {...inputAria}
          onChange={(e) => setField(path, e.target.checked)}
        />
        <label htmlFor={id} className="field-label">
          {label}
        </label>
      </div>
      <FieldNotes hintId={hintId} errId={errId} hint={hint} problem={problem} />
    </div>
  );
}
