import { useId, useRef, useState, type ChangeEvent } from 'react';
import { useMeanwardStore, useMeanwardStoreApi } from '../state/store';
import { downloadText } from './downloadText';

/** Make a file name from the plan title: letters, digits and dashes only. */
export function planFileName(title: string): string {
  const slug = title
    .toLowerCase()
    .normalize('NFKD')
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60);
  return `${slug || 'plan'}.meanward.json`;
}

interface HeaderProps {
  exportsOpen: boolean;
  onToggleExports(): void;
  exportsAvailable: boolean;
}

/** The page header: name, purpose, and the plan actions. */
export function Header({ exportsOpen, onToggleExports, exportsAvailable }: HeaderProps) {
  const api = useMeanwardStoreApi();
  const examples = useMeanwardStore((s) => s.examplesList);
  const problems = useMeanwardStore((s) => s.problems.length);
  const fileInput = useRef<HTMLInputElement>(null);
  const exampleId = useId();
  const [example, setExample] = useState('');

  const onOpenFile = async (e: ChangeEvent<HTMLInputElement>) => {
    const file = e.target.files?.[0];
    e.target.value = '';
    if (!file) return;
    let text: string;
    try {
      text = await file.text();
    } catch {
      api.setState({ notice: { kind: 'error', text: `The file "${file.name}" could not be read; your current plan is unchanged.` } });
      return;
    }
    api.getState().openPlanText(text, file.name);
  };

  const onSave = () => {
    api.getState().commitDraft(); // a value still being typed counts
    const s = api.getState();
    downloadText(s.planFileText(), planFileName(s.validPlan.title));
    api.setState({
      notice: {
        kind: 'info',
        text:
          s.problems.length > 0
            ? 'Saved the last complete plan: the fields marked in the form were not saved because they have problems.'
            : 'Saved the plan file. Open it here later, or share it with a colleague.',
      },
    });
  };

  const onShare = async () => {
    api.getState().commitDraft(); // a value still being typed counts
    const s = api.getState();
    const fragment = s.shareFragment();
    const url = `${location.origin}${location.pathname}${location.search}${fragment}`;
    history.replaceState(null, '', fragment);
    let copied = false;
    try {
      await navigator.clipboard.writeText(url);
      copied = true;
    } catch {
      copied = false;
    }
    api.setState({
      notice: {
        kind: 'info',
        text: copied
          ? 'Copied a link that reopens this plan. The whole plan is inside the link: nothing is stored on a server.'
          : 'The address bar now holds a link that reopens this plan; copy it from there. The whole plan is inside the link.',
      },
    });
  };

  return (
    <header className="app-header">
      <div className="brand">
        <h1>Meanward</h1>
        <p className="purpose">
          Before you match or adjust on a fallible pretest: how big a spurious difference will regression toward the mean create, beside the
          effect you hope to find?
        </p>
      </div>
      <nav className="actions" aria-label="Plan actions">
        <div className="example-picker">
          <label htmlFor={exampleId}>Invented examples</label>
          <select
            id={exampleId}
            value={example}
            onChange={(e) => {
              setExample('');
              if (e.target.value) api.getState().loadExample(e.target.value);
            }}
          >
            <option value="">Load an example…</option>
            {examples.map((ex) => (
              <option key={ex.id} value={ex.id} title={ex.description}>
                {ex.name}
              </option>
            ))}
          </select>
        </div>
        <button type="button" onClick={() => api.getState().resetToDemo()}>
          Reset to demo
        </button>
        <button type="button" onClick={() => fileInput.current?.click()}>
          Open plan file…
        </button>
        <input ref={fileInput} type="file" accept=".json,application/json" className="visually-hidden" tabIndex={-1} aria-label="Open plan file" data-testid="open-file-input" onChange={(e) => void onOpenFile(e)} />
        <button type="button" onClick={onSave} title={problems > 0 ? 'Saves the last complete plan' : undefined}>
          Save plan file
        </button>
        <button type="button" onClick={() => void onShare()}>
          Copy share link
        </button>
        {exportsAvailable && (
          <button type="button" aria-expanded={exportsOpen} aria-controls="exports-panel" onClick={onToggleExports}>
            Exports (PDF, CSV, images)
          </button>
        )}
      </nav>
    </header>
  );
}
