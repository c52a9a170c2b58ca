/** Helpers for vault and field pages, which call services directly. */
import type { Permission } from '../../permissions';
import { guardPage, type TeamContext } from '../guard';
import { AppError, NotFound } from '../errors';
import { httpStatus } from '../http';

/** The record, or null when the service answers 404 (the page then sets status 404 and shows NotFound). */
export async function orNotFound<T>(load: () => Promise<T>): Promise<T | null> {
  try {
    return await load();
  } catch (err) {
    if (err instanceof AppError && httpStatus(err) === 404) return null;
    throw err;
  }
}

export type PageLoad<T> =
  | { ok: true; ctx: TeamContext; data: T; response?: undefined }
  | { ok: false; response: Response }
  | { ok: false; response?: undefined; status: 404; message: string };

/**
 * The guard and the page's loads in one step. A sign-in redirect, a 403 and other refusals come back as
 * `response` (return it); a 404 from the loads comes back as `status: 404`. The page itself then sets
 * `Astro.response.status` and shows the NotFound body: only a page's frontmatter can set the status,
 * since the response head is on its way before any component renders.
 */
export async function loadPage<T>(locals: App.Locals, url: URL, permission: Permission, load: (ctx: TeamContext) => Promise<T>): Promise<PageLoad<T>> {
  const g = guardPage(locals, url, permission);
  if (!g.ok) return { ok: false, response: g.response ?? plain(g.message, g.status) };
  try {
    return { ok: true, ctx: g.ctx, data: await load(g.ctx) };
  } catch (err) {
    if (!(err instanceof AppError) || httpStatus(err) === 500) throw err;
    if (err instanceof NotFound || httpStatus(err) === 404) return { ok: false, status: 404, message: err.message };
    return { ok: false, response: plain(err.message, httpStatus(err)) };
  }
}

const plain = (message: string, status: number) => new Response(message, { status, headers: { 'content-type': 'text/plain; charset=utf-8' } });
