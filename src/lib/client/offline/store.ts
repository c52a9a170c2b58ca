/**
 * What this phone keeps for offline use, in one IndexedDB database shared by the pages and the service worker
 * (docs/decisions/017-offline-cards.md): who is signed in and in which team (`meta`), the machines and sites whose
 * cards are kept (`kept`), and field-log entries waiting to be sent (`outbox`). The pages of kept cards themselves
 * are in the Cache API, one cache per team (`keptCacheName`).
 */
export const DB_NAME = 'baudbook-offline';
const DB_VERSION = 1;
/** Every cache this app makes starts with this; sign-out removes them all. */
export const CACHE_PREFIX = 'baudbook-';
export const keptCacheName = (teamId: string) => `${CACHE_PREFIX}kept-${teamId}`;
/** Header the phone adds to each kept copy: when it was fetched (ISO time from the server's answer). */
export const KEPT_AT_HEADER = 'x-baudbook-kept-at';

export interface Scope { userId: string; teamId: string }
export interface KeptScope { key: string; type: 'machine' | 'site'; id: string; name: string; keptAt: string; cards: number }
export type EntryState = 'waiting' | 'sending' | 'sent' | 'refused';
export interface QueuedPhoto { name: string; type: string; blob: Blob; uploadedId?: string }
export interface QueuedEntry {
  seq?: number;
  clientKey: string;
  userId: string;
  teamId: string;
  deviceId: string;
  deviceTag: string;
  /** The entry as the API takes it, without photoIds (added once the photos are uploaded), doneAt and clientKey. */
  body: Record<string, unknown>;
  photos: QueuedPhoto[];
  doneAt: string;
  state: EntryState;
  /** Why the server refused it, in its words. */
  reason?: string;
  sentAt?: string;
}

type StoreName = 'meta' | 'kept' | 'outbox';

export function openStore(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    const req = indexedDB.open(DB_NAME, DB_VERSION);
    req.onupgradeneeded = () => {
      const db = req.result;
      if (!db.objectStoreNames.contains('meta')) db.createObjectStore('meta', { keyPath: 'key' });
      if (!db.objectStoreNames.contains('kept')) db.createObjectStore('kept', { keyPath: 'key' });
      if (!db.objectStoreNames.contains('outbox')) db.createObjectStore('outbox', { keyPath: 'seq', autoIncrement: true });
    };
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error);
  });
}

function done<T>(req: IDBRequest<T>): Promise<T> {
  return new Promise((resolve, reject) => {
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error);
  });
}

async function withStore<T>(name: StoreName, mode: IDBTransactionMode, fn: (s: IDBObjectStore) => IDBRequest<T>): Promise<T> {
  const db = await openStore();
  try {
    return await done(fn(db.transaction(name, mode).objectStore(name)));
  } finally {
    db.close();
  }
}

export const getAll = <T>(name: StoreName) => withStore(name, 'readonly', (s) => s.getAll() as IDBRequest<T[]>);
export const getOne = <T>(name: StoreName, key: IDBValidKey) => withStore(name, 'readonly', (s) => s.get(key) as IDBRequest<T | undefined>);
export const put = (name: StoreName, value: unknown) => withStore(name, 'readwrite', (s) => s.put(value));
export const remove = (name: StoreName, key: IDBValidKey) => withStore(name, 'readwrite', (s) => s.delete(key));
export const clear = (name: StoreName) => withStore(name, 'readwrite', (s) => s.clear());

export async function currentScope(): Promise<Scope | null> {
  const row = await getOne<Scope & { key: string }>('meta', 'scope');
  return row ? { userId: row.userId, teamId: row.teamId } : null;
}
export const setScope = (scope: Scope) => put('meta', { key: 'scope', ...scope });

/** The database removed altogether (sign-out): resolves when it is gone, or when another tab still holds it open. */
export function deleteStore(): Promise<void> {
  return new Promise((resolve, reject) => {
    const req = indexedDB.deleteDatabase(DB_NAME);
    req.onsuccess = () => resolve();
    req.onblocked = () => resolve();
    req.onerror = () => reject(req.error);
  });
}
