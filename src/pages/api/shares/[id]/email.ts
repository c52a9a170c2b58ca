import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../../lib/server/http';
import { guard } from '../../../../lib/server/guard';
import { emailShare } from '../../../../lib/server/field/shares';
import { shareEmailSchema } from '../../../../lib/schemas/field';

/** Sends the recipient their own link to the same cards, with the same expiry. */
export const POST: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'share:create');
  const { to, message } = validate(shareEmailSchema, await readJson(request));
  return json(await emailShare(ctx, params.id!, to, message));
});
