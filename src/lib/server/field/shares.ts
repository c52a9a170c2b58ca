/** Read-only share links to a machine's or a site's cards, for people without an account. */
import { MACHINERY_CAUTION } from '../../caution';
import { and, desc, eq, sql } from 'drizzle-orm';
import type { z } from 'zod';
import { db } from '../../../db/client';
import { machine, shareLink, site } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { newId, randomToken, sha256 } from '../ids';
import { linkMessage, sendMail } from '../mail';
import type { shareCreateSchema } from '../../schemas/field';
import { config, SHARE_MAX_DAYS } from '../../../config';
import { liveMachine, liveSite } from './scope';
import { Conflict, Invalid, notFound } from '../errors';

type ShareRow = typeof shareLink.$inferSelect;
const DAY = 86_400_000;

export interface ShareView extends Omit<ShareRow, 'tokenHash'> {
  scopeName: string;
  state: 'active' | 'expired' | 'revoked';
}

export function shareState(r: Pick<ShareRow, 'expiresAt' | 'revokedAt'>, now = Date.now()): ShareView['state'] {
  if (r.revokedAt) return 'revoked';
  return r.expiresAt.getTime() <= now ? 'expired' : 'active';
}

/** YYYY-MM-DD means through the end of that day (UTC); a full time is taken as given. */
export function parseExpiry(raw: string | undefined, now = Date.now()): Date {
  if (!raw) return new Date(now + config.shareDefaultDays * DAY);
  const date = /^\d{4}-\d{2}-\d{2}$/.test(raw) ? new Date(`${raw}T23:59:59.999Z`) : new Date(raw);
  const fail = (msg: string) => new Invalid(`expiresAt: ${msg}`, { fields: { expiresAt: msg } });
  if (Number.isNaN(date.getTime())) throw fail('Enter the last day as YYYY-MM-DD.');
  if (date.getTime() <= now) throw fail('Choose a day in the future.');
  if (date.getTime() > now + SHARE_MAX_DAYS * DAY) throw fail(`A link lasts at most ${SHARE_MAX_DAYS} days.`);
  return date;
}

function present(r: ShareRow & { scopeName: string | null }): ShareView {
  const { tokenHash: _hidden, ...rest } = r;
  return { ...rest, scopeName: r.scopeName ?? '(in the trash)', state: shareState(r) };
}

const scopeName = sql<string | null>`CASE ${shareLink.scopeType}
  WHEN 'machine' THEN (SELECT name FROM machine WHERE id = ${shareLink.scopeId} AND deleted_at IS NULL)
  ELSE (SELECT name FROM site WHERE id = ${shareLink.scopeId} AND deleted_at IS NULL) END`;

export async function listShares(ctx: TeamContext): Promise<ShareView[]> {
  const rows = await db.select({ share: shareLink, scopeName }).from(shareLink).where(eq(shareLink.teamId, ctx.team.id)).orderBy(desc(shareLink.createdAt)).limit(500);
  return rows.map((r) => present({ ...r.share, scopeName: r.scopeName }));
}

async function findShare(ctx: TeamContext, id: string) {
  const [row] = await db.select({ share: shareLink, scopeName }).from(shareLink).where(and(eq(shareLink.id, id), eq(shareLink.teamId, ctx.team.id)));
  if (!row) throw notFound('share link');
  return { ...row.share, scopeName: row.scopeName };
}

export const shareUrl = (token: string) => `${config.baseUrl}/s/${token}`;

/** Creates the link; the token is answered once (in `url`) and only its hash is kept. */
export async function createShare(ctx: TeamContext, input: z.infer<typeof shareCreateSchema>): Promise<ShareView & { url: string }> {
  const target = input.scopeType === 'machine' ? await liveMachine(ctx, input.scopeId) : await liveSite(ctx, input.scopeId);
  const expiresAt = parseExpiry(input.expiresAt);
  const token = randomToken();
  const [row] = await db.insert(shareLink).values({
    id: newId('share'), teamId: ctx.team.id, scopeType: input.scopeType, scopeId: target.id, label: input.label,
    tokenHash: sha256(token), createdBy: ctx.user.id, createdByName: ctx.user.name, expiresAt,
  }).returning();
  return { ...present({ ...row!, scopeName: target.name }), url: shareUrl(token) };
}

/** Revokes the link and, in the same statement, every copy e-mailed from it (and copies of those). */
export async function revokeShare(ctx: TeamContext, id: string): Promise<ShareView> {
  await findShare(ctx, id);
  await db.run(sql`WITH RECURSIVE tree(id) AS (
      SELECT ${id} UNION SELECT s.id FROM share_link s JOIN tree ON s.parent_id = tree.id)
    UPDATE share_link SET revoked_at = ${Date.now()}
    WHERE team_id = ${ctx.team.id} AND revoked_at IS NULL AND id IN (SELECT id FROM tree)`);
  return present(await findShare(ctx, id));
}

/**
 * E-mails a fresh link to the same cards with the same expiry (the original token is not kept, so it
 * cannot be re-sent); the new link is listed as a copy of the one it was sent from and ends when
 * that one is revoked.
 */
export async function emailShare(ctx: TeamContext, id: string, to: string, message: string): Promise<{ sent: true; to: string; share: ShareView }> {
  const row = await findShare(ctx, id);
  const refuse = (state: string) => new Conflict(`This link is ${state}; create a new one to send.`);
  if (shareState(row) !== 'active') throw refuse(shareState(row));
  const token = randomToken();
  const [copy] = await db.insert(shareLink).values({
    id: newId('share'), teamId: ctx.team.id, scopeType: row.scopeType, scopeId: row.scopeId, label: row.label ? `${row.label} (e-mailed to ${to})` : `E-mailed to ${to}`,
    tokenHash: sha256(token), createdBy: ctx.user.id, createdByName: ctx.user.name, expiresAt: row.expiresAt, parentId: row.id,
  }).returning();
  // A revocation that ran between the check above and the insert did not see the copy: end it here.
  const [parent] = await db.select({ revokedAt: shareLink.revokedAt }).from(shareLink).where(eq(shareLink.id, row.id));
  if (!parent || parent.revokedAt) {
    await db.update(shareLink).set({ revokedAt: new Date() }).where(eq(shareLink.id, copy!.id));
    throw refuse('revoked');
  }
  const lines = [
    `${ctx.user.name} (${ctx.team.name}) shared the serial settings cards of ${row.scopeName} with you.`,
    ...(message ? [message] : []),
    `The link is read-only and works until ${row.expiresAt.toISOString().slice(0, 10)}.`,
    MACHINERY_CAUTION,
  ];
  await sendMail(linkMessage(to, `Settings cards: ${row.scopeName}`, lines, 'Open the cards', shareUrl(token)));
  return { sent: true, to, share: present({ ...copy!, scopeName: row.scopeName }) };
}

/** The share a token opens, without counting a visit; null for unknown, expired or revoked links. */
export async function findOpenShare(token: string): Promise<ShareRow | null> {
  if (!/^[A-Za-z0-9_-]{16,64}$/.test(token)) return null;
  const [row] = await db.select().from(shareLink).where(eq(shareLink.tokenHash, sha256(token)));
  if (!row || shareState(row) !== 'active') return null;
  const scope = row.scopeType === 'machine' ? machine : site;
  const [live] = await db.select({ id: scope.id }).from(scope).where(and(eq(scope.id, row.scopeId), eq(scope.teamId, row.teamId), sql`${scope.deletedAt} IS NULL`));
  return live ? row : null;
}

/** The share a token opens, counting the visit (a page view, GET); null as for `findOpenShare`. */
export async function openShare(token: string): Promise<ShareRow | null> {
  const row = await findOpenShare(token);
  if (!row) return null;
  await db.update(shareLink).set({ accessCount: sql`${shareLink.accessCount} + 1`, lastAccessAt: new Date() }).where(eq(shareLink.id, row.id));
  return row;
}
