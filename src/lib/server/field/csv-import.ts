/** CSV import of devices and ports into one machine: a preview with per-row errors, then one transaction. */
import Papa from 'papaparse';
import { and, eq, isNull } from 'drizzle-orm';
import { db, type DbOrTx } from '../../../db/client';
import { device, port, revision } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { HttpError } from '../http';
import { newId } from '../ids';
import { nameKey } from '../../schemas/vault';
import { CSV_FIELDS, readCsvRow, type CsvMapping, type CsvRowError, type CsvRowResult } from '../../field/csv';
import type { CsvImportRequest } from '../../schemas/field';
import { liveMachine } from './scope';
import { creationRevisions, insertBatched } from './import-write';

export const CSV_MAX_ROWS = 50_000;
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

interface Planned { device: CsvRowResult['device']; ports: NonNullable<CsvRowResult['port']>[] }

async function plan(q: DbOrTx, ctx: TeamContext, req: CsvImportRequest) {
  const m = await liveMachine(ctx, req.machineId, q);
  const parsed = Papa.parse<Record<string, string>>(req.csv, { header: true, skipEmptyLines: 'greedy' });
  const headers = parsed.meta.fields ?? [];
  const mapping = req.mapping as CsvMapping;
  const known = new Set<string>(CSV_FIELDS.map((f) => f.key));
  for (const [field, column] of Object.entries(mapping)) {
    if (!known.has(field)) throw new HttpError(422, `mapping.${field}: unknown field`, { fields: { [`mapping.${field}`]: 'Not a field of the import.' } });
    if (!headers.includes(column)) throw new HttpError(422, `mapping.${field}: the file has no column "${column}"`, { fields: { [`mapping.${field}`]: `No column "${column}" in the file.` } });
  }
  if (!mapping.tag) throw new HttpError(422, 'mapping.tag: choose the column with the device tag', { fields: { 'mapping.tag': 'Choose the column with the device tag.' } });
  if (parsed.data.length > CSV_MAX_ROWS) throw new HttpError(413, `At most ${CSV_MAX_ROWS} rows per file; split the file.`);
  const existing = new Set((await q.select({ tag: device.tag }).from(device).where(and(eq(device.machineId, m.id), eq(device.teamId, ctx.team.id), isNull(device.deletedAt)))).map((d) => nameKey(d.tag)));
  const errors: CsvPreview['errors'] = [];
  const devices = new Map<string, Planned>();
  for (const e of parsed.errors) if (e.row !== undefined) errors.push({ row: e.row + 2, column: '', message: e.message });
  parsed.data.forEach((raw, i) => {
    const row = i + 2;
    const r = readCsvRow(raw, mapping);
    if (!r.ok) return errors.push(...r.errors.map((e) => ({ ...e, row })));
    const key = nameKey(r.value.device.tag);
    if (existing.has(key)) return errors.push({ row, column: mapping.tag!, message: `Device ${r.value.device.tag} is already on ${m.name}; this import adds new devices only.` });
    const d = devices.get(key) ?? { device: r.value.device, ports: [] };
    if (r.value.port) {
      if (d.ports.some((p) => nameKey(p.name) === nameKey(r.value.port!.name))) {
        return errors.push({ row, column: mapping.portName ?? '', message: `Device ${d.device.tag} already has a port named ${r.value.port.name} in this file.` });
      }
      if (d.ports.length >= 16) return errors.push({ row, column: mapping.portName ?? '', message: 'At most 16 ports per device.' });
      d.ports.push(r.value.port);
    }
    devices.set(key, d);
  });
  return { machine: m, rows: parsed.data.length, devices: [...devices.values()], errors };
}

function preview(p: Awaited<ReturnType<typeof plan>>, applied: boolean): CsvPreview {
  return {
    applied, rows: p.rows, devices: p.devices.length, ports: p.devices.reduce((n, d) => n + d.ports.length, 0),
    errorCount: p.errors.length, errors: p.errors.slice(0, ERRORS_SHOWN),
    sample: p.devices.slice(0, 20).map((d) => ({ tag: d.device.tag, name: d.device.name, ports: d.ports.map((x) => x.name) })),
  };
}

export async function previewCsvImport(ctx: TeamContext, req: CsvImportRequest): Promise<CsvPreview> {
  return preview(await plan(db, ctx, req), false);
}

/** Writes every valid device and port (and their creation revisions) in one transaction; with errors, only when skipInvalid. */
export async function applyCsvImport(ctx: TeamContext, req: CsvImportRequest): Promise<CsvPreview> {
  return db.transaction(async (tx) => {
    const p = await plan(tx, ctx, req);
    if (p.errors.length && !req.skipInvalid) throw new HttpError(422, `${p.errors.length} rows have errors; fix them or choose to leave them out.`, { preview: preview(p, false) });
    const stamp = { teamId: ctx.team.id, updatedBy: ctx.user.id };
    const devices = p.devices.map((d) => ({ ...d.device, ...stamp, id: newId('dev'), machineId: p.machine.id, profileId: null, notes: '' }));
    const ports = p.devices.flatMap((d, i) => d.ports.map((x, position) => ({ ...stamp, id: newId('port'), deviceId: devices[i]!.id, name: x.name, position, settings: x.settings, wiring: [], notes: '' })));
    await insertBatched(tx, device, devices);
    await insertBatched(tx, port, ports);
    const summary = 'Imported from CSV';
    await insertBatched(tx, revision, [...creationRevisions(ctx, 'device', devices, summary), ...creationRevisions(ctx, 'port', ports, summary)]);
    return preview(p, true);
  });
}
