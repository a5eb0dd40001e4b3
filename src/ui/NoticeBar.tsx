import { selectNotice } from '../state/selectors';
import { useMeanwardStore } from '../state/store';

/** One message about the last action (opened, saved, or why a file or link could not be used). */
export function NoticeBar() {
  const notice = useMeanwardStore(selectNotice);
  const dismiss = useMeanwardStore((s) => s.dismissNotice);
  if (!notice) return <div className="notice-slot" role="status" aria-live="polite" />;
  return (
    <div className="notice-slot" role={notice.kind === 'error' ? 'alert' : 'status'} aria-live={notice.kind === 'error' ? 'assertive' : 'polite'}>
      <div className={`notice notice-${notice.kind}`} data-testid="notice" data-kind={notice.kind}>
        <p>{notice.text}</p>
        <button type="button" onClick={dismiss} aria-label="Dismiss this message">
          ×
        </button>
      </div>
    </div>
  );
}
