import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../../lib/server/http';
import { guard } from '../../../../lib/server/guard';
import { copyCommand } from '../../../../lib/server/commands/commands';
import { commandCopySchema } from '../../../../lib/schemas/commands';

/** `{ deviceId }` or `{ profileId }` (and an optional new `name`): a copy there, with its own history. */
export const POST: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'command:create');
  return json(await copyCommand(ctx, params.id!, validate(commandCopySchema, await readJson(request))), 201);
});
