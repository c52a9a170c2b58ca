import type { APIRoute } from 'astro';
import { json, route } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { listJobs } from '../../../lib/server/jobs/jobs';

/** The team's imports, newest first, with their progress (any app server can answer for any job). */
export const GET: APIRoute = route(async ({ locals }) => {
  const ctx = guard(locals, 'transfer:import');
  return json(await listJobs(ctx));
});
