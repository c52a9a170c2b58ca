/**
 * Proposals: what a replacement or a finding on site says the device's record should become (serial number,
 * firmware, one port's settings), waiting for an engineer to accept (a new revision of the device and the port,
 * citing the entry) or decline with a note. The log entry itself is never changed (docs/decisions/014).
 */
import { and, desc, eq, inArray, isNull, type SQL } from 'drizzle-orm';
import { db, type DbOrTx } from '../../../db/client';
import { device, fieldLogEntry, fieldProposal, membership, port, user, type ProposalStatus } from '../../../db/schema';
import type { TeamContext, TeamScope } from '../guard';
import { newId } from '../ids';
import { portSettingsSchema, type PortSettings } from '../../frame/port-settings';
import type { FieldLogCreate, FoundPortSettings } from '../../schemas/field';
import { FIELD_LOG_LABELS } from '../../schemas/field';
import { formerSerialsAfter } from '../../field/serials';
import { findInTeam, updateVersioned } from '../records/engine';
import { deviceEntity, portEntity, type DeviceRow } from '../records/entities';
import { getDevice } from '../vault/devices';
import { presentPort } from '../vault/present';
import { Conflict, Invalid, notFound } from '../errors';
import { linkMessage, sendMail } from '../mail';
import { config } from '../../../config';

type ProposalRow = typeof fieldProposal.$inferSelect;

export interface ProposalView {
  id: string;
  entryId: string;
  deviceId: string;
  deviceTag: string;
  deviceName: string;
  kind: ProposalRow['kind'];
  status: ProposalStatus;
  /** What the technician found or fitted ('' = not reported). */
  found: { serialNumber: string; firmware: string; port: { id: string | null; name: string; settings: FoundPortSettings } | null };
  /** The record when the entry was written. */
  atEntry: { serialNumber: string; firmware: string; version: number; portSettings: PortSettings | null };
  /** The record now, with the versions an acceptance must name. */
  record: { serialNumber: string; firmware: string; version: number; port: { id: string; name: string; version: number; settings: PortSettings } | null };
  entry: { note: string; foundSettings: string; appliedVersion: number | null; userName: string; userId: string | null; createdAt: Date };
  decision: { note: string; by: string; at: Date; version: number | null; portVersion: number | null } | null;
  createdAt: Date;
}

/** The field-log kinds that make a proposal. */
export const makesProposal = (kind: FieldLogCreate['kind']): kind is 'replacement' | 'found-different' => kind === 'replacement' || kind === 'found-different';

/** The port's settings with the found ones laid over them; 422 naming each setting the result would break. */
function settingsWithFound(current: PortSettings, found: FoundPortSettings, field: string): PortSettings {
  // Found only one side of the control lines (the older handshake/direction keys, or the lines themselves): the
  // record's other side is derived again from what was found, rather than left to disagree with it.
  const base: Partial<PortSettings> = { ...current };
  const gives = (keys: readonly (keyof PortSettings)[]) => keys.some((k) => (found as Partial<PortSettings>)[k] !== undefined);
  const OLD = ['handshake', 'rs485Direction'] as const;
  const LINES = ['rtsMode', 'ctsMode', 'dtrMode'] as const;
  if (gives(OLD) && !gives(LINES)) for (const k of LINES) delete base[k];
  if (gives(LINES) && !gives(OLD)) for (const k of OLD) delete base[k];
  const merged = portSettingsSchema.safeParse({ ...base, ...found });
  if (merged.success) return merged.data;
  const fields = Object.fromEntries(merged.error.issues.map((i) => [`${field}.${i.path.join('.')}`, i.message]));
  const first = merged.error.issues[0]!;
  throw new Invalid(`${field}.${first.path.join('.')}: ${first.message}`, { fields });
}

/**
 * Writes the proposal of a replacement or found-different entry, in the entry's transaction: what was found, and
 * the record as it stands (serial, firmware, version, the named port's settings). The named port must be a live
 * port of this device, and its settings with the found ones laid over them must still be valid settings.
 */
export async function proposeFromEntry(tx: DbOrTx, ctx: TeamContext, dev: DeviceRow, entryId: string, input: FieldLogCreate): Promise<void> {
  if (input.kind === 'verified') return;
  let portRef: { id: string; name: string; settings: FoundPortSettings; record: PortSettings } | null = null;
  if (input.kind === 'found-different' && input.port) {
    const [row] = await tx.select().from(port).where(and(eq(port.id, input.port.portId), eq(port.deviceId, dev.id), eq(port.teamId, ctx.team.id), isNull(port.deletedAt)));
    if (!row) throw new Invalid('port.portId: choose a port of this device', { fields: { 'port.portId': 'Choose one of this device\'s ports.' } });
    settingsWithFound(row.settings, input.port.settings, 'port.settings');
    portRef = { id: row.id, name: row.name, settings: input.port.settings, record: row.settings };
  }
  await tx.insert(fieldProposal).values({
    id: newId('prop'),
    teamId: ctx.team.id,
    deviceId: dev.id,
    entryId,
    kind: input.kind,
    serialNumber: input.kind === 'replacement' ? input.newSerialNumber : input.serialNumber,
    firmware: input.firmware,
    portId: portRef?.id ?? null,
    portName: portRef?.name ?? '',
    portSettings: portRef?.settings ?? null,
    recordSerialNumber: dev.serialNumber,
    recordFirmware: dev.firmware,
    recordVersion: dev.version,
    recordPortSettings: portRef?.record ?? null,
  });
}

const words = (key: string) => key.replace(/([A-Z])/g, ' $1').toLowerCase();

/** The found port settings in a line of words ("baud 19200, parity even"). */
export function foundSettingsText(s: FoundPortSettings): string {
  return Object.entries(s).filter(([, v]) => v !== undefined).map(([k, v]) => `${words(k)} ${v === null ? 'none' : String(v)}`).join(', ');
}

/**
 * E-mails the team's engineers, admins and owners (not the author) that a proposal waits for them. Runs after the
 * entry is saved: a message that cannot be sent is logged and does not undo the entry.
 */
export async function notifyReviewers(ctx: TeamContext, entryId: string): Promise<number> {
  const [p] = await proposalRows(ctx, eq(fieldProposal.entryId, entryId));
  if (!p) return 0;
  const reviewers = await db.select({ email: user.email }).from(membership).innerJoin(user, eq(user.id, membership.userId))
    .where(and(eq(membership.teamId, ctx.team.id), inArray(membership.role, ['owner', 'admin', 'engineer'])));
  const to = reviewers.map((r) => r.email).filter((e) => e.toLowerCase() !== ctx.user.email.toLowerCase());
  const title = p.deviceName ? `${p.deviceTag} ${p.deviceName}` : p.deviceTag;
  const lines = [
    `${ctx.user.name} logged "${FIELD_LOG_LABELS[p.kind]}" at ${title} (${ctx.team.name}). It proposes a change to the record and waits for an engineer's review.`,
    ...(p.found.serialNumber ? [`Serial number: ${p.atEntry.serialNumber || '(none recorded)'} → ${p.found.serialNumber}`] : []),
    ...(p.found.firmware ? [`Firmware: ${p.atEntry.firmware || '(none recorded)'} → ${p.found.firmware}`] : []),
    ...(p.found.port ? [`Port ${p.found.port.name} as found: ${foundSettingsText(p.found.port.settings)}`] : []),
    ...(p.entry.foundSettings ? [`Found on site: ${p.entry.foundSettings}`] : []),
    ...(p.entry.note ? [`Note: ${p.entry.note}`] : []),
  ];
  let sent = 0;
  for (const address of to) {
    try {
      await sendMail(linkMessage(address, `Waiting for review: ${FIELD_LOG_LABELS[p.kind].toLowerCase()} at ${p.deviceTag}`, lines, 'Review it on the device page', `${config.baseUrl}/vault/devices/${p.deviceId}`));
      sent++;
    } catch (err) {
      console.error(`proposal mail to ${address} not sent:`, err);
    }
  }
  return sent;
}

async function proposalRows(ctx: TeamScope, where: SQL | undefined, q: DbOrTx = db, limit = 200): Promise<ProposalView[]> {
  const rows = await q
    .select({ p: fieldProposal, e: fieldLogEntry, d: { tag: device.tag, name: device.name, serialNumber: device.serialNumber, firmware: device.firmware, version: device.version } })
    .from(fieldProposal)
    .innerJoin(fieldLogEntry, eq(fieldLogEntry.id, fieldProposal.entryId))
    .innerJoin(device, eq(device.id, fieldProposal.deviceId))
    .where(and(eq(fieldProposal.teamId, ctx.team.id), isNull(device.deletedAt), where))
    .orderBy(desc(fieldProposal.createdAt), desc(fieldProposal.id))
    .limit(limit);
  const portIds = [...new Set(rows.map((r) => r.p.portId).filter((id): id is string => !!id))];
  const ports = portIds.length ? await q.select().from(port).where(and(inArray(port.id, portIds), isNull(port.deletedAt))) : [];
  return rows.map(({ p, e, d }) => {
    const live = ports.find((x) => x.id === p.portId);
    return {
      id: p.id, entryId: p.entryId, deviceId: p.deviceId, deviceTag: d.tag, deviceName: d.name, kind: p.kind, status: p.status,
      found: { serialNumber: p.serialNumber, firmware: p.firmware, port: p.portSettings ? { id: p.portId, name: p.portName, settings: p.portSettings } : null },
      atEntry: { serialNumber: p.recordSerialNumber, firmware: p.recordFirmware, version: p.recordVersion, portSettings: p.recordPortSettings },
      record: {
        serialNumber: d.serialNumber, firmware: d.firmware, version: d.version,
        port: live ? { id: live.id, name: live.name, version: live.version, settings: presentPort(live).settings } : null,
      },
      entry: { note: e.note, foundSettings: e.foundSettings, appliedVersion: e.appliedVersion, userName: e.userName, userId: e.userId, createdAt: e.createdAt },
      decision: p.status === 'pending' ? null : { note: p.decisionNote, by: p.decidedByName, at: p.decidedAt!, version: p.acceptedVersion, portVersion: p.acceptedPortVersion },
      createdAt: p.createdAt,
    };
  });
}

/** The team's proposals (of live devices), newest first: all pending ones by default, or one device's. */
export async function listProposals(ctx: TeamScope, opts: { deviceId?: string; status?: ProposalStatus | 'all' } = {}): Promise<ProposalView[]> {
  if (opts.deviceId) await findInTeam(db, ctx, deviceEntity, opts.deviceId);
  const status = opts.status ?? 'pending';
  return proposalRows(ctx, and(
    opts.deviceId ? eq(fieldProposal.deviceId, opts.deviceId) : undefined,
    status === 'all' ? undefined : eq(fieldProposal.status, status),
  ));
}

/** The proposals of these field-log entries, by entry id (what the log shows of each outcome). */
export async function proposalsOfEntries(ctx: TeamScope, entryIds: string[]): Promise<Map<string, ProposalView>> {
  if (!entryIds.length) return new Map();
  const rows = await proposalRows(ctx, inArray(fieldProposal.entryId, entryIds), db, entryIds.length);
  return new Map(rows.map((r) => [r.entryId, r]));
}

export async function getProposal(ctx: TeamScope, id: string, q: DbOrTx = db): Promise<ProposalView> {
  const [row] = await proposalRows(ctx, eq(fieldProposal.id, id), q, 1);
  if (!row) throw notFound('proposal');
  return row;
}

function refuseDecided(p: ProposalView) {
  if (p.status !== 'pending') {
    throw new Conflict(`This proposal was already ${p.status} by ${p.decision?.by || 'someone'}; nothing changed.`, { proposal: p });
  }
}

const cite = (p: ProposalView) => `from field-log entry ${p.entryId} (${FIELD_LOG_LABELS[p.kind].toLowerCase()}, ${p.entry.userName || 'a technician'}, ${p.entry.createdAt.toISOString().slice(0, 10)})`;

/**
 * Accepts a pending proposal: the device record takes the serial number and firmware reported (the old serial
 * joins its earlier ones) as a new revision whose summary cites the entry, and the named port takes the settings
 * found as a new port revision. `version` (and `portVersion` when the proposal names a port) must be current,
 * else 409 with the record as it is now; nothing is written unless all of it is.
 */
export async function acceptProposal(ctx: TeamContext, id: string, input: { version: number; portVersion?: number }): Promise<ProposalView> {
  return db.transaction(async (tx) => {
    const p = await getProposal(ctx, id, tx);
    refuseDecided(p);
    const before = await findInTeam(tx, ctx, deviceEntity, p.deviceId);
    const values: Record<string, unknown> = {};
    if (p.found.serialNumber && p.found.serialNumber !== before.serialNumber) {
      values.serialNumber = p.found.serialNumber;
      const former = formerSerialsAfter(before, p.found.serialNumber);
      if (former) values.formerSerials = former;
    }
    if (p.found.firmware && p.found.firmware !== before.firmware) values.firmware = p.found.firmware;
    const summary = `Accepted ${cite(p)}`;
    const dev = await updateVersioned(tx, ctx, deviceEntity, p.deviceId, input.version, values, { summary, present: () => getDevice(ctx, p.deviceId, tx) });
    let portVersion: number | null = null;
    if (p.found.port) {
      if (!p.found.port.id || !p.record.port) throw new Conflict(`Port ${p.found.port.name} is no longer on this device; decline the proposal, or add the port again first.`);
      if (input.portVersion === undefined) {
        throw new Invalid('portVersion: send the version of the port you reviewed', { fields: { portVersion: `Send the version of port ${p.found.port.name} you reviewed.` } });
      }
      const settings = settingsWithFound(p.record.port.settings, p.found.port.settings, 'settings');
      const res = await updateVersioned(tx, ctx, portEntity, p.found.port.id, input.portVersion, { settings }, { summary, present: (r) => presentPort(r) });
      portVersion = res.changes.length ? res.row.version : null;
    }
    const done = await tx.update(fieldProposal).set({
      status: 'accepted', decidedBy: ctx.user.id, decidedByName: ctx.user.name, decidedAt: new Date(),
      acceptedVersion: dev.changes.length ? dev.row.version : null, acceptedPortVersion: portVersion,
    }).where(and(eq(fieldProposal.id, id), eq(fieldProposal.teamId, ctx.team.id), eq(fieldProposal.status, 'pending')));
    if (done.rowsAffected === 0) refuseDecided(await getProposal(ctx, id, tx));
    return getProposal(ctx, id, tx);
  });
}

/** Declines a pending proposal with a note the technician sees on the entry; the record is left as it is. */
export async function declineProposal(ctx: TeamContext, id: string, note: string): Promise<ProposalView> {
  return db.transaction(async (tx) => {
    const p = await getProposal(ctx, id, tx);
    refuseDecided(p);
    await tx.update(fieldProposal).set({ status: 'declined', decisionNote: note, decidedBy: ctx.user.id, decidedByName: ctx.user.name, decidedAt: new Date() })
      .where(and(eq(fieldProposal.id, id), eq(fieldProposal.teamId, ctx.team.id), eq(fieldProposal.status, 'pending')));
    return getProposal(ctx, id, tx);
  });
}
