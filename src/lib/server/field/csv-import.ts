/** CSV import of devices and ports into one machine: a preview with per-row errors, then a staged job applied in one transaction. */
import { and, eq, isNull } from 'drizzle-orm';
import { db, type DbOrTx } from '../../../db/client';
import { device, port, revision } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { newId } from '../ids';
import { nameKey } from '../../schemas/vault';
import type { CsvMapping, CsvRowError, CsvRowResult } from '../../field/csv';
import type { CsvImportRequest } from '../../schemas/field';
import { liveMachine } from './scope';
import { creationRevisions } from './import-write';
import { checkFile, keepChecked, takeChecked, type CheckedFile } from './csv-file-check';
import { inSlices } from '../jobs/turns';
import { runStagedJob, type Progress } from '../jobs/jobs';
import { Conflict, Invalid } from '../errors';

const ERRORS_SHOWN = 200;

export interface CsvPreview {
  applied: boolean;
  rows: number;
  devices: number;
  ports: number;
  errorCount: number;
  /** Row numbers count the header as row 1, as a spreadsheet shows them. */
  errors: (CsvRowError & { row: number })[];
  sample: { tag: string; name: string; ports: string[] }[];
}

interface Planned { device: CsvRowResult['device']; ports: (NonNullable<CsvRowResult['port']> & { row: number })[] }

/** Rows gone through between turns for other requests. */
const CHECK_SLICE = 1000;

/**
 * The import worked out against the vault as it is now: the machine, the tags already on it, and the file's rows
 * (read here, or taken from `file` when a preview of the same body read them).
 */
async function plan(q: DbOrTx, ctx: TeamContext, req: CsvImportRequest, progress?: Progress, file?: CheckedFile) {
  const m = await liveMachine(ctx, req.machineId, q);
  const checked = file ?? await checkFile(req, progress);
  const mapping = req.mapping as CsvMapping;
  const existing = await existingTags(q, ctx, m.id);
  const errors: CsvPreview['errors'] = [];
  const devices = new Map<string, Planned>();
  for (const e of checked.parseErrors) if (e.row !== undefined) errors.push({ row: e.row + 2, column: '', message: e.message });
  await inSlices(checked.rows, CHECK_SLICE, (r, i) => {
    const row = i + 2;
    if (!r.ok) return errors.push(...r.errors.map((e) => ({ ...e, row })));
    const key = nameKey(r.value.device.tag);
    if (existing.has(key)) return errors.push({ row, column: mapping.tag!, message: `Device ${r.value.device.tag} is already on ${m.name}; this import adds new devices only.` });
    const d = devices.get(key) ?? { device: r.value.device, ports: [] };
    if (r.value.port) {
      if (d.ports.some((p) => nameKey(p.name) === nameKey(r.value.port!.name))) {
        return errors.push({ row, column: mapping.portName ?? '', message: `Device ${d.device.tag} already has a port named ${r.value.port.name} in this file.` });
      }
      if (d.ports.length >= 16) return errors.push({ row, column: mapping.portName ?? '', message: 'At most 16 ports per device.' });
      d.ports.push({ ...r.value.port, row });
    }
    devices.set(key, d);
  });
  for (const d of devices.values()) for (const [row, message] of bridgeProblems(d)) errors.push({ row, column: mapping.bridgedTo ?? '', message });
  return { machine: m, rows: checked.rows.length, devices: [...devices.values()], errors, file: checked };
}

/** A converter's "Bridged to" cells: each names another of its ports in the file, and no port is in two bridges. */
function bridgeProblems(d: Planned): [row: number, message: string][] {
  const out: [number, string][] = [];
  const partner = new Map<string, string>();
  for (const p of d.ports) {
    if (!p.bridgedTo) continue;
    const other = d.ports.find((x) => nameKey(x.name) === nameKey(p.bridgedTo));
    if (!other || other === p) {
      out.push([p.row, `Device ${d.device.tag}: port ${p.name} is bridged to "${p.bridgedTo}", which is not another of its ports in this file.`]);
      continue;
    }
    for (const [a, b] of [[p.name, other.name], [other.name, p.name]] as const) {
      const was = partner.get(nameKey(a));
      if (was !== undefined && was !== nameKey(b)) out.push([p.row, `Device ${d.device.tag}: port ${a} is in two bridges; a port is bridged to one other port only.`]);
      partner.set(nameKey(a), nameKey(b));
    }
  }
  return out;
}

/** The bridges of a planned device, as pairs of its new port ids (each pair once). */
function bridgesOf(d: Planned, ids: string[]): [string, string][] {
  const out: [string, string][] = [];
  d.ports.forEach((p, i) => {
    const j = p.bridgedTo ? d.ports.findIndex((x) => nameKey(x.name) === nameKey(p.bridgedTo)) : -1;
    if (j < 0 || j === i) return;
    const pair: [string, string] = i < j ? [ids[i]!, ids[j]!] : [ids[j]!, ids[i]!];
    if (!out.some((x) => x[0] === pair[0] && x[1] === pair[1])) out.push(pair);
  });
  return out;
}

/** Lower-cased tags of the machine's live devices. */
async function existingTags(q: DbOrTx, ctx: TeamContext, machineId: string): Promise<Set<string>> {
  const rows = await q.select({ tag: device.tag }).from(device).where(and(eq(device.machineId, machineId), eq(device.teamId, ctx.team.id), isNull(device.deletedAt)));
  return new Set(rows.map((d) => nameKey(d.tag)));
}

function preview(p: Awaited<ReturnType<typeof plan>>, applied: boolean): CsvPreview {
  return {
    applied, rows: p.rows, devices: p.devices.length, ports: p.devices.reduce((n, d) => n + d.ports.length, 0),
    errorCount: p.errors.length, errors: p.errors.slice(0, ERRORS_SHOWN),
    sample: p.devices.slice(0, 20).map((d) => ({ tag: d.device.tag, name: d.device.name, ports: d.ports.map((x) => x.name) })),
  };
}

/** The preview; its reading of the file is kept for an apply of the same body (`checkFile`). */
export async function previewCsvImport(ctx: TeamContext, req: CsvImportRequest): Promise<CsvPreview> {
  const p = await plan(db, ctx, req);
  keepChecked(ctx.team.id, ctx.user.id, req, p.file);
  return preview(p, false);
}

/** Devices staged per write (one transaction on the background writer: its commit writes each changed page once). */
const STAGE_DEVICES = 500;
/** Devices whose rows are built in one stretch of this thread, between which other requests get their turn. */
const BUILD_DEVICES = 100;

/**
 * Writes every valid device and port (and their creation revisions); with errors, only when skipInvalid.
 * Checked and staged in short batches, then applied in one short transaction: all rows or none.
 */
export async function applyCsvImport(ctx: TeamContext, req: CsvImportRequest): Promise<CsvPreview> {
  let p: Awaited<ReturnType<typeof plan>>;
  return runStagedJob(ctx, 'csv-import', {
    async stage(stage, progress) {
      p = await plan(db, ctx, req, progress, takeChecked(ctx.team.id, ctx.user.id, req));
      if (p.errors.length && !req.skipInvalid) throw new Invalid(`${p.errors.length} rows have errors; fix them or choose to leave them out.`, { preview: preview(p, false) });
      const stamp = { teamId: ctx.team.id, updatedBy: ctx.user.id };
      const summary = 'Imported from CSV';
      stage.target(device);
      stage.target(port);
      stage.target(revision);
      for (let lo = 0; lo < p.devices.length; lo += STAGE_DEVICES) {
        const slice = p.devices.slice(lo, lo + STAGE_DEVICES);
        const devices: ({ id: string } & Record<string, unknown>)[] = [];
        const ports: ({ id: string } & Record<string, unknown>)[] = [];
        await inSlices(slice, BUILD_DEVICES, (d) => {
          const portIds = d.ports.map(() => newId('port'));
          const row = { ...d.device, ...stamp, id: newId('dev'), machineId: p.machine.id, profileId: null, notes: '', bridges: bridgesOf(d, portIds) };
          devices.push(row);
          d.ports.forEach((x, position) => ports.push({ ...stamp, id: portIds[position]!, deviceId: row.id, name: x.name, position, settings: x.settings, wiring: [], notes: '' }));
        });
        stage.report(p.rows + Math.round((p.rows * (lo + slice.length)) / p.devices.length), p.rows * 2);
        await stage.addTogether([[device, devices], [port, ports], [revision, [...creationRevisions(ctx, 'device', devices, summary), ...creationRevisions(ctx, 'port', ports, summary)]]]);
      }
    },
    async verify(tx) {
      // What could have changed while the rows were staged: the machine, and devices added to it since.
      await liveMachine(ctx, req.machineId, tx);
      const taken = await existingTags(tx, ctx, p.machine.id);
      const clash = p.devices.find((d) => taken.has(nameKey(d.device.tag)));
      if (clash) throw new Conflict(`Device ${clash.device.tag} was added to ${p.machine.name} while the file was imported; nothing was imported. Check the file again.`);
    },
    result: () => preview(p, true),
  });
}
