/**
 * Import an export document into the caller's team: preview what would be created, then write it as a
 * staged job (short batches, then one short final transaction). The import map remembers which record
 * each source id became, so importing the same document again creates nothing new.
 */
import { and, eq, inArray, isNull } from 'drizzle-orm';
import { db, type DbOrTx } from '../../../db/client';
import { command, device, deviceProfile, importMap, link, machine, port, site } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { exportDocumentSchema, EXPORT_FORMAT, EXPORT_VERSIONS_READ, EXPORT_VERSIONS_TEXT, type ExportDocument } from '../../schemas/field';
import { documentProblems } from '../../field/export-check';
import { nameKey } from '../../schemas/vault';
import { stageImport } from './import-write';
import { runStagedJob } from '../jobs/jobs';
import { Conflict, Invalid } from '../errors';

export const SECTIONS = ['sites', 'machines', 'profiles', 'devices', 'ports', 'links', 'commands'] as const;
export type Section = (typeof SECTIONS)[number];
const TABLES = { sites: site, machines: machine, profiles: deviceProfile, devices: device, ports: port, links: link, commands: command } as const;

export interface ImportResult {
  applied: boolean;
  source: ExportDocument['source'];
  counts: Record<Section, { create: number; existing: number }>;
}

/** Validates shape and references; 422 with the first problems in words. */
export function readDocument(raw: unknown): ExportDocument {
  const head = raw as { format?: unknown; version?: unknown } | null;
  if (!head || typeof head !== 'object' || head.format !== EXPORT_FORMAT) {
    throw new Invalid(`document: not a ${EXPORT_FORMAT} document (format must be "${EXPORT_FORMAT}")`, { fields: { 'document.format': 'Not an export of this app.' } });
  }
  if (!(EXPORT_VERSIONS_READ as readonly unknown[]).includes(head.version)) {
    throw new Invalid(`document: version ${String(head.version)} is not supported; this server reads ${EXPORT_VERSIONS_TEXT}`);
  }
  const parsed = exportDocumentSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    throw new Invalid(`document.${issue.path.join('.')}: ${issue.message}`, { problems: parsed.error.issues.slice(0, 20).map((i) => `${i.path.join('.')}: ${i.message}`) });
  }
  const problems = documentProblems(parsed.data);
  if (problems.length) throw new Invalid(`document: ${problems[0]}`, { problems });
  return parsed.data;
}

/** Source id → target id for records imported before and still present in this team (live or in the trash). */
async function existingTargets(q: DbOrTx, ctx: TeamContext): Promise<Record<Section, Map<string, string>>> {
  const rows = await q.select().from(importMap).where(eq(importMap.teamId, ctx.team.id));
  const out = Object.fromEntries(SECTIONS.map((s) => [s, new Map<string, string>()])) as Record<Section, Map<string, string>>;
  for (const s of SECTIONS) {
    const mapped = rows.filter((r) => r.entityType === s);
    if (!mapped.length) continue;
    const t = TABLES[s];
    const present = new Set((await q.select({ id: t.id }).from(t).where(eq(t.teamId, ctx.team.id))).map((r) => r.id));
    for (const r of mapped) if (present.has(r.targetId)) out[s].set(r.sourceId, r.targetId);
  }
  return out;
}

export async function importDocument(ctx: TeamContext, raw: unknown, apply: boolean): Promise<ImportResult> {
  const doc = readDocument(raw);
  const check = async (q: DbOrTx) => {
    const known = await existingTargets(q, ctx);
    const counts = Object.fromEntries(SECTIONS.map((s) => {
      const existing = doc[s].filter((r) => known[s].has(r.id)).length;
      return [s, { create: doc[s].length - existing, existing }];
    })) as ImportResult['counts'];
    await tagClashes(q, ctx, doc, known);
    await portNameClashes(q, ctx, doc, known);
    return { known, counts };
  };
  if (!apply) return { applied: false, source: doc.source, counts: (await check(db)).counts };
  let checked: Awaited<ReturnType<typeof check>>;
  return runStagedJob(ctx, 'json-import', {
    async stage(stage) {
      checked = await check(db);
      // Each new record, its creation revision and its import map entry; and the members of new links.
      const fresh = SECTIONS.reduce((n, s) => n + checked.counts[s].create, 0);
      const members = doc.links.filter((l) => !checked.known.links.has(l.id)).reduce((n, l) => n + l.members.length, 0);
      stage.countStaged(fresh * 3 + members);
      await stageImport(stage, ctx, doc, checked.known);
    },
    async verify(tx) {
      // The same document imported meanwhile, or an earlier copy purged, would change what is new.
      const now = await check(tx);
      if (!sameTargets(now.known, checked.known)) {
        throw new Conflict('Records of this document were imported or purged while it was being imported; nothing was written. Import it again.');
      }
    },
    result: () => ({ applied: true, source: doc.source, counts: checked.counts }),
  });
}

function sameTargets(a: Record<Section, Map<string, string>>, b: Record<Section, Map<string, string>>): boolean {
  return SECTIONS.every((s) => a[s].size === b[s].size && [...a[s]].every(([k, v]) => b[s].get(k) === v));
}

/** The first new record whose name, under its parent, a live record there already has (names compare by `nameKey`). */
function firstClash<T>(fresh: T[], live: [parent: string, name: string][], placeOf: (r: T) => [parent: string, name: string]): T | undefined {
  const key = ([parent, name]: [string, string]) => `${parent}\u0000${nameKey(name)}`;
  const taken = new Set(live.map(key));
  return fresh.find((r) => taken.has(key(placeOf(r))));
}

/** A new device on a machine that is already here must not take the tag of one of its live devices. */
async function tagClashes(q: DbOrTx, ctx: TeamContext, doc: ExportDocument, known: Record<Section, Map<string, string>>) {
  const fresh = doc.devices.filter((d) => !known.devices.has(d.id) && known.machines.has(d.machineId));
  if (!fresh.length) return;
  const targets = [...new Set(fresh.map((d) => known.machines.get(d.machineId)!))];
  const live = await q.select({ machineId: device.machineId, tag: device.tag }).from(device)
    .where(and(eq(device.teamId, ctx.team.id), inArray(device.machineId, targets), isNull(device.deletedAt)));
  const clash = firstClash(fresh, live.map((d) => [d.machineId, d.tag]), (d) => [known.machines.get(d.machineId)!, d.tag]);
  if (clash) throw new Conflict(`A device tagged ${clash.tag} is already on the machine imported before as ${clash.machineId}; change one of the tags first.`);
}

/** A new port on a device that is already here must not take the name of one of its live ports. */
async function portNameClashes(q: DbOrTx, ctx: TeamContext, doc: ExportDocument, known: Record<Section, Map<string, string>>) {
  const fresh = doc.ports.filter((p) => !known.ports.has(p.id) && known.devices.has(p.deviceId));
  if (!fresh.length) return;
  const targets = [...new Set(fresh.map((p) => known.devices.get(p.deviceId)!))];
  const live = await q.select({ deviceId: port.deviceId, name: port.name }).from(port)
    .where(and(eq(port.teamId, ctx.team.id), inArray(port.deviceId, targets), isNull(port.deletedAt)));
  const clash = firstClash(fresh, live.map((p) => [p.deviceId, p.name]), (p) => [known.devices.get(p.deviceId)!, p.name]);
  if (clash) throw new Conflict(`A port named ${clash.name} already exists on the device imported before as ${clash.deviceId}; rename one of them first.`);
}
