import type { APIRoute } from 'astro';
import { json, route } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { revokeShare } from '../../../lib/server/field/shares';

/** Revokes the link (kept in the list with its access count). */
export const DELETE: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'share:revoke');
  return json(await revokeShare(ctx, params.id!));
});
