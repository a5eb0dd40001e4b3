import { useId, useSyncExternalStore } from 'react';
import { pageServiceWorkerUpdates, type ServiceWorkerUpdates, type UpdateState } from '../offline/serviceWorkerUpdates';

const NONE: UpdateState = { updateReady: false };
const noSubscription = () => () => undefined;

/**
 * "A new version of Meanward is ready": shown, without interrupting, once a new version has been
 * installed in the background. Its Reload button switches to it and reloads; nothing happens
 * until the user presses it. `updates` defaults to the page's own watch (none in tests or dev).
 */
export function UpdateNotice({ updates = pageServiceWorkerUpdates() }: { updates?: ServiceWorkerUpdates | null }) {
  const state = useSyncExternalStore(updates?.subscribe ?? noSubscription, updates?.getState ?? (() => NONE));
  const textId = useId();
  if (!updates || !state.updateReady) return null;
  return (
    <div className="notice-slot" role="status" aria-live="polite">
      <div className="notice notice-info" data-testid="update-notice">
        <p id={textId}>A new version of Meanward is ready. Reload to use it.</p>
        <div className="notice-actions">
          <button type="button" className="notice-action" aria-describedby={textId} onClick={updates.activateUpdate} data-testid="update-reload">
            Reload
          </button>
        </div>
      </div>
    </div>
  );
}
