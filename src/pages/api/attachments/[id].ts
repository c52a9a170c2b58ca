import type { APIRoute } from 'astro';
import { json, route } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { deleteAttachment, downloadAttachment } from '../../../lib/server/field/attachments';

export const GET: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'attachment:read');
  return downloadAttachment(ctx, params.id!);
});

export const DELETE: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'attachment:delete');
  return json(await deleteAttachment(ctx, params.id!));
});
