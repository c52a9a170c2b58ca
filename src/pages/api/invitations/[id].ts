import type { APIRoute } from 'astro';
import { json, route } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { revokeInvitation } from '../../../lib/server/teams';

export const DELETE: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'member:invite');
  await revokeInvitation(ctx, params.id!);
  return json({ revoked: params.id });
});
