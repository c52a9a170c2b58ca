/** Shared steps of the field pages: the guard, and a 404 page instead of a thrown error for records not found. */
import type { Permission } from '../../permissions';
import { guardPage, type TeamContext } from '../guard';
import { HttpError } from '../http';

export type PageResult<T> = { ok: true; ctx: TeamContext; data: T } | { ok: false; response: Response };

export async function loadFieldPage<T>(locals: App.Locals, url: URL, permission: Permission, load: (ctx: TeamContext) => Promise<T>): Promise<PageResult<T>> {
  const g = guardPage(locals, url, permission);
  if (!g.ok) return { ok: false, response: g.response ?? new Response(g.message, { status: g.status, headers: { 'content-type': 'text/plain; charset=utf-8' } }) };
  try {
    return { ok: true, ctx: g.ctx, data: await load(g.ctx) };
  } catch (err) {
    if (err instanceof HttpError && err.status === 404) {
      return { ok: false, response: new Response(`${err.message} It may have been moved to the trash.`, { status: 404, headers: { 'content-type': 'text/plain; charset=utf-8' } }) };
    }
    throw err;
  }
}
