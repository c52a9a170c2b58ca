import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { transferOwnership } from '../../../lib/server/teams';
import { transferOwnershipSchema } from '../../../lib/schemas/platform';

export const POST: APIRoute = route(async ({ request, locals }) => {
  const ctx = guard(locals, 'team:transfer');
  const { userId } = validate(transferOwnershipSchema, await readJson(request));
  await transferOwnership(ctx, userId);
  return json({ owner: userId });
});
