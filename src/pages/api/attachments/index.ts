import type { APIRoute } from 'astro';
import { json, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { createAttachment, listAttachments } from '../../../lib/server/field/attachments';
import { readUpload } from '../../../lib/server/field/upload-body';
import { config } from '../../../config';
import { attachmentListSchema } from '../../../lib/schemas/field';

export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'attachment:read');
  const { ownerType, ownerId } = validate(attachmentListSchema, Object.fromEntries(url.searchParams));
  return json({ items: await listAttachments(ctx, ownerType, ownerId), maxBytes: config.uploadMaxBytes });
});

/** multipart/form-data (file, ownerType, ownerId, kind[, name]) or the raw bytes with those fields in the query. */
export const POST: APIRoute = route(async ({ locals, request, url }) => {
  const ctx = guard(locals, 'attachment:create');
  return json(await createAttachment(ctx, await readUpload(request, url, config.uploadMaxBytes)), 201);
});
