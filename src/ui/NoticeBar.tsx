import { useId } from 'react';
import { selectNotice } from '../state/selectors';
import { useMeanwardStore, useMeanwardStoreApi } from '../state/store';
import { downloadText } from './downloadText';

/** Where this visit's plan came from, for the unreadable-autosave message. */
const STARTED_FROM = {
  tab: 'the form shows the draft this tab saved last',
  browser: 'the form shows the last draft saved in this browser',
  demo: 'the form shows the demo plan (an invented example)',
} as const;

/**
 * An autosave that could not be read: said plainly, with a button to download
 * its raw text; it stays kept (and this message stays) until dismissed.
 */
function UnreadableDraftNotice() {
  const api = useMeanwardStoreApi();
  const drafts = useMeanwardStore((s) => s.unreadableDrafts);
  const from = useMeanwardStore((s) => s.restoredFrom);
  const textId = useId();
  if (drafts.length === 0) return null;
  const one = drafts.length === 1;
  return (
    <div className="notice-slot" role="alert">
      <div className="notice notice-error notice-stacked" data-testid="unreadable-draft-notice" data-kind="error">
        <p id={textId}>
          {one ? 'An autosaved draft' : `${drafts.length} autosaved drafts`} could not be read (the stored copy is damaged), so{' '}
          {one ? 'it was' : 'they were'} not restored; {STARTED_FROM[from ?? 'demo']}. {one ? 'It is' : 'They are'} kept on this computer until you
          dismiss this message: download {one ? 'it' : 'them'} to keep a copy.
        </p>
        <div className="notice-actions">
          <button
            type="button"
            className="notice-action"
            aria-describedby={textId}
            onClick={() => downloadText(api.getState().unreadableDraftFile(), 'meanward-unreadable-draft.txt', 'text/plain')}
          >
            Download the unreadable draft
          </button>
          <button type="button" className="notice-action" data-testid="unreadable-draft-dismiss" onClick={() => api.getState().dismissUnreadableDrafts()}>
            Dismiss and forget it
          </button>
        </div>
      </div>
    </div>
  );
}

/**
 * One message about the last action (opened, saved, or why a file or link
 * could not be used); after a replace of the whole plan it offers Undo (then
 * Redo). Above it, the message about an unreadable autosave, while one is kept.
 */
export function NoticeBar() {
  const notice = useMeanwardStore(selectNotice);
  const canUndo = useMeanwardStore((s) => s.undoable !== null);
  const dismiss = useMeanwardStore((s) => s.dismissNotice);
  const undo = useMeanwardStore((s) => s.undoReplace);
  const textId = useId();
  const action = notice?.action && canUndo ? notice.action : null;
  return (
    <>
      <UnreadableDraftNotice />
      {!notice ? (
        <div className="notice-slot" role="status" aria-live="polite" />
      ) : (
        <div className="notice-slot" role={notice.kind === 'error' ? 'alert' : 'status'} aria-live={notice.kind === 'error' ? 'assertive' : 'polite'}>
          <div className={`notice notice-${notice.kind}`} data-testid="notice" data-kind={notice.kind}>
            <p id={textId}>{notice.text}</p>
            <div className="notice-actions">
              {action && (
                <button type="button" className="notice-action" data-testid="notice-undo" aria-describedby={textId} onClick={undo}>
                  {action === 'undo' ? 'Undo' : 'Redo'}
                </button>
              )}
              <button type="button" data-testid="notice-dismiss" onClick={dismiss} aria-label="Dismiss this message">
                ×
              </button>
            </div>
          </div>
        </div>
      )}
    </>
  );
}
