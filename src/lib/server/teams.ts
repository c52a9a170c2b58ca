import { and, asc, eq, gt, isNull } from 'drizzle-orm';
import { db } from '../../db/client';
import { invitation, membership, team, user } from '../../db/schema';
import { assignableRoles, type Role } from '../permissions';
import type { TeamContext } from './guard';
import { config } from '../../config';
import { linkMessage, sendMail } from './mail';
import { newId, randomToken, sha256 } from './ids';
import { Conflict, Forbidden, Gone, Invalid, NotFound } from './errors';

export async function createTeam(userId: string, name: string) {
  const id = newId('team');
  await db.batch([
    db.insert(team).values({ id, name }),
    db.insert(membership).values({ teamId: id, userId, role: 'owner' }),
  ]);
  return { id, name, role: 'owner' as Role };
}

export async function renameTeam(ctx: TeamContext, name: string) {
  await db.update(team).set({ name }).where(eq(team.id, ctx.team.id));
  return { id: ctx.team.id, name };
}

export async function deleteTeam(ctx: TeamContext, confirmName: string) {
  if (confirmName.trim() !== ctx.team.name) {
    throw new Invalid('Type the team name exactly to confirm deletion.', { fields: { confirmName: 'Does not match the team name.' } });
  }
  await db.delete(team).where(eq(team.id, ctx.team.id));
}

export async function listMembers(teamId: string) {
  return db
    .select({ userId: user.id, name: user.name, email: user.email, role: membership.role, joinedAt: membership.createdAt })
    .from(membership)
    .innerJoin(user, eq(user.id, membership.userId))
    .where(eq(membership.teamId, teamId))
    .orderBy(asc(user.name));
}

export async function listOpenInvitations(teamId: string) {
  return db
    .select({ id: invitation.id, email: invitation.email, role: invitation.role, createdAt: invitation.createdAt, expiresAt: invitation.expiresAt })
    .from(invitation)
    .where(and(eq(invitation.teamId, teamId), isNull(invitation.acceptedAt), isNull(invitation.revokedAt), gt(invitation.expiresAt, new Date())))
    .orderBy(asc(invitation.email));
}

async function findMember(teamId: string, userId: string) {
  const [row] = await db.select().from(membership).where(and(eq(membership.teamId, teamId), eq(membership.userId, userId)));
  if (!row) throw new NotFound('No such member in this team.');
  return row;
}

function assertAssignable(ctx: TeamContext, role: Role) {
  if (!assignableRoles(ctx.role).includes(role)) throw new Forbidden(`Your role cannot hand out the ${role} role.`);
}

export async function inviteMember(ctx: TeamContext, email: string, role: Role) {
  assertAssignable(ctx, role);
  const [existing] = await db
    .select({ userId: user.id })
    .from(user)
    .innerJoin(membership, and(eq(membership.userId, user.id), eq(membership.teamId, ctx.team.id)))
    .where(eq(user.email, email));
  if (existing) throw new Conflict(`${email} is already a member of this team.`);
  const token = randomToken();
  const id = newId('inv');
  const expiresAt = new Date(Date.now() + config.invitationDays * 86_400_000);
  await db.transaction(async (tx) => {
    // A newer invitation replaces any open one for the same address.
    await tx
      .update(invitation)
      .set({ revokedAt: new Date() })
      .where(and(eq(invitation.teamId, ctx.team.id), eq(invitation.email, email), isNull(invitation.acceptedAt), isNull(invitation.revokedAt)));
    await tx.insert(invitation).values({ id, teamId: ctx.team.id, email, role, tokenHash: sha256(token), invitedBy: ctx.user.id, expiresAt });
  });
  const url = `${config.baseUrl}/invitations/accept?token=${token}`;
  await sendMail(
    linkMessage(
      email,
      `${ctx.user.name} invited you to ${ctx.team.name} on Baudbook`,
      [
        `${ctx.user.name} (${ctx.user.email}) invited you to join the team "${ctx.team.name}" as ${role}.`,
        `The invitation expires on ${expiresAt.toISOString().slice(0, 10)}. Sign up or sign in with ${email} to accept it.`,
      ],
      'Accept the invitation',
      url,
    ),
  );
  return { id, email, role, expiresAt };
}

export async function revokeInvitation(ctx: TeamContext, id: string) {
  const result = await db
    .update(invitation)
    .set({ revokedAt: new Date() })
    .where(and(eq(invitation.id, id), eq(invitation.teamId, ctx.team.id), isNull(invitation.acceptedAt), isNull(invitation.revokedAt)));
  if (result.rowsAffected === 0) throw new NotFound('No open invitation with that id in this team.');
}

/** Looks an invitation up by the token from its e-mail; explains why it cannot be used. */
export async function findInvitation(token: string) {
  const [row] = await db
    .select({ inv: invitation, teamName: team.name })
    .from(invitation)
    .innerJoin(team, eq(team.id, invitation.teamId))
    .where(eq(invitation.tokenHash, sha256(token)));
  if (!row) return { ok: false as const, reason: 'This invitation link is not valid.' };
  const { inv, teamName } = row;
  if (inv.acceptedAt) return { ok: false as const, reason: 'This invitation has already been accepted.' };
  if (inv.revokedAt) return { ok: false as const, reason: 'This invitation was withdrawn. Ask for a new one.' };
  if (inv.expiresAt.getTime() <= Date.now()) return { ok: false as const, reason: 'This invitation has expired. Ask for a new one.' };
  return { ok: true as const, invitation: inv, teamName };
}

export async function acceptInvitation(currentUser: { id: string; email: string }, token: string) {
  const found = await findInvitation(token);
  if (!found.ok) throw new Gone(found.reason);
  const inv = found.invitation;
  if (inv.email.toLowerCase() !== currentUser.email.toLowerCase()) {
    // The invited address is not named: whoever holds a forwarded link learns nothing from trying it.
    throw new Forbidden(`This invitation was sent to another e-mail address; you are signed in as ${currentUser.email}. Sign in with the invited address to accept it.`);
  }
  await db.transaction(async (tx) => {
    await tx.insert(membership).values({ teamId: inv.teamId, userId: currentUser.id, role: inv.role }).onConflictDoNothing();
    await tx.update(invitation).set({ acceptedAt: new Date() }).where(eq(invitation.id, inv.id));
  });
  return { teamId: inv.teamId, teamName: found.teamName, role: inv.role };
}

export async function changeRole(ctx: TeamContext, userId: string, role: Role) {
  assertAssignable(ctx, role);
  const member = await findMember(ctx.team.id, userId);
  if (member.role === 'owner') throw new Forbidden('The owner keeps the owner role until ownership is transferred.');
  if (userId === ctx.user.id) throw new Forbidden('You cannot change your own role.');
  await db.update(membership).set({ role }).where(and(eq(membership.teamId, ctx.team.id), eq(membership.userId, userId)));
  return { userId, role };
}

export async function removeMember(ctx: TeamContext, userId: string) {
  const member = await findMember(ctx.team.id, userId);
  if (member.role === 'owner') throw new Forbidden('The owner cannot be removed; transfer ownership first.');
  await db.delete(membership).where(and(eq(membership.teamId, ctx.team.id), eq(membership.userId, userId)));
}

/** Hands the owner role to another member; the previous owner becomes an admin. */
export async function transferOwnership(ctx: TeamContext, userId: string) {
  if (userId === ctx.user.id) throw new Invalid('You already own this team.');
  await findMember(ctx.team.id, userId);
  await db.batch([
    db.update(membership).set({ role: 'owner' }).where(and(eq(membership.teamId, ctx.team.id), eq(membership.userId, userId))),
    db.update(membership).set({ role: 'admin' }).where(and(eq(membership.teamId, ctx.team.id), eq(membership.userId, ctx.user.id))),
  ]);
}
