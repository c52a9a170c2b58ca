/** Files on devices and machines: checked by content, stored through the storage backend, served by team and role. */
import { createHash } from 'node:crypto';
import { and, desc, eq, inArray, isNull } from 'drizzle-orm';
import { db, type Tx } from '../../../db/client';
import { attachment } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { validate } from '../http';
import { newId } from '../ids';
import { attachmentFieldsSchema } from '../../schemas/field';
import { checkKind, isInlineType, sanitiseFileName } from '../../field/files';
import { storage } from './storage';
import { liveOwner } from './scope';
import type { UploadBody } from './upload-body';
import { Conflict, Invalid, NotFound, Unsupported, notFound } from '../errors';

type AttachmentRow = typeof attachment.$inferSelect;

export interface AttachmentView {
  id: string; ownerType: AttachmentRow['ownerType']; ownerId: string; entryId: string | null; kind: AttachmentRow['kind'];
  fileName: string; contentType: string; size: number; userName: string; createdAt: Date; url: string; image: boolean;
}

export function presentAttachment(r: AttachmentRow): AttachmentView {
  return {
    id: r.id, ownerType: r.ownerType, ownerId: r.ownerId, entryId: r.entryId, kind: r.kind, fileName: r.fileName,
    contentType: r.contentType, size: r.size, userName: r.userName, createdAt: r.createdAt, url: `/api/attachments/${r.id}`,
    image: r.contentType.startsWith('image/'),
  };
}

export async function listAttachments(ctx: TeamContext, ownerType: 'device' | 'machine', ownerId: string): Promise<AttachmentView[]> {
  await liveOwner(ctx, ownerType, ownerId);
  const rows = await db.select().from(attachment)
    .where(and(eq(attachment.teamId, ctx.team.id), eq(attachment.ownerType, ownerType), eq(attachment.ownerId, ownerId)))
    .orderBy(desc(attachment.createdAt), desc(attachment.id));
  return rows.map(presentAttachment);
}

/** Validates the fields and the content, stores the bytes, then records the file; nothing is kept when any step fails. */
export async function createAttachment(ctx: TeamContext, body: UploadBody): Promise<AttachmentView> {
  const fields = validate(attachmentFieldsSchema, body.fields);
  await liveOwner(ctx, fields.ownerType, fields.ownerId);
  if (body.bytes.byteLength === 0) throw new Invalid('file: the file is empty', { fields: { file: 'The file is empty.' } });
  const check = checkKind(fields.kind, body.bytes.subarray(0, 16));
  if (!check.ok) throw new Unsupported(check.message, { fields: { file: check.message } });
  const id = newId('att');
  const key = `${ctx.team.id}/${id}`;
  const row = {
    id, teamId: ctx.team.id, ownerType: fields.ownerType, ownerId: fields.ownerId, kind: fields.kind,
    fileName: sanitiseFileName(body.fileName || `${fields.kind}`), contentType: check.contentType, size: body.bytes.byteLength,
    sha256: createHash('sha256').update(body.bytes).digest('hex'), storageKey: key, userId: ctx.user.id, userName: ctx.user.name,
  };
  await storage().put(key, body.bytes, row.contentType);
  try {
    const [saved] = await db.insert(attachment).values(row).returning();
    return presentAttachment(saved!);
  } catch (err) {
    await storage().delete(key).catch(() => undefined);
    throw err;
  }
}

async function findAttachment(ctx: TeamContext, id: string): Promise<AttachmentRow> {
  const [row] = await db.select().from(attachment).where(and(eq(attachment.id, id), eq(attachment.teamId, ctx.team.id)));
  if (!row) throw notFound('file');
  await liveOwner(ctx, row.ownerType, row.ownerId);
  return row;
}

/** The file as a response: images and PDFs inline, everything else as a download, never sniffed. */
export async function downloadAttachment(ctx: TeamContext, id: string): Promise<Response> {
  const row = await findAttachment(ctx, id);
  const bytes = await storage().get(row.storageKey);
  if (!bytes) throw new NotFound('The stored file is missing.');
  const inline = isInlineType(row.contentType);
  const ascii = row.fileName.replace(/[^\x20-\x7e]|["\\]/g, '_');
  return new Response(bytes as Uint8Array<ArrayBuffer>, {
    status: 200,
    headers: {
      'content-type': inline ? row.contentType : 'application/octet-stream',
      'content-length': String(bytes.byteLength),
      'content-disposition': `${inline ? 'inline' : 'attachment'}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(row.fileName)}`,
      'x-content-type-options': 'nosniff',
      'cache-control': 'private, no-store',
    },
  });
}

/** Removes a file and its bytes; a photo that belongs to a field-log entry stays (entries are permanent). */
export async function deleteAttachment(ctx: TeamContext, id: string): Promise<{ id: string; deleted: true }> {
  const row = await findAttachment(ctx, id);
  if (row.entryId) throw new Conflict('This photo belongs to a field-log entry, which cannot be changed; annotate the entry instead.');
  await db.delete(attachment).where(and(eq(attachment.id, id), eq(attachment.teamId, ctx.team.id), isNull(attachment.entryId)));
  await storage().delete(row.storageKey);
  return { id, deleted: true };
}

/**
 * Deletes, inside `tx`, the attachment rows of records that are being purged; returns their storage
 * keys so the bytes can be removed once the transaction has committed.
 */
export async function detachPurged(tx: Tx, ctx: TeamContext, ownerIds: string[]): Promise<string[]> {
  const keys: string[] = [];
  // In slices: a purged site can hold more ids than one statement may bind.
  for (let lo = 0; lo < ownerIds.length; lo += 500) {
    const owned = and(eq(attachment.teamId, ctx.team.id), inArray(attachment.ownerId, ownerIds.slice(lo, lo + 500)));
    const rows = await tx.select({ key: attachment.storageKey }).from(attachment).where(owned);
    if (rows.length) await tx.delete(attachment).where(owned);
    keys.push(...rows.map((r) => r.key));
  }
  return keys;
}

/** Removes stored bytes after their rows are gone; a failure leaves an unreachable file, never a broken row. */
export async function removeStoredFiles(keys: string[]): Promise<void> {
  for (const key of keys) {
    try {
      await storage().delete(key);
    } catch (err) {
      console.error(`Could not remove stored file ${key}:`, err);
    }
  }
}
