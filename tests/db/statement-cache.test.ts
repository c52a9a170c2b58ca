/** The prepared-statement cache under the libSQL client: reuse, fresh data, no lingering locks, schema changes. */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeAll, expect, it } from 'vitest';
import Database from 'libsql';
import { createClient, type Client } from '@libsql/client';
import { cacheStatements, STATEMENT_CACHE_SIZE } from '../../src/db/statement-cache';

beforeAll(() => cacheStatements());

const dirs: string[] = [];
const opened: Client[] = [];
function tempPath(): string {
  const dir = mkdtempSync(join(tmpdir(), 'stmt-cache-'));
  dirs.push(dir);
  return join(dir, 'c.db');
}
async function twoClients(): Promise<[Client, Client]> {
  const url = `file:${tempPath()}`;
  const a = createClient({ url, timeout: 50 });
  await a.execute('PRAGMA journal_mode = WAL');
  await a.execute('CREATE TABLE t (n INTEGER)');
  const b = createClient({ url, timeout: 50 });
  opened.push(a, b);
  return [a, b];
}
afterEach(() => {
  opened.splice(0).forEach((c) => c.close());
  dirs.splice(0).forEach((d) => rmSync(d, { recursive: true, force: true }));
});

const count = async (c: Client) => Number((await c.execute('SELECT count(*) AS n FROM t')).rows[0]!.n);

it('hands back one prepared statement per text and connection, reads and writes alike', () => {
  const db = new Database(tempPath());
  db.exec('CREATE TABLE t (n INTEGER)');
  expect(db.prepare('SELECT n FROM t')).toBe(db.prepare('SELECT n FROM t'));
  expect(db.prepare('WITH x AS (SELECT 1 AS v) SELECT count(*), v FROM x')).toBe(db.prepare('WITH x AS (SELECT 1 AS v) SELECT count(*), v FROM x'));
  expect(db.prepare('INSERT INTO t VALUES (?)')).toBe(db.prepare('INSERT INTO t VALUES (?)'));
  expect(db.prepare('INSERT INTO t VALUES (?)')).not.toBe(db.prepare('INSERT INTO t VALUES (?), (?)'));
  const other = new Database(tempPath());
  other.exec('CREATE TABLE t (n INTEGER)');
  expect(other.prepare('SELECT n FROM t')).not.toBe(db.prepare('SELECT n FROM t'));
  db.close();
  other.close();
});

it('keeps at most its size, dropping the least recently used', () => {
  const db = new Database(':memory:');
  const first = db.prepare('SELECT 0');
  const recent = db.prepare('SELECT 1');
  for (let i = 2; i <= STATEMENT_CACHE_SIZE; i++) db.prepare(`SELECT ${i}`);
  expect(db.prepare('SELECT 1')).toBe(recent); // touched: now the most recent
  db.prepare('SELECT -1'); // one past the size pushes out the oldest
  expect(db.prepare('SELECT 0')).not.toBe(first);
  expect(db.prepare('SELECT 1')).toBe(recent);
  db.close();
});

it('a repeated read sees what another connection committed since', async () => {
  const [a, b] = await twoClients();
  expect(await count(a)).toBe(0);
  await b.execute('INSERT INTO t VALUES (1)');
  expect(await count(a)).toBe(1);
  await b.batch(['INSERT INTO t VALUES (2)', 'INSERT INTO t VALUES (3)'], 'write');
  expect(await count(a)).toBe(3);
  const tx = await a.transaction('read');
  expect(Number((await tx.execute('SELECT count(*) AS n FROM t')).rows[0]!.n)).toBe(3);
  await tx.close();
});

it('leaves no read lock behind: a truncating checkpoint completes after many cached reads', async () => {
  const [a, b] = await twoClients();
  for (let i = 0; i < 20; i++) {
    await b.execute({ sql: 'INSERT INTO t VALUES (?)', args: [i] });
    await count(a);
    await a.execute({ sql: 'SELECT n FROM t WHERE n >= ? ORDER BY n', args: [i] });
  }
  const ck = await b.execute('PRAGMA wal_checkpoint(TRUNCATE)');
  expect(Number(ck.rows[0]![0])).toBe(0); // busy = 0: no reader held the log
  expect(await count(a)).toBe(20);
});

it('a read that fails leaves its statement usable for the next call', async () => {
  const [a] = await twoClients();
  await a.execute("CREATE VIRTUAL TABLE f USING fts5(body)");
  await a.execute("INSERT INTO f (body) VALUES ('drive on line 3')");
  const find = (q: string) => a.execute({ sql: 'SELECT count(*) AS n FROM f WHERE f MATCH ?', args: [q] });
  await expect(find('"unbalanced')).rejects.toThrow(/unterminated string|fts5|syntax/i);
  expect(Number((await find('"line"*')).rows[0]!.n)).toBe(1);
});

it('a cached read keeps working after another connection changes the schema', async () => {
  const [a, b] = await twoClients();
  await a.execute('INSERT INTO t VALUES (7)');
  expect((await a.execute('SELECT n FROM t WHERE n > ?', [0])).rows[0]!.n).toBe(7);
  await b.execute("ALTER TABLE t ADD COLUMN label TEXT NOT NULL DEFAULT 'x'");
  const named = await a.execute('SELECT n FROM t WHERE n > ?', [0]); // cached, re-prepared by SQLite
  expect(named.columns).toEqual(['n']);
  expect(named.rows[0]!.n).toBe(7);
  const both = await a.execute('SELECT n, label FROM t WHERE n > ?', [0]);
  expect(both.rows[0]!.label).toBe('x');
});

it('a cached write runs again with new values, and one that failed runs again too', async () => {
  const [a, b] = await twoClients();
  await a.execute('CREATE UNIQUE INDEX t_n ON t (n)');
  const put = (n: number) => a.execute({ sql: 'INSERT INTO t (n) VALUES (?)', args: [n] });
  await put(1);
  await put(2);
  await expect(put(1)).rejects.toThrow(/UNIQUE/);
  await put(3);
  expect(await count(b)).toBe(3);
  const back = (n: number) => a.execute({ sql: 'INSERT INTO t (n) VALUES (?) RETURNING n * 10 AS x', args: [n] });
  expect((await back(4)).rows[0]!.x).toBe(40);
  expect((await back(5)).rows[0]!.x).toBe(50);
  expect(await count(b)).toBe(5);
});

it('a cached write in a batch leaves no lock behind: the other connection writes and checkpoints after it', async () => {
  const [a, b] = await twoClients();
  for (let i = 0; i < 10; i++) {
    await a.batch([{ sql: 'INSERT INTO t (n) VALUES (?), (?)', args: [2 * i, 2 * i + 1] }, { sql: 'UPDATE t SET n = n WHERE n = ?', args: [i] }], 'write');
    await b.execute({ sql: 'INSERT INTO t (n) VALUES (?)', args: [100 + i] }); // timeout 50 ms: fails if a holds the write lock
  }
  const ck = await b.execute('PRAGMA wal_checkpoint(TRUNCATE)');
  expect(Number(ck.rows[0]![0])).toBe(0);
  expect(await count(a)).toBe(30);
});
