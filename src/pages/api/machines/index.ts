import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { parseList } from '../../../lib/server/vault/records';
import { createMachine, listMachines, MACHINE_SORTS } from '../../../lib/server/vault/machines';
import { machineCreateSchema } from '../../../lib/schemas/vault';
import { idFilter } from '../../../lib/server/vault/params';
import { z } from 'zod';

export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'machine:read');
  return json(await listMachines(ctx, parseList(url, MACHINE_SORTS, 'name', { siteId: idFilter, q: z.string().max(100).optional() })));
});

export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'machine:create');
  return json(await createMachine(ctx, validate(machineCreateSchema, await readJson(request))), 201);
});
