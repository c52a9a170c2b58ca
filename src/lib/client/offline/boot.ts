/**
 * Runs on every signed-in page (AppLayout): registers the service worker where the browser allows one (https or
 * localhost) once the page has loaded, records who is signed in and in which team for the worker, drops what was kept for another user or
 * team, sends waiting field-log entries (now and on every `online` event) and brings kept cards up to date when
 * they are older than REFRESH_AFTER_MS.
 */
import { currentScope, getOne, setScope, type Scope } from './store';
import { forgetKept, offlineSupported, refreshKept } from './kept';
import { flushOutbox } from './outbox';

const REFRESH_AFTER_MS = 15 * 60 * 1000;

/**
 * Registers the worker once the page has loaded: its first install fetches every built file (precache), which
 * should not compete with the page's own loading and hydration (on later visits it is installed already).
 */
function registerWhenLoaded(): void {
  const register = () => void navigator.serviceWorker.register('/sw.js', { scope: '/' }).catch(() => undefined);
  if (document.readyState === 'complete') register();
  else window.addEventListener('load', register, { once: true });
}

export async function bootOffline(scope: Scope): Promise<void> {
  if (!offlineSupported()) return;
  registerWhenLoaded();
  const before = await currentScope();
  if (before && (before.userId !== scope.userId || before.teamId !== scope.teamId)) await forgetKept(before.teamId);
  await setScope(scope);
  window.addEventListener('online', () => {
    void flushOutbox(scope);
    // A page the worker answered from the kept copy says so at its top; once the network is back, say that instead.
    const notice = document.querySelector('[data-testid="kept-copy"]');
    if (notice) notice.textContent = 'The network is back: this page is still the copy kept on this phone. Open it again for the current version.';
  });
  if (!navigator.onLine) return;
  await flushOutbox(scope);
  const refreshed = await getOne<{ at: string }>('meta', 'refreshed');
  if (refreshed && Date.now() - new Date(refreshed.at).getTime() > REFRESH_AFTER_MS) await refreshKept(scope).catch(() => undefined);
}
