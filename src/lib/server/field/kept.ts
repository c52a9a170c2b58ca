/**
 * What a phone fetches to keep a machine's or a site's field cards for use without a network
 * (docs/decisions/017-offline-cards.md): the card pages (their QR links), the field-log and file lists the cards
 * read, the photos in the kept devices' field logs, the list page of kept cards and the sign-out page. Only the active team's live records: another team's ids and records in
 * the trash come back as `missing`, with nothing to fetch.
 */
import { and, asc, desc, eq, inArray, isNotNull, isNull } from 'drizzle-orm';
import { db } from '../../../db/client';
import { attachment, device, machine } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { can } from '../../permissions';
import { Invalid, NotFound } from '../errors';
import { KEPT_MAX_DEVICES } from '../../schemas/field';
import { liveMachine, liveSite } from './scope';

export interface KeptDevice { id: string; tag: string; name: string; cardUrl: string }
export interface KeptMachine { id: string; name: string; cardsUrl: string; devices: KeptDevice[] }
export interface KeptScopeView { type: 'machine' | 'site'; id: string; name: string; machines: KeptMachine[] }
export interface KeptList {
  teamId: string;
  userId: string;
  /** The server's time of this answer: the moment the phone's copy is brought up to date to. */
  at: string;
  scopes: KeptScopeView[];
  missing: { type: 'machine' | 'site'; id: string }[];
  /** Every same-origin address to keep, pages first. */
  urls: string[];
  /** Whether this member may write field-log entries (and so queue them offline). */
  canLog: boolean;
}

async function machinesWithDevices(ctx: TeamContext, ms: { id: string; name: string }[]): Promise<KeptMachine[]> {
  if (!ms.length) return [];
  const devices = await db.select({ id: device.id, tag: device.tag, name: device.name, machineId: device.machineId }).from(device)
    .where(and(eq(device.teamId, ctx.team.id), inArray(device.machineId, ms.map((m) => m.id)), isNull(device.deletedAt))).orderBy(asc(device.tag));
  return ms.map((m) => ({
    id: m.id, name: m.name, cardsUrl: `/field/machines/${m.id}`,
    devices: devices.filter((d) => d.machineId === m.id).map((d) => ({ id: d.id, tag: d.tag, name: d.name, cardUrl: `/field/devices/${d.id}` })),
  }));
}

/** Most bytes of field-log photos one phone keeps, newest first; older photos beyond it load only online. */
export const KEPT_MAX_PHOTO_BYTES = 50 * 1024 * 1024;

/**
 * The photos already in these devices' field logs (claimed by an entry), this team's only, newest first, as long
 * as they fit in KEPT_MAX_PHOTO_BYTES together. Unclaimed uploads and other files are not kept.
 */
async function fieldLogPhotos(ctx: TeamContext, deviceIds: string[]): Promise<string[]> {
  if (!deviceIds.length) return [];
  const rows = await db.select({ id: attachment.id, size: attachment.size }).from(attachment)
    .where(and(eq(attachment.teamId, ctx.team.id), eq(attachment.ownerType, 'device'), inArray(attachment.ownerId, deviceIds), isNotNull(attachment.entryId), eq(attachment.kind, 'photo')))
    .orderBy(desc(attachment.createdAt), desc(attachment.id));
  const urls: string[] = [];
  let bytes = 0;
  for (const r of rows) {
    if (bytes + r.size > KEPT_MAX_PHOTO_BYTES) break;
    bytes += r.size;
    urls.push(`/api/attachments/${r.id}`);
  }
  return urls;
}

async function orMissing<T>(load: () => Promise<T>): Promise<T | null> {
  try {
    return await load();
  } catch (err) {
    if (err instanceof NotFound) return null;
    throw err;
  }
}

export async function keptCards(ctx: TeamContext, wanted: { machine: string[]; site: string[] }, now = new Date()): Promise<KeptList> {
  const scopes: KeptScopeView[] = [];
  const missing: KeptList['missing'] = [];
  for (const id of new Set(wanted.site)) {
    const s = await orMissing(() => liveSite(ctx, id));
    if (!s) { missing.push({ type: 'site', id }); continue; }
    const ms = await db.select({ id: machine.id, name: machine.name }).from(machine)
      .where(and(eq(machine.teamId, ctx.team.id), eq(machine.siteId, s.id), isNull(machine.deletedAt))).orderBy(asc(machine.name));
    scopes.push({ type: 'site', id: s.id, name: s.name, machines: await machinesWithDevices(ctx, ms) });
  }
  for (const id of new Set(wanted.machine)) {
    const m = await orMissing(() => liveMachine(ctx, id));
    if (!m) { missing.push({ type: 'machine', id }); continue; }
    scopes.push({ type: 'machine', id: m.id, name: m.name, machines: await machinesWithDevices(ctx, [{ id: m.id, name: m.name }]) });
  }
  const machines = new Map(scopes.flatMap((s) => s.machines).map((m) => [m.id, m]));
  const devices = new Map([...machines.values()].flatMap((m) => m.devices).map((d) => [d.id, d]));
  if (devices.size > KEPT_MAX_DEVICES) {
    throw new Invalid(`Too many cards to keep: ${devices.size} (at most ${KEPT_MAX_DEVICES}). Keep single machines rather than whole sites.`);
  }
  // The list page and the sign-out page (which warns about entries not yet sent) open offline too.
  const urls = ['/field/kept', '/sign-out'];
  for (const m of machines.values()) urls.push(m.cardsUrl, `/api/attachments?ownerType=machine&ownerId=${m.id}`);
  for (const d of devices.values()) urls.push(d.cardUrl, `/api/devices/${d.id}/field-log`, `/api/attachments?ownerType=device&ownerId=${d.id}`);
  urls.push(...await fieldLogPhotos(ctx, [...devices.keys()]));
  return { teamId: ctx.team.id, userId: ctx.user.id, at: now.toISOString(), scopes, missing, urls, canLog: can(ctx.role, 'fieldLog:create') };
}
