/**
 * The page to open after signing in or up (`next`), for the sign-in page's redirect and the auth
 * forms alike. Runs in the browser and on the server.
 */

/**
 * `raw` resolved with the URL parser against `origin` (the app's own, e.g. `https://baudbook.example`):
 * its path, query and fragment when it stays on that origin, otherwise null. Only a path starting with
 * one `/` or an absolute URL of the same origin is taken; what comes back is the parser's own
 * serialisation, so a backslash, tab or newline that a browser would read as another host never
 * survives, and neither does a path that would start with `//`.
 */
export function safeNextPath(raw: string | null | undefined, origin: string): string | null {
  if (!raw) return null;
  let base: URL;
  let url: URL;
  try {
    base = new URL(origin);
    url = new URL(raw, base);
  } catch {
    return null;
  }
  if (url.origin !== base.origin || url.username || url.password) return null;
  const absolute = raw.toLowerCase().startsWith(`${base.origin}/`);
  if (!absolute && (!raw.startsWith('/') || /^\/[/\\]/.test(raw) || /[\0-\x1f\\]/.test(raw))) return null;
  const path = url.pathname + url.search + url.hash;
  return path.startsWith('/') && !path.startsWith('//') ? path : null;
}
