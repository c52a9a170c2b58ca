import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { createCommand, listCommands } from '../../../lib/server/commands/commands';
import { commandCreateSchema, commandListSchema } from '../../../lib/schemas/commands';

/** `?deviceId=` (own commands, then the profile's, marked inherited) or `?profileId=`; `&trashed=true` for the trash. */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'command:read');
  const q = validate(commandListSchema, Object.fromEntries(url.searchParams));
  const { owner, items } = await listCommands(ctx, { deviceId: q.deviceId, profileId: q.profileId, trashed: q.trashed === 'true' });
  return json({ owner: { kind: owner.kind, id: owner.id, label: owner.label }, items });
});

export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'command:create');
  return json(await createCommand(ctx, validate(commandCreateSchema, await readJson(request))), 201);
});
