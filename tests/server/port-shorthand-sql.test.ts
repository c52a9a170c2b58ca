/**
 * The device list writes each port's shorthand in SQL, from the same pieces as `portShorthand()`
 * (src/lib/frame/port-text.ts). Run here on an in-memory SQLite, without a server: the SQL must print what the
 * function prints, on every interface, parity and stop bits, and over TCP.
 */
import { createClient } from '@libsql/client';
import { SQLiteAsyncDialect } from 'drizzle-orm/sqlite-core';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { INTERFACES, PARITIES, portSettingsSchema, portShorthand, type PortSettingsInput } from '../../src/lib/frame';
import { PORT_SHORTHAND_SQL } from '../../src/lib/server/vault/device-list-sql';

const db = createClient({ url: ':memory:' });
beforeAll(() => db.execute('CREATE TABLE port (id INTEGER PRIMARY KEY, settings TEXT NOT NULL)'));
afterAll(() => db.close());

async function fromSql(settings: PortSettingsInput[]): Promise<string[]> {
  await db.execute('DELETE FROM port');
  const stored = settings.map((s) => JSON.stringify(portSettingsSchema.parse(s)));
  await db.batch(stored.map((json, i) => ({ sql: 'INSERT INTO port (id, settings) VALUES (?, ?)', args: [i, json] })));
  const q = new SQLiteAsyncDialect().sqlToQuery(sql`SELECT ${PORT_SHORTHAND_SQL} AS shorthand FROM port ORDER BY id`);
  const rs = await db.execute({ sql: q.sql, args: q.params as never });
  return rs.rows.map((r) => String(r.shorthand));
}

it('prints the shorthands written out by hand', async () => {
  expect(await fromSql([
    { interface: 'rs232' },
    { interface: 'rs232', baud: 9600, dataBits: 7, parity: 'even' },
    { interface: 'rs485-2w', baud: 19200, stopBits: 2 },
    { interface: 'usb-vcp', baud: 300, dataBits: 5, parity: 'mark', stopBits: 1.5 },
    { interface: 'ttl', baud: 100_000_000, dataBits: 6, parity: 'space' },
    { interface: 'rs422', baud: 1200, parity: 'odd', tcpHost: '10.0.0.5', tcpPort: 4001 },
    { interface: 'tcp', tcpHost: '192.168.0.10', tcpPort: 502, baud: 19200, parity: 'even' },
  ])).toEqual(['9600 8-N-1', '9600 7-E-1', '19200 8-N-2', '300 5-M-1.5', '100000000 6-S-1', '1200 8-O-1', 'TCP 192.168.0.10:502']);
});

it('agrees with portShorthand() on every interface, parity, data bits and stop bits', async () => {
  const all: PortSettingsInput[] = [];
  for (const iface of INTERFACES.filter((i) => i !== 'tcp')) {
    for (const parity of PARITIES) {
      for (const stopBits of [1, 1.5, 2] as const) all.push({ interface: iface, parity, stopBits, dataBits: 5 + (all.length % 4), baud: [110, 9600, 74880, 921600][all.length % 4] });
    }
  }
  all.push({ interface: 'tcp', tcpHost: 'gw-7.plant.test', tcpPort: 1 }, { interface: 'tcp', tcpHost: 'fe80::1', tcpPort: 65535 });
  expect(await fromSql(all)).toEqual(all.map((s) => portShorthand(portSettingsSchema.parse(s))));
});
