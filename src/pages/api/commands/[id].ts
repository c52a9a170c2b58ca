import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { versionParam } from '../../../lib/server/vault/params';
import { getCommand, trashCommand, updateCommand } from '../../../lib/server/commands/commands';
import { commandUpdateSchema } from '../../../lib/schemas/commands';

export const GET: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'command:read');
  return json(await getCommand(ctx, params.id!));
});

export const PATCH: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'command:update');
  return json(await updateCommand(ctx, params.id!, validate(commandUpdateSchema, await readJson(request))));
});

/**
 * Moves the command to the trash, like vault records; `?version=` must then be current. A step of live
 * sequences answers 409 with `usedBy` unless `?confirmUsed=true`.
 */
export const DELETE: APIRoute = route(async ({ locals, params, url }) => {
  const ctx = guard(locals, 'command:delete');
  return json(await trashCommand(ctx, params.id!, versionParam(url), url.searchParams.get('confirmUsed') === 'true'));
});
