/** A proposal from the field log as the islands show it: the record's value beside the value found on site. */
import { portPartLabel, portPartValue } from '../vault/port-parts';

export type ProposalStatus = 'pending' | 'accepted' | 'declined';

/** The JSON of a proposal (src/lib/server/field/proposals.ts, `ProposalView`). */
export interface Proposal {
  id: string;
  entryId: string;
  deviceId: string;
  deviceTag: string;
  kind: 'replacement' | 'found-different';
  status: ProposalStatus;
  found: { serialNumber: string; firmware: string; port: { id: string | null; name: string; settings: Record<string, unknown> } | null };
  atEntry: { serialNumber: string; firmware: string; version: number; portSettings: Record<string, unknown> | null };
  record: { serialNumber: string; firmware: string; version: number; port: { id: string; name: string; version: number; settings: Record<string, unknown> } | null };
  entry: { note: string; foundSettings: string; appliedVersion: number | null; userName: string; createdAt: string };
  decision: { note: string; by: string; at: string; version: number | null; portVersion: number | null } | null;
}

export interface ProposalRow { what: string; record: string; found: string; differs: boolean }

function show(path: string[], v: unknown): string {
  if (v === undefined) return '—';
  if (v === null) return 'none';
  if (typeof v === 'boolean') return v ? 'On' : 'Off';
  return portPartValue(path, v) ?? String(v);
}

/**
 * The rows to compare: serial number and firmware when reported, then each port setting found. `against` picks the
 * record now (while pending) or the record when the entry was written (once decided).
 */
export function proposalRows(p: Proposal, against: 'now' | 'at-entry' = 'now'): ProposalRow[] {
  const rec = against === 'now'
    ? { serialNumber: p.record.serialNumber, firmware: p.record.firmware, port: p.record.port?.settings ?? null }
    : { serialNumber: p.atEntry.serialNumber, firmware: p.atEntry.firmware, port: p.atEntry.portSettings };
  const rows: ProposalRow[] = [];
  if (p.found.serialNumber) rows.push({ what: 'Serial number', record: rec.serialNumber || '—', found: p.found.serialNumber, differs: rec.serialNumber !== p.found.serialNumber });
  if (p.found.firmware) rows.push({ what: 'Firmware', record: rec.firmware || '—', found: p.found.firmware, differs: rec.firmware !== p.found.firmware });
  for (const [key, value] of Object.entries(p.found.port?.settings ?? {})) {
    const path = ['settings', key];
    const before = rec.port?.[key];
    rows.push({ what: `${p.found.port!.name}: ${portPartLabel(path)}`, record: show(path, before), found: show(path, value), differs: before !== value });
  }
  return rows;
}

/** A time the same on the server and in the browser (no locale or zone of either), as the log page's timeline writes it. */
export const when = (iso: string) => `${new Date(iso).toISOString().slice(0, 16).replace('T', ' ')} UTC`;
