import type { APIRoute } from 'astro';
import { plcFileForCommands, prefixProblem } from '../../../../lib/frame/plc-code';
import { listCommands } from '../../../../lib/server/commands/commands';
import { Invalid } from '../../../../lib/server/errors';
import { guard } from '../../../../lib/server/guard';
import { route } from '../../../../lib/server/http';

/** One `.st` file with every command of the device (own and inherited) and each preset; `?prefix=` names the POUs. */
export const GET: APIRoute = route(async ({ locals, params, url }) => {
  const ctx = guard(locals, 'command:read');
  const prefix = url.searchParams.get('prefix') ?? '';
  const bad = prefix.length > 32 ? 'The prefix is at most 32 characters' : prefixProblem(prefix);
  if (bad) throw new Invalid(bad);
  const { owner, items } = await listCommands(ctx, { deviceId: params.id! });
  const text = plcFileForCommands(owner.label, items.map((c) => ({ name: c.name, template: c.template, presets: c.presets ?? [] })), prefix);
  const file = (owner.label.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'device') + '.st';
  return new Response(text, {
    headers: { 'content-type': 'text/plain; charset=utf-8', 'content-disposition': `attachment; filename="${file}"`, 'cache-control': 'no-store' },
  });
});
