import type { APIRoute } from 'astro';
import { checkedPrefix, devicePlcFile } from '../../../../lib/server/commands/plc-file';
import { guard } from '../../../../lib/server/guard';
import { route, stFile } from '../../../../lib/server/http';

/** One `.st` file with every command of the device (own and inherited), each preset and each sequence; `?prefix=` names the POUs. */
export const GET: APIRoute = route(async ({ locals, params, url }) => {
  const ctx = guard(locals, 'command:read');
  return stFile(await devicePlcFile(ctx, params.id!, checkedPrefix(url.searchParams.get('prefix'))));
});
