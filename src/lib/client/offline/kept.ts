/**
 * Keeping a machine's or a site's field cards on this phone: the kept list lives in IndexedDB (store.ts), the
 * copies in the team's cache. Bringing them up to date asks the server what to fetch (`GET /api/field/kept`, the
 * active team's records only), fetches every address and replaces the team's cache with the answers.
 */
import { clear, getAll, getOne, keptCacheName, KEPT_AT_HEADER, put, remove, type KeptScope, type Scope } from './store';

export interface KeptListAnswer {
  teamId: string;
  userId: string;
  at: string;
  scopes: { type: 'machine' | 'site'; id: string; name: string; machines: { id: string; name: string; cardsUrl: string; devices: { id: string; tag: string; name: string; cardUrl: string }[] }[] }[];
  missing: { type: 'machine' | 'site'; id: string }[];
  urls: string[];
  canLog: boolean;
}
export interface KeptState { scopes: KeptScope[]; refreshedAt: string | null; list: KeptListAnswer | null; missing: KeptListAnswer['missing'] }

/** Browsers keep a service worker and its caches only on https or localhost. */
export function offlineSupported(): boolean {
  return typeof window !== 'undefined' && window.isSecureContext && 'serviceWorker' in navigator && 'caches' in window && 'indexedDB' in window;
}

export async function keptState(): Promise<KeptState> {
  const [scopes, refreshed] = await Promise.all([getAll<KeptScope>('kept'), getOne<{ at: string; list: KeptListAnswer; missing: KeptListAnswer['missing'] }>('meta', 'refreshed')]);
  return { scopes: scopes.sort((a, b) => a.keptAt.localeCompare(b.keptAt)), refreshedAt: refreshed?.at ?? null, list: refreshed?.list ?? null, missing: refreshed?.missing ?? [] };
}

const FETCHES_AT_ONCE = 6;

/** Fetches every address of the kept list into the team's cache (replacing what was there) and records when. */
export async function refreshKept(scope: Scope): Promise<KeptState> {
  const scopes = await getAll<KeptScope>('kept');
  const cacheName = keptCacheName(scope.teamId);
  if (!scopes.length) {
    await caches.delete(cacheName);
    await remove('meta', 'refreshed');
    return keptState();
  }
  const query = scopes.map((s) => `${s.type}=${encodeURIComponent(s.id)}`).join('&');
  const res = await fetch(`/api/field/kept?${query}`, { credentials: 'same-origin', cache: 'no-store' });
  const data = await res.json().catch(() => null);
  if (!res.ok) throw new Error(data?.error ?? `The server answered ${res.status}.`);
  const list = data as KeptListAnswer;
  if (list.teamId !== scope.teamId || list.userId !== scope.userId) throw new Error('The team changed while the cards were fetched: open the page again.');
  const copies: [string, Response][] = [];
  for (let i = 0; i < list.urls.length; i += FETCHES_AT_ONCE) {
    const batch = await Promise.all(list.urls.slice(i, i + FETCHES_AT_ONCE).map(async (url) => {
      const r = await fetch(url, { credentials: 'same-origin', cache: 'no-store' });
      if (!r.ok) throw new Error(`${url} answered ${r.status}: nothing was replaced.`);
      const headers = new Headers(r.headers);
      headers.set(KEPT_AT_HEADER, list.at);
      return [url, new Response(await r.blob(), { status: r.status, headers })] as [string, Response];
    }));
    copies.push(...batch);
  }
  const cache = await caches.open(cacheName);
  for (const [url, copy] of copies) await cache.put(url, copy);
  const wanted = new Set(list.urls.map((u) => new URL(u, location.origin).href));
  for (const req of await cache.keys()) if (!wanted.has(req.url)) await cache.delete(req);
  // Names as the server has them now; machines and sites gone from the vault are dropped from the list.
  const gone = new Set(list.missing.map((m) => `${m.type}:${m.id}`));
  for (const s of scopes) {
    if (gone.has(s.key)) { await remove('kept', s.key); continue; }
    const now = list.scopes.find((x) => `${x.type}:${x.id}` === s.key);
    if (now) await put('kept', { ...s, name: now.name, cards: now.machines.reduce((n, m) => n + m.devices.length, 0) });
  }
  await put('meta', { key: 'refreshed', at: list.at, list, missing: list.missing });
  return keptState();
}

export async function keep(scope: Scope, what: { type: 'machine' | 'site'; id: string; name: string }): Promise<KeptState> {
  const key = `${what.type}:${what.id}`;
  const before = await getOne<KeptScope>('kept', key);
  await put('kept', { key, ...what, keptAt: before?.keptAt ?? new Date().toISOString(), cards: before?.cards ?? 0 } satisfies KeptScope);
  try {
    return await refreshKept(scope);
  } catch (err) {
    if (!before) await remove('kept', key);
    throw err;
  }
}

export async function stopKeeping(scope: Scope, key: string): Promise<KeptState> {
  await remove('kept', key);
  return refreshKept(scope);
}

/** Another user or team on this phone: nothing kept for the previous one stays. */
export async function forgetKept(teamId: string): Promise<void> {
  await caches.delete(keptCacheName(teamId));
  await clear('kept');
  await remove('meta', 'refreshed');
}
