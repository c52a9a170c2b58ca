/**
 * CSV import of devices and ports: the fields a column can map to, and one row turned into a device and a port.
 * Also the formula guard that the CSV export puts on text cells and the import takes off again.
 */
import { portSettingsInputSchema, DEVICE_ROLES } from '../schemas/vault';

/**
 * A text cell a spreadsheet would run as a formula: it starts with `=`, `+`, `-`, `@`, tab or carriage
 * return (OWASP "CSV Injection"), possibly after apostrophes of a guard already there.
 */
const FORMULA_START = /^'*[=+\-@\t\r]/;

/**
 * One exported cell: numbers as they are (they stay numbers in a spreadsheet), text that starts a formula
 * with a leading apostrophe, which spreadsheets show as text and `unguardCell` removes on import.
 */
export function guardCell(v: unknown): string {
  if (typeof v === 'number' || typeof v === 'bigint') return String(v);
  const s = v === null || v === undefined ? '' : v instanceof Date ? v.toISOString() : String(v);
  return FORMULA_START.test(s) ? `'${s}` : s;
}

/** Takes `guardCell`'s apostrophe off again, and only that: `'hello` stays as it is. */
export function unguardCell(s: string): string {
  return s.startsWith("'") && FORMULA_START.test(s) ? s.slice(1) : s;
}

export const CSV_FIELDS = [
  { key: 'tag', label: 'Device tag', required: true, hints: ['tag', 'device tag', 'device'] },
  { key: 'name', label: 'Device name', hints: ['name', 'device name', 'description'] },
  { key: 'role', label: 'Role', hints: ['role', 'type'] },
  { key: 'maker', label: 'Maker', hints: ['maker', 'manufacturer', 'make'] },
  { key: 'model', label: 'Model', hints: ['model'] },
  { key: 'serialNumber', label: 'Serial number', hints: ['serial', 'serial number', 'serialnumber', 's/n'] },
  { key: 'firmware', label: 'Firmware', hints: ['firmware', 'fw'] },
  { key: 'location', label: 'Location', hints: ['location', 'cabinet'] },
  { key: 'portName', label: 'Port name', hints: ['port', 'port name'] },
  { key: 'shorthand', label: 'Settings shorthand (9600 8-N-1)', hints: ['settings', 'shorthand', 'framing'] },
  { key: 'interface', label: 'Interface', hints: ['interface', 'physical'] },
  { key: 'baud', label: 'Baud', hints: ['baud', 'baud rate', 'bitrate'] },
  { key: 'dataBits', label: 'Data bits', hints: ['data bits', 'databits'] },
  { key: 'parity', label: 'Parity', hints: ['parity'] },
  { key: 'stopBits', label: 'Stop bits', hints: ['stop bits', 'stopbits'] },
  { key: 'handshake', label: 'Handshake', hints: ['handshake', 'flow control'] },
  { key: 'rtsMode', label: 'RTS', hints: ['rtsmode', 'rts mode', 'rts'] },
  { key: 'ctsMode', label: 'CTS', hints: ['ctsmode', 'cts mode', 'cts'] },
  { key: 'dtrMode', label: 'DTR', hints: ['dtrmode', 'dtr mode', 'dtr'] },
  { key: 'rtsLeadMs', label: 'RTS lead (ms)', hints: ['rtsleadms', 'rts lead', 'rts lead ms'] },
  { key: 'rtsTailMs', label: 'RTS tail (ms)', hints: ['rtstailms', 'rts tail', 'rts tail ms'] },
  { key: 'echo', label: 'Hears own transmission (echo)', hints: ['echo'] },
  { key: 'nodeAddress', label: 'Node address', hints: ['address', 'node address', 'node', 'slave id', 'unit id'] },
  { key: 'termination', label: 'Termination', hints: ['termination', 'terminator'] },
  { key: 'protocol', label: 'Protocol', hints: ['protocol'] },
  { key: 'bridgedTo', label: 'Bridged to (a converter\'s other port)', hints: ['bridgedto', 'bridged to', 'bridge'] },
] as const;
export type CsvField = (typeof CSV_FIELDS)[number]['key'];
export type CsvMapping = Partial<Record<CsvField, string>>;

/** Column → field by header name, for a first guess the user can change. */
export function guessMapping(headers: string[]): CsvMapping {
  const norm = (s: string) => s.trim().toLowerCase().replace(/[_-]+/g, ' ');
  const out: CsvMapping = {};
  for (const f of CSV_FIELDS) {
    const hit = headers.find((h) => (f.hints as readonly string[]).includes(norm(h)));
    if (hit) out[f.key] = hit;
  }
  return out;
}

const PARITY: Record<string, string> = { n: 'none', none: 'none', e: 'even', even: 'even', o: 'odd', odd: 'odd', m: 'mark', mark: 'mark', s: 'space', space: 'space' };
const IFACE: Record<string, string> = { rs232: 'rs232', rs422: 'rs422', rs485: 'rs485-2w', rs4852w: 'rs485-2w', rs4852wire: 'rs485-2w', rs4854w: 'rs485-4w', rs4854wire: 'rs485-4w', ttl: 'ttl', usb: 'usb-vcp', usbvcp: 'usb-vcp', usbcom: 'usb-vcp', tcp: 'tcp' };
const HANDSHAKE: Record<string, string> = { none: 'none', rtscts: 'rts-cts', hardware: 'rts-cts', xonxoff: 'xon-xoff', software: 'xon-xoff', dtrdsr: 'dtr-dsr' };
// The stored values, and the words the settings text writes them in (port-text.ts), squashed.
const RTS_MODE: Record<string, string> = { off: 'off', on: 'on', transmit: 'transmit', flow: 'flow', alwaysoff: 'off', alwayson: 'on', onwhilesending: 'transmit', flowcontrol: 'flow' };
const CTS_MODE: Record<string, string> = { ignore: 'ignore', gate: 'gate', notchecked: 'ignore' };
const DTR_MODE: Record<string, string> = { off: 'off', on: 'on', flow: 'flow', alwaysoff: 'off', alwayson: 'on', flowcontrol: 'flow' };
const PROTOCOL: Record<string, string> = { ascii: 'ascii', modbusrtu: 'modbus-rtu', rtu: 'modbus-rtu', modbusascii: 'modbus-ascii', other: 'other' };
const BOOL: Record<string, boolean> = { yes: true, y: true, on: true, true: true, '1': true, no: false, n: false, off: false, false: false, '0': false };
const squash = (s: string) => s.toLowerCase().replace(/[\s_/.-]+/g, '');

export interface CsvRowResult {
  device: { tag: string; name: string; role: (typeof DEVICE_ROLES)[number]; maker: string; model: string; serialNumber: string; firmware: string; location: string };
  /** `bridgedTo`: the name of the device's port on the other side of the converter, or ''. */
  port: { name: string; settings: ReturnType<typeof portSettingsInputSchema.parse>; bridgedTo: string } | null;
}
export type CsvRowError = { column: string; message: string };

type PortSettingsRead = NonNullable<CsvRowResult['port']>['settings'];
/** A settings check's outcome: the settings as the schema gives them back (frozen: rows share them), or its issues. */
type SettingsCheck = { ok: true; settings: PortSettingsRead } | { ok: false; issues: { field: CsvField | '_'; message: string }[] };
/**
 * Settings already checked while reading one file, by the settings' text. The rows of a file often share their
 * settings, and the schema's check is most of the cost of a row; the outcome depends on the settings alone.
 */
export type SettingsChecks = Map<string, SettingsCheck>;

function deepFreeze<T>(v: T): T {
  if (v && typeof v === 'object' && !Object.isFrozen(v)) {
    Object.freeze(v);
    for (const x of Object.values(v)) deepFreeze(x);
  }
  return v;
}

function checkSettings(settings: Record<string, unknown>): SettingsCheck {
  const parsed = portSettingsInputSchema.safeParse(settings);
  return parsed.success
    ? { ok: true, settings: parsed.data }
    : { ok: false, issues: parsed.error.issues.map((i) => ({ field: (i.path[0] as CsvField) ?? '_', message: i.message })) };
}

/**
 * One CSV row (header → cell) read through the mapping; errors name the CSV column at fault. `checks`, when given,
 * keeps each distinct settings check for the next rows (their settings objects are then shared and frozen).
 */
export function readCsvRow(row: Record<string, string | undefined>, mapping: CsvMapping, checks?: SettingsChecks): { ok: true; value: CsvRowResult } | { ok: false; errors: CsvRowError[] } {
  const errors: CsvRowError[] = [];
  const cell = (k: CsvField) => (mapping[k] ? unguardCell(row[mapping[k]!] ?? '').trim() : '');
  const fail = (k: CsvField | '_', message: string) => errors.push({ column: k === '_' ? '' : (mapping[k as CsvField] ?? k), message });
  const tag = cell('tag');
  if (!tag) fail('tag', 'The device tag is empty.');
  else if (tag.length > 40) fail('tag', 'A tag has at most 40 characters.');
  const roleText = squash(cell('role'));
  const role = (roleText ? DEVICE_ROLES.find((r) => r === roleText) : 'other') ?? null;
  if (!role) fail('role', `Unknown role "${cell('role')}"; use one of ${DEVICE_ROLES.join(', ')}.`);
  const settings: Record<string, unknown> = {};
  const short = cell('shorthand');
  if (short) {
    const m = /^(\d+)\s*[,;\s]\s*([5-8])\s*[-/ ]?\s*([NEOMS])\s*[-/ ]?\s*(1|1\.5|2)$/i.exec(short);
    if (!m) fail('shorthand', `"${short}" is not like 9600 8-N-1.`);
    else Object.assign(settings, { baud: Number(m[1]), dataBits: Number(m[2]), parity: PARITY[m[3]!.toLowerCase()], stopBits: Number(m[4]) });
  }
  const pick = (k: CsvField, table: Record<string, string | boolean>, key = k) => {
    const v = cell(k);
    if (!v) return;
    const hit = table[squash(v)];
    if (hit === undefined) fail(k, `"${v}" is not a known ${CSV_FIELDS.find((f) => f.key === k)!.label.toLowerCase()}.`);
    else settings[key] = hit;
  };
  const num = (k: CsvField) => {
    const v = cell(k);
    if (!v) return;
    const n = Number(v);
    if (!Number.isFinite(n)) fail(k, `"${v}" is not a number.`);
    else settings[k] = n;
  };
  pick('interface', IFACE); num('baud'); num('dataBits'); pick('parity', PARITY); num('stopBits'); pick('handshake', HANDSHAKE);
  pick('rtsMode', RTS_MODE); pick('ctsMode', CTS_MODE); pick('dtrMode', DTR_MODE); num('rtsLeadMs'); num('rtsTailMs'); pick('echo', BOOL);
  num('nodeAddress'); pick('termination', BOOL); pick('protocol', PROTOCOL);
  const portName = cell('portName') || (Object.keys(settings).length ? 'Port 1' : '');
  let port: CsvRowResult['port'] = null;
  if (portName && !errors.length) {
    const key = checks && JSON.stringify(settings);
    let checked = key === undefined ? undefined : checks!.get(key);
    if (!checked) {
      checked = checkSettings(settings);
      if (key !== undefined) checks!.set(key, deepFreeze(checked));
    }
    if (!checked.ok) for (const i of checked.issues) fail(i.field, i.message);
    else port = { name: portName.slice(0, 60), settings: checked.settings, bridgedTo: cell('bridgedTo').slice(0, 60) };
  }
  const text = (k: CsvField, max: number) => {
    const v = cell(k);
    if (v.length > max) fail(k, `At most ${max} characters.`);
    return v;
  };
  if (cell('bridgedTo') && role !== 'converter') fail('bridgedTo', `Only a converter bridges its ports; set the role to converter or leave "${CSV_FIELDS.find((f) => f.key === 'bridgedTo')!.label}" empty.`);
  const device = { tag, name: text('name', 120), role: role ?? 'other', maker: text('maker', 120), model: text('model', 120), serialNumber: text('serialNumber', 120), firmware: text('firmware', 60), location: text('location', 200) };
  return errors.length ? { ok: false, errors } : { ok: true, value: { device, port } };
}
