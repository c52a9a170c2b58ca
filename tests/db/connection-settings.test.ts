import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, expect, it } from 'vitest';
import { createClient, type Client } from '@libsql/client';
import { configureConnections } from '../../src/db/connection-settings';
import { startCheckpointer } from '../../src/db/checkpointer';

const dirs: string[] = [];
const clients: Client[] = [];
function open(): { client: Client; path: string } {
  const dir = mkdtempSync(join(tmpdir(), 'conn-'));
  dirs.push(dir);
  const path = join(dir, 'c.db');
  const client = createClient({ url: `file:${path}` });
  clients.push(client);
  return { client, path };
}
afterEach(() => {
  clients.splice(0).forEach((c) => c.close());
  dirs.splice(0).forEach((d) => rmSync(d, { recursive: true, force: true }));
});

const setting = async (c: Client | { execute: Client['execute'] }, name: string) => Number(Object.values((await c.execute(`PRAGMA ${name}`)).rows[0]!)[0]);

it('every connection, the one an open transaction holds and the one opened meanwhile, commits without fsync and never checkpoints by itself', async () => {
  configureConnections();
  const { client } = open();
  await client.execute('PRAGMA journal_mode = WAL');
  await client.execute('CREATE TABLE t (n INTEGER)');
  const tx = await client.transaction('write');
  await tx.execute('INSERT INTO t VALUES (1)');
  // SQLite: 2 = FULL (its default), 1 = NORMAL; wal_autocheckpoint defaults to 1000 pages.
  expect(await setting(tx, 'synchronous')).toBe(1);
  expect(await setting(tx, 'wal_autocheckpoint')).toBe(0);
  // The transaction holds its connection, so this read runs on another one.
  expect(await setting(client, 'synchronous')).toBe(1);
  expect(await setting(client, 'wal_autocheckpoint')).toBe(0);
  await tx.commit();
});

it('with automatic checkpoints off, the worker copies committed writes from the log into the database file', async () => {
  configureConnections();
  const { client, path } = open();
  await client.execute('PRAGMA journal_mode = WAL');
  await client.execute('CREATE TABLE t (s TEXT)');
  await client.execute("INSERT INTO t SELECT printf('%0500d', value) FROM generate_series(1, 2000)");
  const before = statSync(path).size;
  // Far below the 1,000 pages at which SQLite would checkpoint by itself; nothing copies them but the worker.
  expect(before).toBeLessThan(100_000);
  const checkpointer = startCheckpointer(path, 50);
  try {
    const deadline = Date.now() + 10_000;
    while (statSync(path).size <= before && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
    expect(statSync(path).size).toBeGreaterThan(1_000_000);
    expect(Number((await client.execute('SELECT count(*) AS n FROM t')).rows[0]!.n)).toBe(2000);
  } finally {
    await checkpointer.stop();
  }
});
