/**
 * Migration 0017 (docs/decisions/013): every stored copy of a port's settings written before the control lines
 * existed — ports, device profiles' ports and the revision snapshots of both — gets rtsMode, ctsMode, dtrMode,
 * rtsLeadMs, rtsTailMs and echo derived from handshake and rs485Direction. Runs the real migrations on a file
 * database: up to 0016, old-shape rows written by hand, then the rest. Every expected value is written out by hand.
 */
import { copyFileSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createClient, type Client } from '@libsql/client';
import { drizzle } from 'drizzle-orm/libsql';
import { migrate } from 'drizzle-orm/libsql/migrator';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { controlLineDisagreements, portSettingsSchema } from '../../src/lib/frame';

const LAST_BEFORE = 16;
let dir: string;
let client: Client;

/** The settings as stored before 0017: every older key, none of the new ones. */
const old = (over: Record<string, unknown>) => ({
  interface: 'rs232', baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, handshake: 'none', rs485Direction: 'none', nodeAddress: null,
  termination: false, bias: false, responseTimeoutMs: 1000, interCharTimeoutMs: 0, turnaroundDelayMs: 0, retries: 0, protocol: 'ascii',
  frameRules: { byteSet: '8-bit', letterCase: 'any', addressField: 'address' }, ...over,
});
const lines = (rtsMode: string, ctsMode: string, dtrMode: string) => ({ rtsMode, ctsMode, dtrMode, rtsLeadMs: 0, rtsTailMs: 0, echo: false });

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'baudbook-control-lines-'));
  const before = join(dir, 'drizzle-before');
  mkdirSync(join(before, 'meta'), { recursive: true });
  const journal = JSON.parse(readFileSync('drizzle/meta/_journal.json', 'utf8'));
  journal.entries = journal.entries.filter((e: { idx: number }) => e.idx <= LAST_BEFORE);
  writeFileSync(join(before, 'meta/_journal.json'), JSON.stringify(journal));
  for (const f of readdirSync('drizzle')) if (/^\d{4}_.*\.sql$/.test(f) && Number(f.slice(0, 4)) <= LAST_BEFORE) copyFileSync(join('drizzle', f), join(before, f));
  client = createClient({ url: `file:${join(dir, 'old.db')}` });
  await migrate(drizzle(client), { migrationsFolder: before });

  const now = Date.now();
  const port = (id: string, position: number, settings: object) => ({
    sql: `INSERT INTO port (id, team_id, device_id, name, position, settings, wiring, notes, version, created_at, updated_at) VALUES (?, 't1', 'd1', ?, ?, ?, '[]', '', 1, ?, ?)`,
    args: [id, id.toUpperCase(), position, JSON.stringify(settings), now, now],
  });
  const revision = (id: string, type: string, entityId: string, snapshot: object) => ({
    sql: `INSERT INTO revision (id, team_id, entity_type, entity_id, version, action, changes, snapshot, created_at) VALUES (?, 't1', ?, ?, 1, 'create', '[]', ?, ?)`,
    args: [id, type, entityId, JSON.stringify(snapshot), now],
  });
  const profilePorts = [
    { name: 'COM1', settings: old({ handshake: 'dtr-dsr' }), wiring: [], notes: '' },
    { name: 'Bus', settings: old({ interface: 'rs485-2w', rs485Direction: 'rts' }), wiring: [], notes: '' },
    { name: 'Plain', settings: old({}), wiring: [], notes: '' },
  ];
  await client.batch([
    { sql: `INSERT INTO team (id, name, created_at) VALUES ('t1', 'Old team', ?)`, args: [now] },
    { sql: `INSERT INTO site (id, team_id, name, created_at, updated_at) VALUES ('s1', 't1', 'Old site', ?, ?)`, args: [now, now] },
    { sql: `INSERT INTO machine (id, team_id, site_id, name, created_at, updated_at) VALUES ('m1', 't1', 's1', 'Old line', ?, ?)`, args: [now, now] },
    { sql: `INSERT INTO device (id, team_id, machine_id, tag, created_at, updated_at) VALUES ('d1', 't1', 'm1', 'OLD-1', ?, ?)`, args: [now, now] },
    port('p_none', 0, old({})),
    port('p_rtscts', 1, old({ handshake: 'rts-cts' })),
    port('p_dtrdsr', 2, old({ handshake: 'dtr-dsr' })),
    port('p_xon', 3, old({ handshake: 'xon-xoff' })),
    port('p_dir_rts', 4, old({ interface: 'rs485-2w', rs485Direction: 'rts' })),
    port('p_dir_auto', 5, old({ interface: 'rs485-2w', rs485Direction: 'auto' })),
    // RTS cannot do both: an RS-485 port keeps its direction control, an RS-232 port its flow control.
    port('p_both_485', 6, old({ interface: 'rs485-2w', handshake: 'rts-cts', rs485Direction: 'rts' })),
    port('p_both_232', 7, old({ interface: 'rs232', handshake: 'rts-cts', rs485Direction: 'rts' })),
    // Already carrying the new keys (written by a newer server): left alone.
    port('p_new', 8, { ...old({}), ...lines('on', 'gate', 'on'), rtsTailMs: 3 }),
    {
      sql: `INSERT INTO device_profile (id, team_id, name, ports, version, created_at, updated_at) VALUES ('f1', 't1', 'Old profile', ?, 1, ?, ?)`,
      args: [JSON.stringify(profilePorts), now, now],
    },
    revision('r_port', 'port', 'p_rtscts', { name: 'P_RTSCTS', position: 1, settings: old({ handshake: 'rts-cts' }), wiring: [], notes: '' }),
    revision('r_profile', 'profile', 'f1', { name: 'Old profile', role: 'other', maker: '', model: '', notes: '', ports: profilePorts }),
    revision('r_device', 'device', 'd1', { tag: 'OLD-1' }),
  ], 'write');
  await migrate(drizzle(client), { migrationsFolder: 'drizzle' });
}, 60_000);

afterAll(() => {
  client?.close();
  rmSync(dir, { recursive: true, force: true });
});

const json = async (q: string, args: string[] = []) => JSON.parse(String((await client.execute({ sql: q, args })).rows[0]![0]));
const portSettings = (id: string) => json('SELECT settings FROM port WHERE id = ?', [id]);

it('ports: the control lines derived from handshake and RS-485 direction', async () => {
  expect(await portSettings('p_none')).toEqual({ ...old({}), ...lines('off', 'ignore', 'off') });
  expect(await portSettings('p_rtscts')).toEqual({ ...old({ handshake: 'rts-cts' }), ...lines('flow', 'gate', 'off') });
  expect(await portSettings('p_dtrdsr')).toEqual({ ...old({ handshake: 'dtr-dsr' }), ...lines('off', 'ignore', 'flow') });
  expect(await portSettings('p_xon')).toEqual({ ...old({ handshake: 'xon-xoff' }), ...lines('off', 'ignore', 'off') });
  expect(await portSettings('p_dir_rts')).toEqual({ ...old({ interface: 'rs485-2w', rs485Direction: 'rts' }), ...lines('transmit', 'ignore', 'off') });
  expect(await portSettings('p_dir_auto')).toEqual({ ...old({ interface: 'rs485-2w', rs485Direction: 'auto' }), ...lines('off', 'ignore', 'off') });
});

it('a port with both RTS uses keeps the one its interface needs, and the older keys follow', async () => {
  expect(await portSettings('p_both_485')).toEqual({ ...old({ interface: 'rs485-2w', handshake: 'none', rs485Direction: 'rts' }), ...lines('transmit', 'ignore', 'off') });
  expect(await portSettings('p_both_232')).toEqual({ ...old({ interface: 'rs232', handshake: 'rts-cts', rs485Direction: 'none' }), ...lines('flow', 'gate', 'off') });
});

it('settings that already have the control lines are left as they were', async () => {
  expect(await portSettings('p_new')).toEqual({ ...old({}), ...lines('on', 'gate', 'on'), rtsTailMs: 3 });
});

it('profiles\' ports and the revision snapshots of ports and profiles, each port in its place', async () => {
  const expected = [
    { name: 'COM1', settings: { ...old({ handshake: 'dtr-dsr' }), ...lines('off', 'ignore', 'flow') }, wiring: [], notes: '' },
    { name: 'Bus', settings: { ...old({ interface: 'rs485-2w', rs485Direction: 'rts' }), ...lines('transmit', 'ignore', 'off') }, wiring: [], notes: '' },
    { name: 'Plain', settings: { ...old({}), ...lines('off', 'ignore', 'off') }, wiring: [], notes: '' },
  ];
  expect(await json(`SELECT ports FROM device_profile WHERE id = 'f1'`)).toEqual(expected);
  expect((await json(`SELECT snapshot FROM revision WHERE id = 'r_profile'`)).ports).toEqual(expected);
  expect((await json(`SELECT snapshot FROM revision WHERE id = 'r_port'`)).settings).toEqual({ ...old({ handshake: 'rts-cts' }), ...lines('flow', 'gate', 'off') });
  expect(await json(`SELECT snapshot FROM revision WHERE id = 'r_device'`)).toEqual({ tag: 'OLD-1' });
});

it('every migrated copy reads back through the settings schema unchanged, with no disagreement', async () => {
  const rows = (await client.execute('SELECT settings FROM port')).rows.map((r) => JSON.parse(String(r.settings)));
  expect(rows).toHaveLength(9);
  for (const s of rows) {
    expect(controlLineDisagreements(s)).toEqual([]);
    expect(portSettingsSchema.parse(s)).toEqual(s);
  }
});
