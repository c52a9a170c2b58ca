import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { applyCopy, previewCopy } from '../../../lib/server/vault/copy';
import { copySettingsSchema } from '../../../lib/schemas/vault';

/** Copy port settings between devices or ports: `apply: false` previews the differences, `apply: true` writes them. */
export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'device:copy');
  const input = validate(copySettingsSchema, await readJson(request));
  return json(input.apply ? await applyCopy(ctx, input) : await previewCopy(ctx, input));
});
