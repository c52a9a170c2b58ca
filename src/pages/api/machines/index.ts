import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { machineListParams } from '../../../lib/server/vault/list-params';
import { createMachine, listMachines } from '../../../lib/server/vault/machines';
import { machineCreateSchema } from '../../../lib/schemas/vault';

export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'machine:read');
  return json(await listMachines(ctx, machineListParams(url)));
});

export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'machine:create');
  return json(await createMachine(ctx, validate(machineCreateSchema, await readJson(request))), 201);
});
