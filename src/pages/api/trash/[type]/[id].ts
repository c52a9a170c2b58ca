import type { APIRoute } from 'astro';
import { json, route } from '../../../../lib/server/http';
import { guard } from '../../../../lib/server/guard';
import { purge, restoreFromTrash } from '../../../../lib/server/vault/trash';
import { recordTypeParam } from '../../../../lib/server/vault/params';
import { detachPurged, removeStoredFiles } from '../../../../lib/server/field/attachments';

/** Restore from the trash (with everything that was moved along); a command comes back as it was trashed. */
export const POST: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'trash:restore');
  return json(await restoreFromTrash(ctx, recordTypeParam(params.type), params.id!));
});

/** Purge for good (admins): the record, its contents, their history and their attachments. */
export const DELETE: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'trash:purge');
  let storedFiles: string[] = [];
  const result = await purge(ctx, recordTypeParam(params.type), params.id!, {
    beforeDelete: async (tx, ids) => {
      storedFiles = await detachPurged(tx, ctx, ids);
    },
  });
  await removeStoredFiles(storedFiles);
  return json(result);
});
