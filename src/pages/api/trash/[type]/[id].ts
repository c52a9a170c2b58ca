import type { APIRoute } from 'astro';
import { json, route } from '../../../../lib/server/http';
import { guard } from '../../../../lib/server/guard';
import { purge, restoreFromTrash } from '../../../../lib/server/vault/trash';
import { entityTypeParam } from '../../../../lib/server/vault/params';

/** Restore from the trash (with everything that was moved along). */
export const POST: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'trash:restore');
  return json(await restoreFromTrash(ctx, entityTypeParam(params.type), params.id!));
});

/** Purge for good (admins): the record, its contents and their history. */
export const DELETE: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'trash:purge');
  return json(await purge(ctx, entityTypeParam(params.type), params.id!));
});
