import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, expect, it } from 'vitest';
import { createClient, type Client } from '@libsql/client';
import { gateWrites } from '../../src/db/write-gate';

const dirs: string[] = [];
async function open(): Promise<Client> {
  const dir = mkdtempSync(join(tmpdir(), 'gate-'));
  dirs.push(dir);
  // A short busy timeout: an ungated overlapping write fails fast instead of stalling.
  const raw = createClient({ url: `file:${join(dir, 'g.db')}`, timeout: 50 });
  await raw.execute('PRAGMA journal_mode = WAL');
  await raw.execute('CREATE TABLE t (n INTEGER)');
  return raw;
}
afterEach(() => dirs.splice(0).forEach((d) => rmSync(d, { recursive: true, force: true })));

it('without the gate, a write overlapping an open transaction fails with SQLITE_BUSY', async () => {
  const raw = await open();
  const tx = await raw.transaction('write');
  await tx.execute('INSERT INTO t VALUES (1)');
  await expect(raw.execute('INSERT INTO t VALUES (2)')).rejects.toThrow(/SQLITE_BUSY|locked/i);
  await tx.commit();
});

it('with the gate, the overlapping write waits for the commit and then succeeds; reads pass through', async () => {
  const client = gateWrites(await open());
  const order: string[] = [];
  const tx = await client.transaction('write');
  await tx.execute('INSERT INTO t VALUES (1)');
  const plain = client.execute('INSERT INTO t VALUES (2)').then(() => order.push('plain write'));
  const read = client.execute('SELECT count(*) AS n FROM t').then((r) => {
    order.push('read');
    return Number(r.rows[0]!.n);
  });
  expect(await read).toBe(0);
  await new Promise((r) => setTimeout(r, 20));
  order.push('commit');
  await tx.commit();
  await plain;
  expect(order).toEqual(['read', 'commit', 'plain write']);
  const rows = await client.execute('SELECT n FROM t ORDER BY n');
  expect(rows.rows.map((r) => Number(r.n))).toEqual([1, 2]);
});

it('releases the gate after a rollback and after a failed transaction start', async () => {
  const client = gateWrites(await open());
  const tx = await client.transaction('write');
  await tx.execute('INSERT INTO t VALUES (1)');
  await tx.rollback();
  await client.execute('INSERT INTO t VALUES (3)');
  const tx2 = await client.transaction('write');
  tx2.close();
  await client.batch(['INSERT INTO t VALUES (4)']);
  const rows = await client.execute('SELECT n FROM t ORDER BY n');
  expect(rows.rows.map((r) => Number(r.n))).toEqual([3, 4]);
});

it('a read that starts with WITH (after comments) passes a held write; WITH … INSERT waits for the commit', async () => {
  const client = gateWrites(await open());
  const order: string[] = [];
  const tx = await client.transaction('write');
  await tx.execute('INSERT INTO t VALUES (1)');
  const cteWrite = client.execute('WITH v(n) AS (VALUES (5)) INSERT INTO t SELECT n FROM v').then(() => order.push('cte write'));
  const reads = [
    'WITH x AS (SELECT n FROM t) SELECT count(*) AS n FROM x',
    '  -- the device list\n/* page */ WITH RECURSIVE x(v) AS (SELECT 1) SELECT count(*) AS n FROM t',
    'select count(*) as n from t',
  ].map((sql) => client.execute(sql).then((r) => {
    order.push('read');
    return Number(r.rows[0]!.n);
  }));
  const settled = await Promise.race([Promise.all(reads), new Promise((r) => setTimeout(() => r('still waiting'), 500))]);
  expect(settled).toEqual([0, 0, 0]);
  order.push('commit');
  await tx.commit();
  await cteWrite;
  expect(order).toEqual(['read', 'read', 'read', 'commit', 'cte write']);
  const rows = await client.execute('SELECT n FROM t ORDER BY n');
  expect(rows.rows.map((r) => Number(r.n))).toEqual([1, 5]);
});
