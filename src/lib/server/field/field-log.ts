/**
 * The field log: entries technicians add at the device, each with photos and later annotations.
 * Nothing here updates or deletes an entry; annotations are the only way to add to one.
 */
import { and, asc, desc, eq, inArray, isNull } from 'drizzle-orm';
import { db } from '../../../db/client';
import { attachment, fieldLogAnnotation, fieldLogEntry } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { newId } from '../ids';
import type { FieldLogCreate } from '../../schemas/field';
import { cardRevision } from './cards';
import { liveDevice } from './scope';
import { presentAttachment, type AttachmentView } from './attachments';
import { Conflict, Invalid, isUniqueViolation, notFound } from '../errors';
import { doneAtProblem } from '../../field/done-at';
import { makesProposal, notifyReviewers, proposalsOfEntries, proposeFromEntry, type ProposalView } from './proposals';

type EntryRow = typeof fieldLogEntry.$inferSelect;
type AnnotationRow = typeof fieldLogAnnotation.$inferSelect;

export interface FieldLogEntryView extends EntryRow {
  annotations: AnnotationRow[];
  photos: AttachmentView[];
  /** Other files of the entry: the live link's exchange log of a "communication verified" entry. */
  files: AttachmentView[];
  /** What a replacement or finding proposed for the record, and the engineer's decision; null for other kinds. */
  proposal: ProposalView | null;
}

export async function listFieldLog(ctx: TeamContext, deviceId: string, limit = 200): Promise<FieldLogEntryView[]> {
  await liveDevice(ctx, deviceId);
  const entries = await db.select().from(fieldLogEntry)
    .where(and(eq(fieldLogEntry.teamId, ctx.team.id), eq(fieldLogEntry.deviceId, deviceId)))
    .orderBy(desc(fieldLogEntry.createdAt), desc(fieldLogEntry.id)).limit(limit);
  if (!entries.length) return [];
  const ids = entries.map((e) => e.id);
  const [notes, photos, proposals] = await Promise.all([
    db.select().from(fieldLogAnnotation).where(and(eq(fieldLogAnnotation.teamId, ctx.team.id), inArray(fieldLogAnnotation.entryId, ids))).orderBy(asc(fieldLogAnnotation.createdAt)),
    db.select().from(attachment).where(and(eq(attachment.teamId, ctx.team.id), inArray(attachment.entryId, ids))).orderBy(asc(attachment.createdAt)),
    proposalsOfEntries(ctx, ids),
  ]);
  return entries.map((e) => ({
    ...e,
    annotations: notes.filter((n) => n.entryId === e.id),
    photos: photos.filter((p) => p.entryId === e.id && p.kind === 'photo').map(presentAttachment),
    files: photos.filter((p) => p.entryId === e.id && p.kind !== 'photo').map(presentAttachment),
    proposal: proposals.get(e.id) ?? null,
  }));
}

/** An entry the phone sent before under the same client key: the same entry again, or 409 when the key is another's. */
async function earlierSend(ctx: TeamContext, deviceId: string, clientKey: string | undefined): Promise<FieldLogEntryView | null> {
  if (!clientKey) return null;
  const [row] = await db.select({ id: fieldLogEntry.id, deviceId: fieldLogEntry.deviceId, userId: fieldLogEntry.userId }).from(fieldLogEntry)
    .where(and(eq(fieldLogEntry.teamId, ctx.team.id), eq(fieldLogEntry.clientKey, clientKey)));
  if (!row) return null;
  if (row.deviceId !== deviceId || row.userId !== ctx.user.id) {
    throw new Conflict('This client key belongs to another field-log entry: send the entry with a new key.');
  }
  return (await listFieldLog(ctx, deviceId)).find((e) => e.id === row.id) ?? null;
}

/**
 * Writes the entry and claims its photos (uploaded beforehand to the device, not yet in any entry) in one transaction;
 * a replacement or finding also writes its proposal there, and its reviewers are e-mailed once it is saved.
 * An entry sent again with a client key the team already has answers the entry written the first time
 * (`created: false`) and writes nothing.
 */
export async function createFieldLogEntry(ctx: TeamContext, deviceId: string, input: FieldLogCreate, now = new Date()): Promise<FieldLogEntryView & { created: boolean }> {
  const doneAt = input.doneAt ? new Date(input.doneAt) : now;
  const problem = doneAtProblem(doneAt, now);
  if (problem) throw new Invalid(`doneAt: ${problem}`, { fields: { doneAt: problem } });
  const before = await earlierSend(ctx, deviceId, input.clientKey);
  if (before) return { ...before, created: false };
  const id = newId('flog');
  try {
    await writeEntry(ctx, deviceId, input, id, doneAt);
  } catch (err) {
    // The same entry sent twice at once: the second send answers the first one's entry.
    if (!isUniqueViolation(err)) throw err;
    const winner = await earlierSend(ctx, deviceId, input.clientKey);
    if (!winner) throw err;
    return { ...winner, created: false };
  }
  if (makesProposal(input.kind)) await notifyReviewers(ctx, id);
  return { ...(await listFieldLog(ctx, deviceId)).find((e) => e.id === id)!, created: true };
}

async function writeEntry(ctx: TeamContext, deviceId: string, input: FieldLogCreate, id: string, doneAt: Date): Promise<void> {
  await db.transaction(async (tx) => {
    const dev = await liveDevice(ctx, deviceId, tx);
    const rev = await cardRevision(ctx, deviceId);
    if (input.kind === 'replacement' && input.appliedVersion > rev.number) {
      throw new Invalid(`appliedVersion: this card is at revision ${rev.number}`, {
        fields: { appliedVersion: `The card is at revision ${rev.number}; enter a revision from 1 to ${rev.number}.` },
      });
    }
    const photoIds = [...new Set(input.photoIds)];
    if (photoIds.length) {
      const found = await tx.select({ id: attachment.id }).from(attachment).where(and(
        eq(attachment.teamId, ctx.team.id), inArray(attachment.id, photoIds), eq(attachment.ownerType, 'device'),
        eq(attachment.ownerId, deviceId), eq(attachment.kind, 'photo'), isNull(attachment.entryId),
      ));
      if (found.length !== photoIds.length) {
        throw new Invalid('photoIds: upload the photos to this device first', { fields: { photoIds: 'One of the photos is not an unused photo of this device.' } });
      }
    }
    const exchangeLogId = input.kind === 'verified' ? input.exchangeLogId : undefined;
    if (exchangeLogId) {
      const [file] = await tx.select({ id: attachment.id }).from(attachment).where(and(
        eq(attachment.teamId, ctx.team.id), eq(attachment.id, exchangeLogId), eq(attachment.ownerType, 'device'),
        eq(attachment.ownerId, deviceId), eq(attachment.kind, 'config'), isNull(attachment.entryId),
      ));
      if (!file) {
        throw new Invalid('exchangeLogId: upload the exchange log to this device first', { fields: { exchangeLogId: 'The exchange log is not an unused configuration file of this device.' } });
      }
    }
    await tx.insert(fieldLogEntry).values({
      id, teamId: ctx.team.id, deviceId, kind: input.kind, note: input.note,
      newSerialNumber: input.kind === 'replacement' ? input.newSerialNumber : '',
      appliedVersion: input.kind === 'replacement' ? input.appliedVersion : null,
      foundSettings: input.kind === 'found-different' ? input.foundSettings : '',
      deviceVersion: rev.number, userId: ctx.user.id, userName: ctx.user.name,
      doneAt, clientKey: input.clientKey ?? null,
    });
    const claimed = exchangeLogId ? [...photoIds, exchangeLogId] : photoIds;
    if (claimed.length) await tx.update(attachment).set({ entryId: id }).where(and(eq(attachment.teamId, ctx.team.id), inArray(attachment.id, claimed)));
    await proposeFromEntry(tx, ctx, dev, id, input);
  });
}

export async function annotateEntry(ctx: TeamContext, entryId: string, note: string): Promise<AnnotationRow> {
  return db.transaction(async (tx) => {
    const [entry] = await tx.select({ id: fieldLogEntry.id, deviceId: fieldLogEntry.deviceId }).from(fieldLogEntry)
      .where(and(eq(fieldLogEntry.id, entryId), eq(fieldLogEntry.teamId, ctx.team.id)));
    if (!entry) throw notFound('field-log entry');
    await liveDevice(ctx, entry.deviceId, tx);
    const [row] = await tx.insert(fieldLogAnnotation).values({ id: newId('fnote'), teamId: ctx.team.id, entryId, note, userId: ctx.user.id, userName: ctx.user.name }).returning();
    return row!;
  });
}
