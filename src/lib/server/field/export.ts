/** Export a site or the whole team as one versioned JSON document of our own format. */
import { and, eq, inArray, isNull, sql, type SQL } from 'drizzle-orm';
import type { SQLiteColumn, SQLiteTable } from 'drizzle-orm/sqlite-core';
import { db } from '../../../db/client';
import { command, device, deviceProfile, link, linkMember, machine, port, site } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { EXPORT_FORMAT, EXPORT_VERSION, type ExportDocument } from '../../schemas/field';
import type { StoredBusPlan } from '../../schemas/bus-plan';
import { liveSite } from './scope';
import { nextTurn } from '../jobs/turns';

type Live = { teamId: string; deletedAt: Date | null };
const byKey = <T>(key: (x: T) => string) => (a: T, b: T) => (key(a) < key(b) ? -1 : key(a) > key(b) ? 1 : 0);
const pad = (n: number) => String(n).padStart(8, '0');

/** Rows read per statement; a large team is read a page at a time, letting other requests in between. */
const PAGE = 2000;

async function allRows<T extends SQLiteTable>(t: T, where: SQL | undefined): Promise<T['$inferSelect'][]> {
  const out: T['$inferSelect'][] = [];
  for (let after = 0; ; ) {
    const rows = await db.select({ rowid: sql<number>`${t}.rowid`, row: t as SQLiteTable }).from(t as SQLiteTable)
      .where(and(where, sql`${t}.rowid > ${after}`)).orderBy(sql`${t}.rowid`).limit(PAGE);
    for (const r of rows) out.push(r.row as T['$inferSelect']);
    if (rows.length < PAGE) return out;
    after = Number(rows[rows.length - 1]!.rowid);
    await nextTurn();
  }
}

/**
 * A link's bus plan as exported: polls of members the document holds, naming only commands it holds (a poll of a
 * member in the trash is left out, a command in the trash leaves its byte counts); null when no poll is left.
 */
function exportedPlan(plan: StoredBusPlan | null, members: Set<string>, commands: Set<string>): StoredBusPlan | null {
  const polls = (plan?.polls ?? []).filter((p) => members.has(p.portId)).map(({ commandId, ...p }) => (commandId && commands.has(commandId) ? { ...p, commandId } : p));
  return plan && polls.length ? { ...plan, polls } : null;
}

type Keys<T> = T[];

/** Rows of `t` by id, in the order of `ids`, a batch at a time (the keys say the order; the rows are read when written). */
async function* rowsInOrder<T extends SQLiteTable>(t: T, ids: readonly string[]): AsyncGenerator<T['$inferSelect']> {
  const idCol = (t as unknown as { id: SQLiteColumn }).id;
  for (let lo = 0; lo < ids.length; lo += BATCH) {
    const batch = ids.slice(lo, lo + BATCH);
    const rows = await db.select().from(t as SQLiteTable).where(inArray(idCol, batch));
    const byId = new Map(rows.map((r) => [(r as { id: string }).id, r as T['$inferSelect']]));
    for (const id of batch) {
      const row = byId.get(id);
      if (row) yield row;
    }
    await nextTurn();
  }
}

/** Rows written per chunk of a section; the document is sent as it is written, never held whole. */
const BATCH = 500;

/**
 * The export document, written as it is read (docs/api.md, GET /api/export): the order of every section is worked out
 * first from the records' keys only (ids, parents, names), then the full rows are read a batch at a time in that order
 * and sent, so the server's memory holds the keys, not the document. Checks the site first, so a bad `siteId` is
 * answered before anything is sent. Records in a stable order that does not depend on ids: parents first, then names.
 */
export async function exportStream(ctx: TeamContext, opts: { siteId?: string } = {}): Promise<{ exportedAt: string; chunks: () => AsyncGenerator<string> }> {
  const team = ctx.team.id;
  if (opts.siteId) await liveSite(ctx, opts.siteId);
  const exportedAt = new Date().toISOString();
  const live = <T extends Live>(rows: T[]) => rows.filter((r) => r.teamId === team && !r.deletedAt);
  const sites = await allRows(site, and(eq(site.teamId, team), isNull(site.deletedAt)));
  const machines = await allRows(machine, and(eq(machine.teamId, team), isNull(machine.deletedAt)));
  const keyCols = <C extends Record<string, SQLiteColumn>>(cols: C) => ({ teamId: sql<string>`team_id`, deletedAt: sql<Date | null>`deleted_at`, ...cols });
  const deviceKeys = await allKeys(device, keyCols({ id: device.id, machineId: device.machineId, tag: device.tag, name: device.name, profileId: device.profileId }), and(eq(device.teamId, team), isNull(device.deletedAt)));
  const portKeys = await allKeys(port, keyCols({ id: port.id, deviceId: port.deviceId, position: port.position, name: port.name }), and(eq(port.teamId, team), isNull(port.deletedAt)));
  const links = await allRows(link, and(eq(link.teamId, team), isNull(link.deletedAt)));
  const members = (await allRows(linkMember, eq(linkMember.teamId, team))).sort((a, b) => a.position - b.position);
  const profiles = await allRows(deviceProfile, and(eq(deviceProfile.teamId, team), isNull(deviceProfile.deletedAt)));
  const commandKeys = await allKeys(command, keyCols({ id: command.id, deviceId: command.deviceId, profileId: command.profileId, name: command.name }), and(eq(command.teamId, team), isNull(command.deletedAt)));
  const S = live(sites).filter((s) => !opts.siteId || s.id === opts.siteId).sort(byKey((s) => `${s.name}\u0000${s.customer}\u0000${s.id}`));
  const sIdx = new Map(S.map((s, i) => [s.id, pad(i)]));
  const M = live(machines).filter((m) => sIdx.has(m.siteId)).sort(byKey((m) => `${sIdx.get(m.siteId)}${m.name}\u0000${m.code}\u0000${m.id}`));
  const mIdx = new Map(M.map((m, i) => [m.id, pad(i)]));
  const D = live(deviceKeys).filter((d) => mIdx.has(d.machineId)).sort(byKey((d) => `${mIdx.get(d.machineId)}${d.tag}\u0000${d.name}\u0000${d.id}`));
  const dIdx = new Map(D.map((d, i) => [d.id, pad(i)]));
  const P = live(portKeys).filter((p) => dIdx.has(p.deviceId)).sort(byKey((p) => `${dIdx.get(p.deviceId)}${pad(p.position)}${p.name}\u0000${p.id}`));
  const pIds = new Set(P.map((p) => p.id));
  const L = live(links).filter((l) => mIdx.has(l.machineId)).sort(byKey((l) => `${mIdx.get(l.machineId)}${l.name}\u0000${l.id}`));
  const used = new Set(D.map((d) => d.profileId).filter(Boolean));
  const F = live(profiles).filter((f) => !opts.siteId || used.has(f.id)).sort(byKey((f) => `${f.name}\u0000${f.id}`));
  const fIdx = new Map(F.map((f, i) => [f.id, pad(i)]));
  const C = commandKeys
    .filter((c) => (c.deviceId && dIdx.has(c.deviceId)) || (c.profileId && fIdx.has(c.profileId)))
    .sort(byKey((c) => `${c.deviceId ? `d${dIdx.get(c.deviceId)}` : `p${fIdx.get(c.profileId!)}`}${c.name}\u0000${c.id}`));
  const cIds = new Set(C.map((c) => c.id));

  // Each record as pretty JSON, indented to sit in its section's array (the whole reads like `JSON.stringify(doc, null, 2)`).
  const item = (x: unknown) => `    ${JSON.stringify(x, null, 2).replaceAll('\n', '\n    ')}`;
  async function* section(name: string, records: AsyncIterable<unknown> | Iterable<unknown>, last = false): AsyncGenerator<string> {
    let out = `  ${JSON.stringify(name)}: [`;
    let n = 0;
    for await (const r of records) {
      out += `${n++ ? ',' : ''}\n${item(r)}`;
      if (out.length > 64 * 1024) {
        yield out;
        out = '';
      }
    }
    yield `${out}${n ? '\n  ' : ''}]${last ? '' : ','}\n`;
  }
  async function* mapped<T, U>(rows: AsyncIterable<T>, f: (r: T) => U): AsyncGenerator<U> {
    for await (const r of rows) yield f(r);
  }

  async function* chunks(): AsyncGenerator<string> {
    const head = { format: EXPORT_FORMAT, version: EXPORT_VERSION, exportedAt, source: { team: ctx.team.name, scope: opts.siteId ? 'site' : 'team', siteId: opts.siteId ?? null } };
    yield `${JSON.stringify(head, null, 2).slice(0, -2)},\n`;
    yield* section('sites', S.map((s) => ({ id: s.id, name: s.name, customer: s.customer, address: s.address, notes: s.notes })));
    yield* section('machines', M.map((m) => ({ id: m.id, siteId: m.siteId, name: m.name, code: m.code, notes: m.notes, plcStringCapacity: m.plcStringCapacity })));
    yield* section('profiles', F.map((f) => ({ id: f.id, name: f.name, role: f.role, maker: f.maker, model: f.model, notes: f.notes, ports: f.ports })));
    yield* section('devices', mapped(rowsInOrder(device, D.map((d) => d.id)), (d) => ({
      id: d.id, machineId: d.machineId, profileId: d.profileId && fIdx.has(d.profileId) ? d.profileId : null, tag: d.tag, name: d.name, role: d.role,
      maker: d.maker, model: d.model, serialNumber: d.serialNumber, firmware: d.firmware, location: d.location, notes: d.notes,
      bridges: d.bridges.filter((pair) => pair.every((id) => pIds.has(id))),
    })));
    yield* section('ports', mapped(rowsInOrder(port, P.map((p) => p.id)), (p) => ({ id: p.id, deviceId: p.deviceId, name: p.name, position: p.position, settings: p.settings, wiring: p.wiring, notes: p.notes })));
    yield* section('links', L.map((l) => {
      const kept = members.filter((m) => m.linkId === l.id && pIds.has(m.portId));
      return {
        id: l.id, machineId: l.machineId, name: l.name, kind: l.kind, cableType: l.cableType, cableLengthM: l.cableLengthM, notes: l.notes,
        members: kept.map((m) => ({ portId: m.portId, role: m.role, position: m.position, isEnd: m.isEnd, unitLoads: m.unitLoads, dropM: m.dropM, tapPorts: m.tapPorts })),
        busPlan: exportedPlan(l.busPlan, new Set(kept.map((m) => m.portId)), cIds),
      };
    }));
    yield* section('commands', mapped(rowsInOrder(command, C.map((c) => c.id)), (c) => ({
      id: c.id, deviceId: c.deviceId, profileId: c.profileId, name: c.name, purpose: c.purpose, template: c.template, fieldValues: c.fieldValues as Record<string, string | number | null>,
      replyTemplate: c.replyTemplate ?? null, portName: c.portName, rawUnits: c.rawUnits, notes: c.notes, movesMachinery: c.movesMachinery,
      safeToRepeat: c.safeToRepeat, setsUpDevice: c.setsUpDevice,
      presets: c.presets.map((p) => ({ name: p.name, values: p.values as Record<string, string | number | null> })),
      // Steps refer to the exported commands by their ids in this document (the import maps them to the new ones).
      ...(c.sequence ? { sequence: c.sequence as NonNullable<ExportDocument['commands'][number]['sequence']> } : {}),
    })), true);
    yield '}';
  }
  return { exportedAt, chunks };
}

/** Only the named columns of every row matching `where`, a page at a time (the keys that order an export). */
async function allKeys<T extends SQLiteTable, C extends Record<string, SQLiteColumn | SQL.Aliased | SQL>>(t: T, cols: C, where: SQL | undefined) {
  const out: Keys<{ [K in keyof C]: C[K] extends SQLiteColumn ? C[K]['_']['data'] : C[K] extends SQL<infer V> ? V : never }> = [];
  for (let after = 0; ; ) {
    const rows = await db.select({ rowid: sql<number>`${t}.rowid`, ...cols } as Record<string, SQL | SQLiteColumn>).from(t as SQLiteTable)
      .where(and(where, sql`${t}.rowid > ${after}`)).orderBy(sql`${t}.rowid`).limit(PAGE);
    for (const r of rows) out.push(r as never);
    if (rows.length < PAGE) return out;
    after = Number((rows[rows.length - 1] as { rowid: number }).rowid);
    await nextTurn();
  }
}
