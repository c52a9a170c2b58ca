import type { APIRoute } from 'astro';
import { json, route } from '../../../../lib/server/http';
import { guard } from '../../../../lib/server/guard';
import { listCommandRevisions } from '../../../../lib/server/commands/revisions';

/** The command's history, newest first (also while it is in the trash). */
export const GET: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'command:read');
  return json(await listCommandRevisions(ctx, params.id!));
});
