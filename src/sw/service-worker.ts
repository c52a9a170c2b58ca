/**
 * Baudbook's service worker, bundled into /sw.js after `astro build` by scripts/service-worker-build.mjs
 * (docs/decisions/017-offline-cards.md). It keeps the built scripts, styles and fonts (precached, hashed names),
 * the offline page and the icons, and answers from the field cards kept on this phone only when the network
 * fails: every page and API read goes to the network first, and nothing it answers is stored on the way
 * (signed-in answers are `no-store`; the kept copies are written by the page, on the technician's request).
 * Share-link pages (`/s/…`) and the auth API are never answered from a cache.
 */
import { clientsClaim } from 'workbox-core';
import { cleanupOutdatedCaches, matchPrecache, precacheAndRoute } from 'workbox-precaching';
import { registerRoute } from 'workbox-routing';
import { NetworkOnly } from 'workbox-strategies';
import { currentScope, KEPT_AT_HEADER, keptCacheName } from '../lib/client/offline/store';
import { formatWhenFixed } from '../lib/client/when';

interface PrecacheEntry { url: string; revision: string | null }
interface WorkerScope { __WB_MANIFEST: PrecacheEntry[]; skipWaiting(): Promise<void> }
declare const self: WorkerScope;

/**
 * How long a page or API read waits for the network before a kept copy is used instead (a plant network can hang
 * rather than fail). Without a kept copy the read goes on waiting for the network: a slow page is not "offline".
 */
const NETWORK_PATIENCE_MS = 6000;
export const OFFLINE_PAGE = '/offline.html';

precacheAndRoute(self.__WB_MANIFEST);
cleanupOutdatedCaches();
void self.skipWaiting();
clientsClaim();

const network = new NetworkOnly();

/** The kept copy of `url` for the team signed in on this phone, or null. */
async function keptCopy(url: URL): Promise<Response | null> {
  const scope = await currentScope().catch(() => null);
  if (!scope) return null;
  const cache = await caches.open(keptCacheName(scope.teamId));
  return (await cache.match(url.pathname + url.search)) ?? null;
}

/** A kept page, with a notice at the top of its main part saying it is the phone's copy and from when. */
async function markedAsKept(res: Response, slow: boolean): Promise<Response> {
  const at = res.headers.get(KEPT_AT_HEADER);
  const html = await res.text();
  const when = at ? `<time datetime="${at}" data-when>${formatWhenFixed(at)}</time>` : 'at an unknown time';
  const why = slow ? `The network did not answer within ${NETWORK_PATIENCE_MS / 1000} s` : 'No network';
  const notice = `<p class="notice notice-warn mb-4" role="status" data-testid="kept-copy">${why}: this is the copy kept on this phone, last brought up to date ${when}. Entries you log here wait on this phone and are sent when the network returns.</p>`;
  const marked = html.replace(/(<main id="main"[^>]*>)/, `$1${notice}`);
  return new Response(marked, { status: res.status, headers: res.headers });
}

const offlineJson = () => new Response(JSON.stringify({ error: 'No network, and this is not kept on this phone.' }), {
  status: 503, headers: { 'content-type': 'application/json' },
});

const neverKept = (url: URL) => url.pathname.startsWith('/s/') || url.pathname.startsWith('/api/auth/');

registerRoute(
  ({ request, url }) => url.origin === location.origin && !neverKept(url) && (request.mode === 'navigate' || url.pathname.startsWith('/api/')),
  async (options) => {
    const { request, url } = options;
    const answer = network.handle(options);
    const outcome = answer.then(() => 'answered' as const, () => 'failed' as const);
    const first = await Promise.race([outcome, new Promise<'slow'>((r) => setTimeout(() => r('slow'), NETWORK_PATIENCE_MS))]);
    if (first === 'answered') return answer;
    const kept = await keptCopy(url);
    if (kept) return request.mode === 'navigate' ? markedAsKept(kept, first === 'slow') : kept;
    if (first === 'slow' && (await outcome) === 'answered') return answer;
    return request.mode === 'navigate' ? ((await matchPrecache(OFFLINE_PAGE)) ?? Response.error()) : offlineJson();
  },
);
