import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { emailCard } from '../../../lib/server/field/card-mail';
import { cardEmailSchema } from '../../../lib/schemas/field';

/** E-mails one device's card as text (sending vault content out counts as sharing: engineers and above). */
export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'share:create');
  const { deviceId, to, message } = validate(cardEmailSchema, await readJson(request));
  return json(await emailCard(ctx, deviceId, to, message));
});
