'use client';

/**
 * Leaving the Design tab: the wizard's last save finishes before the author's version is
 * closed (POST /versions/close), and edits that cannot be saved yet (a field with an error, a
 * refused save) are not lost without a word — the browser asks before unloading the page, and a
 * click on a link inside the app asks first.
 */
let lastSave: Promise<unknown> = Promise.resolve();

/** The wizard registers each save here, so that closing the version waits for it. */
export function trackSave<T>(save: Promise<T>): Promise<T> {
  lastSave = save.catch(() => undefined);
  return save;
}

/**
 * Closes the signed-in author's open version once the last save is done (keepalive: it survives
 * the page). `afterUnmount`: wait a turn first, so that the save the wizard sends as it unmounts
 * is registered before this waits for it.
 */
export function closeMyVersion(studyId: string, { afterUnmount = false } = {}): void {
  const send = () =>
    void lastSave.then(() =>
      fetch(`/api/v1/studies/${studyId}/versions/close`, { method: 'POST', keepalive: true, credentials: 'same-origin', headers: { Accept: 'application/json' } }).catch(() => undefined),
    );
  if (afterUnmount) setTimeout(send, 0);
  else send();
}

export const UNSAVED_WARNING = 'Some of your changes are not saved yet (a field shows an error, or the last save was refused). Leave anyway and lose them?';

/**
 * The browser's own warning before unloading the page while `atUnload()` (a save not sent yet
 * would be lost too), and a confirmation before following a link inside the app while
 * `atNavigation()` (a pending save is sent as the wizard closes, so only edits that cannot be
 * saved count). Returns the clean-up.
 */
export function guardUnsaved(atUnload: () => boolean, atNavigation: () => boolean): () => void {
  const beforeUnload = (e: BeforeUnloadEvent) => {
    if (!atUnload()) return;
    e.preventDefault();
    e.returnValue = '';
  };
  const onClick = (e: MouseEvent) => {
    if (!atNavigation() || e.defaultPrevented || e.button !== 0 || e.metaKey || e.ctrlKey || e.shiftKey || e.altKey) return;
    const link = (e.target as Element | null)?.closest?.('a[href]') as HTMLAnchorElement | null;
    if (!link || link.target === '_blank' || link.origin !== window.location.origin || link.pathname === window.location.pathname) return;
    if (!window.confirm(UNSAVED_WARNING)) {
      e.preventDefault();
      e.stopPropagation();
    }
  };
  window.addEventListener('beforeunload', beforeUnload);
  document.addEventListener('click', onClick, true);
  return () => {
    window.removeEventListener('beforeunload', beforeUnload);
    document.removeEventListener('click', onClick, true);
  };
}
