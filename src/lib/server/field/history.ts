/** One timeline for a device: its record and port revisions, and its field-log entries, newest first. */
import { and, desc, eq, inArray, or } from 'drizzle-orm';
import { db } from '../../../db/client';
import { fieldLogEntry, port, revision } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { FIELD_LOG_LABELS } from '../../schemas/field';
import { liveDevice } from './scope';
import { revisionColumns, shownRevision } from '../records/engine';

export interface TimelineItem {
  at: Date;
  source: 'revision' | 'field-log';
  who: string;
  what: string;
  detail: string;
}

export async function deviceTimeline(ctx: TeamContext, deviceId: string, limit = 200): Promise<TimelineItem[]> {
  await liveDevice(ctx, deviceId);
  const ports = await db.select({ id: port.id, name: port.name }).from(port).where(and(eq(port.deviceId, deviceId), eq(port.teamId, ctx.team.id)));
  const portName = new Map(ports.map((p) => [p.id, p.name]));
  const [revs, log] = await Promise.all([
    db.select(revisionColumns).from(revision).where(and(eq(revision.teamId, ctx.team.id), shownRevision, or(
      and(eq(revision.entityType, 'device'), eq(revision.entityId, deviceId)),
      ports.length ? and(eq(revision.entityType, 'port'), inArray(revision.entityId, ports.map((p) => p.id))) : undefined,
    ))).orderBy(desc(revision.createdAt)).limit(limit),
    db.select().from(fieldLogEntry).where(and(eq(fieldLogEntry.teamId, ctx.team.id), eq(fieldLogEntry.deviceId, deviceId))).orderBy(desc(fieldLogEntry.createdAt)).limit(limit),
  ]);
  const items: TimelineItem[] = [
    ...revs.map((r) => ({
      at: r.createdAt, source: 'revision' as const, who: r.userName,
      what: r.entityType === 'port' ? `Port ${portName.get(r.entityId) ?? ''} v${r.version}` : `Device v${r.version}`,
      detail: r.summary || r.action,
    })),
    ...log.map((e) => ({
      at: e.createdAt, source: 'field-log' as const, who: e.userName, what: FIELD_LOG_LABELS[e.kind],
      detail: e.kind === 'replacement' ? `S/N ${e.newSerialNumber}, settings from card revision ${e.appliedVersion}` : e.kind === 'found-different' ? `Found: ${e.foundSettings}` : e.note,
    })),
  ];
  return items.sort((a, b) => b.at.getTime() - a.at.getTime()).slice(0, limit);
}
