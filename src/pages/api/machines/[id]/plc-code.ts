import type { APIRoute } from 'astro';
import { checkedPrefix, machinePlcFile } from '../../../../lib/server/commands/plc-file';
import { guard } from '../../../../lib/server/guard';
import { route, stFile } from '../../../../lib/server/http';

/** One `.st` file with every command of every device on the machine, each POU named after its device's tag; `?prefix=` goes in front. */
export const GET: APIRoute = route(async ({ locals, params, url }) => {
  const ctx = guard(locals, 'command:read');
  return stFile(await machinePlcFile(ctx, params.id!, checkedPrefix(url.searchParams.get('prefix'))));
});
