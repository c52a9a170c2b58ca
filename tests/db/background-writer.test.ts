import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, expect, it } from 'vitest';
import { createClient, type Client } from '@libsql/client';
import { startBackgroundWriter, type BackgroundWriter } from '../../src/db/background-writer';
import { gateWrites, inWriteTurn } from '../../src/db/write-gate';

const dirs: string[] = [];
const writers: BackgroundWriter[] = [];
const clients: Client[] = [];
async function open(): Promise<{ path: string; client: Client }> {
  const dir = mkdtempSync(join(tmpdir(), 'bg-writer-'));
  dirs.push(dir);
  const path = join(dir, 'w.db');
  const client = createClient({ url: `file:${path}`, timeout: 50 });
  clients.push(client);
  await client.execute('PRAGMA journal_mode = WAL');
  await client.execute('CREATE TABLE t (n INTEGER PRIMARY KEY, label TEXT NOT NULL)');
  return { path, client };
}
function writer(path: string): BackgroundWriter {
  const w = startBackgroundWriter(path, 50);
  writers.push(w);
  return w;
}
const rows = async (c: Client) => (await c.execute('SELECT n, label FROM t ORDER BY n')).rows.map((r) => [Number(r.n), String(r.label)]);
afterEach(async () => {
  await Promise.all(writers.splice(0).map((w) => w.stop()));
  clients.splice(0).forEach((c) => c.close());
  dirs.splice(0).forEach((d) => rmSync(d, { recursive: true, force: true }));
});

it('runs a list of statements on its own connection, prepared once per text, and they are there when the write settles', async () => {
  const { path, client } = await open();
  const w = writer(path);
  const insert = 'INSERT INTO t (n, label) VALUES (?, ?), (?, ?)';
  await w.write([{ sql: insert, args: [1, 'one', 2, 'two'] }, { sql: 'UPDATE t SET label = ? WHERE n = ?', args: ['uno', 1] }]);
  // The same text again, with other values, and a value the driver takes as a number (a boolean).
  await w.write([{ sql: insert, args: [3, 'three', 4, 'four'] }, { sql: 'UPDATE t SET label = label || ? WHERE n = ?', args: ['!', true] }]);
  expect(await rows(client)).toEqual([[1, 'uno!'], [2, 'two'], [3, 'three'], [4, 'four']]);
});

it('a failing statement undoes the whole write, rejects with SQLite\'s message, and the next write works', async () => {
  const { path, client } = await open();
  const w = writer(path);
  await w.write([{ sql: 'INSERT INTO t (n, label) VALUES (?, ?)', args: [1, 'one'] }]);
  const failed = w.write([
    { sql: 'INSERT INTO t (n, label) VALUES (?, ?)', args: [2, 'two'] },
    { sql: 'INSERT INTO t (n, label) VALUES (?, ?)', args: [3, null] },
  ]);
  await expect(failed).rejects.toThrow(/NOT NULL constraint failed: t\.label/);
  await expect(failed).rejects.toMatchObject({ code: expect.stringMatching(/SQLITE_CONSTRAINT/) });
  expect(await rows(client)).toEqual([[1, 'one']]);
  await w.write([{ sql: 'INSERT INTO t (n, label) VALUES (?, ?)', args: [2, 'two'] }]);
  expect(await rows(client)).toEqual([[1, 'one'], [2, 'two']]);
});

it('refuses named arguments before anything is sent', async () => {
  const { path, client } = await open();
  await expect(writer(path).write([{ sql: 'INSERT INTO t (n, label) VALUES (:n, :l)', args: { n: 1, l: 'x' } }])).rejects.toThrow(/positional/);
  expect(await rows(client)).toEqual([]);
});

it('taken in turn at the client\'s write gate, it never meets the process\'s other writes at the lock', async () => {
  const { path, client: raw } = await open();
  const client = gateWrites(raw);
  const w = writer(path);
  const order: string[] = [];
  // A transaction of this process holds the lock: the background write waits its turn instead of failing busy.
  const tx = await client.transaction('write');
  await tx.execute("INSERT INTO t (n, label) VALUES (1, 'tx')");
  const background = inWriteTurn(client, () => w.write([{ sql: "INSERT INTO t (n, label) VALUES (2, 'worker')" }])).then(() => order.push('background'));
  // While the background write holds its turn, a plain write of the process waits behind it.
  const plain = client.execute("INSERT INTO t (n, label) VALUES (3, 'plain')").then(() => order.push('plain'));
  await new Promise((r) => setTimeout(r, 150));
  order.push('commit');
  await tx.commit();
  await Promise.all([background, plain]);
  expect(order).toEqual(['commit', 'background', 'plain']);
  expect(await rows(raw)).toEqual([[1, 'tx'], [2, 'worker'], [3, 'plain']]);
});

it('a client without a gate (a libSQL server) runs the write at once', async () => {
  const { client } = await open();
  expect(await inWriteTurn(client, async () => 'ran')).toBe('ran');
});

it('fails what it was given when its worker stops, and starts a new one on the next write', async () => {
  const { path, client } = await open();
  const w = writer(path);
  await w.write([{ sql: "INSERT INTO t (n, label) VALUES (1, 'before')" }]);
  await w.stop();
  await w.write([{ sql: "INSERT INTO t (n, label) VALUES (2, 'after')" }]);
  expect(await rows(client)).toEqual([[1, 'before'], [2, 'after']]);
});
