import type { APIRoute } from 'astro';
import { json, route } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { can } from '../../../lib/permissions';
import { listMembers, listOpenInvitations } from '../../../lib/server/teams';

export const GET: APIRoute = route(async ({ locals }) => {
  const ctx = guard(locals, 'member:read');
  const [members, invitations] = await Promise.all([
    listMembers(ctx.team.id),
    can(ctx.role, 'member:invite') ? listOpenInvitations(ctx.team.id) : Promise.resolve([]),
  ]);
  return json({ members, invitations });
});
