/**
 * Signing out on this phone removes everything kept for offline use: every cache of this origin (the kept
 * cards and the service worker's precache), the IndexedDB database (kept list and unsent entries) and the
 * service worker itself. The caller warns about unsent entries first (`unsentOnPhone`).
 */
import { deleteStore } from './store';
import { outboxEntries, unsent } from './outbox';
import type { QueuedEntry } from './store';

export async function unsentOnPhone(): Promise<QueuedEntry[]> {
  if (!('indexedDB' in window)) return [];
  return unsent(await outboxEntries(null).catch(() => []));
}

export async function forgetPhone(): Promise<void> {
  if ('caches' in window) for (const name of await caches.keys()) await caches.delete(name);
  if ('indexedDB' in window) await deleteStore();
  if ('serviceWorker' in navigator) for (const reg of await navigator.serviceWorker.getRegistrations()) await reg.unregister();
}

/** Signs out on the server (if it can be reached) and removes everything kept on this phone, then opens sign-in. */
export async function signOutHere(): Promise<void> {
  await fetch('/api/auth/sign-out', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{}', credentials: 'same-origin' }).catch(() => null);
  await forgetPhone();
  location.assign('/sign-in');
}
