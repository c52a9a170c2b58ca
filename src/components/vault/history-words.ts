/**
 * A revision in words for the history list: each changed field by the label its form gives it, each value as
 * the form shows it (port settings through the port-text labels), a link's members by their ends' names
 * (device tag and port name) rather than port ids, and the "Changed …" summary rebuilt from those labels.
 */
import { DEVICE_ROLE_LABELS } from '../../lib/schemas/vault';
import { showValue } from '../../lib/client/conflict';
import { deviceFieldDefs, kindOptions, linkFieldDefs, machineFieldDefs, profileFieldDefs, siteFieldDefs } from './field-defs';
import { portPartLabel, portPartValue } from './port-parts';

/** Names of records a revision points at by id (ports as "DRV-203 RS-485", machines, profiles), where known. */
export type Names = Readonly<Record<string, string>>;

const byName = (defs: readonly { name: string; label: string }[]) => Object.fromEntries(defs.map((d) => [d.name, d.label]));
/** The forms' labels, without the hints in brackets ("Notes (access, contacts, permits)" reads "Notes"). */
const plain = (labels: Record<string, string>) => Object.fromEntries(Object.entries(labels).map(([k, v]) => [k, v.replace(/\s*\(.*\)$/, '')]));

const FIELD_LABELS: Record<string, Record<string, string>> = {
  site: plain(byName(siteFieldDefs)),
  machine: { ...plain(byName(machineFieldDefs)), plcStringCapacity: 'PLC STRING length (characters)', siteId: 'Site' },
  device: { ...plain(byName(deviceFieldDefs)), machineId: 'Machine', profileId: 'Profile', bridges: 'Bridged ports' },
  link: { ...plain(byName(linkFieldDefs)), cableLengthM: 'Cable length (m)', members: 'Members' },
  profile: { ...plain(byName(profileFieldDefs)), ports: 'Default ports' },
};

/** The label of a changed field (`serialNumber` → "Serial number", port `settings.parity` → "Parity"). */
export function historyFieldLabel(type: string, field: string): string {
  if (type === 'port') return portPartLabel(field.split('.'));
  return FIELD_LABELS[type]?.[field] ?? field;
}

interface MemberValue { portId: string; role?: string; isEnd?: boolean | null; unitLoads?: number | null }

function memberWords(m: MemberValue, names: Names): string {
  const end = m.isEnd === true ? ', cable end' : '';
  const loads = m.unitLoads != null ? `, ${m.unitLoads} unit loads` : '';
  return `${names[m.portId] ?? 'a port no longer on this machine'} (${m.role ?? 'member'}${end}${loads})`;
}

/** A value of a changed field in words. */
export function historyValue(type: string, field: string, value: unknown, names: Names = {}): string {
  if (type === 'port') return portPartValue(field.split('.'), value) ?? showValue(value);
  if (field === 'role' && typeof value === 'string' && value in DEVICE_ROLE_LABELS) return DEVICE_ROLE_LABELS[value as keyof typeof DEVICE_ROLE_LABELS];
  if (type === 'link' && field === 'kind') return kindOptions.find((k) => k.value === value)?.label ?? showValue(value);
  if (type === 'link' && field === 'members' && Array.isArray(value)) {
    return value.length === 0 ? 'none' : (value as MemberValue[]).map((m) => memberWords(m, names)).join('; ');
  }
  if (type === 'device' && field === 'bridges' && Array.isArray(value)) {
    const port = (id: unknown) => (typeof id === 'string' && names[id]) || 'a port no longer on this device';
    return value.length === 0 ? 'none' : (value as unknown[][]).map((pair) => `${port(pair[0])} ⇄ ${port(pair[1])}`).join('; ');
  }
  if (type === 'profile' && field === 'ports' && Array.isArray(value)) {
    return value.length === 0 ? 'none' : (value as { name?: string }[]).map((p) => p.name ?? 'unnamed port').join(', ');
  }
  if (field.endsWith('Id') && typeof value === 'string') return names[value] ?? value;
  return showValue(value);
}

/** The engine's "Changed a, b" summary (src/lib/server/records/engine.ts `summarize`), for recognising it. */
function engineSummary(fields: readonly string[]): string {
  return fields.length <= 4 ? `Changed ${fields.join(', ')}` : `Changed ${fields.slice(0, 3).join(', ')} and ${fields.length - 3} more`;
}

/**
 * The summary in words: the engine's "Changed serialNumber, firmware" becomes "Changed Serial number, Firmware"
 * (anything it appended, such as a note, is kept); other summaries are already in words and stay as written.
 */
export function historySummary(type: string, summary: string, changes: readonly { field: string }[]): string {
  const fields = changes.map((c) => c.field);
  const raw = engineSummary(fields);
  if (fields.length === 0 || !summary.startsWith(raw)) return summary;
  return engineSummary(fields.map((f) => historyFieldLabel(type, f))) + summary.slice(raw.length);
}
