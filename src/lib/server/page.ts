/**
 * The one access check of pages (API routes call `guard` directly): the guard and the page's loads in one step.
 * Signed out: a redirect to sign-in with this page as `next`. Signed in without a team: to /teams/new. A role
 * without the permission, or another refusal: that status with its message as plain text. A record the loads
 * cannot find in the team (another team's id, an unknown one, one in the trash): `status: 404`, and the page
 * sets `Astro.response.status` and shows its NotFound body. Only a page's frontmatter can set the status,
 * since the response head is on its way before any component renders.
 */
import type { Permission } from '../permissions';
import { guard, type TeamContext } from './guard';
import { AppError, NotFound } from './errors';
import { httpStatus } from './http';

export type PageLoad<T> =
  | { ok: true; ctx: TeamContext; data: T; response?: undefined }
  | { ok: false; response: Response }
  | { ok: false; response?: undefined; status: 404; message: string; ctx: TeamContext };

export async function loadPage<T>(locals: App.Locals, url: URL, permission: Permission, load: (ctx: TeamContext) => Promise<T>): Promise<PageLoad<T>> {
  let ctx: TeamContext;
  try {
    ctx = guard(locals, permission);
  } catch (err) {
    return { ok: false, response: refusal(err, locals, url) };
  }
  try {
    return { ok: true, ctx, data: await load(ctx) };
  } catch (err) {
    if (!(err instanceof AppError) || httpStatus(err) === 500) throw err;
    if (err instanceof NotFound || httpStatus(err) === 404) return { ok: false, status: 404, message: err.message, ctx };
    return { ok: false, response: plain(err.message, httpStatus(err)) };
  }
}

/** For the page a signed-in person without a team may open (starting one): the sign-in redirect when signed out, else null. */
export function signedInOnly(locals: App.Locals, url: URL): Response | null {
  return locals.user ? null : signIn(url);
}

function refusal(err: unknown, locals: App.Locals, url: URL): Response {
  if (!(err instanceof AppError)) throw err;
  const status = httpStatus(err);
  if (status === 401) return signIn(url);
  if (status === 404 && !locals.team) return redirect('/teams/new');
  return plain(err.message, status);
}

/** `next` is this page's own path and query, so sign-in can only send the visitor back into the app. */
const signIn = (url: URL) => redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);

const redirect = (location: string) => new Response(null, { status: 302, headers: { location } });

const plain = (message: string, status: number) => new Response(message, { status, headers: { 'content-type': 'text/plain; charset=utf-8' } });
