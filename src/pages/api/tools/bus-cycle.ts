import type { APIRoute } from 'astro';
import { busCycleReport, busCycleSchema, defaultPortSettings } from '../../../lib/frame';
import { json, readJson, route, validate } from '../../../lib/server/http';

/**
 * Public: the poll cycle of a multidrop bus: each transaction's time on the line, the cycle, polls per second,
 * the worst case when one device does not answer, and findings (timeout, target, broadcast delay, layout).
 */
export const POST: APIRoute = route(async ({ request }) => {
  const body = validate(busCycleSchema, await readJson(request, 64 * 1024));
  const settings = body.settings ?? defaultPortSettings;
  const layout = body.layout && { ...body.layout, members: body.layout.members.map((m) => ({ ...m, id: m.label })) };
  return json(
    busCycleReport(settings, body.polls, { retries: body.retries, responseTimeoutMs: body.responseTimeoutMs, targetCycleMs: body.targetCycleMs }, layout),
  );
});
