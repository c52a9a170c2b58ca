/** Migration 0008 links share links e-mailed before copies were recorded, and ends copies of links already revoked. */
import { readFileSync, readdirSync } from 'node:fs';
import { expect, it } from 'vitest';
import { createClient } from '@libsql/client';

function statements(file: string): string[] {
  return readFileSync(`drizzle/${file}`, 'utf8').split('--> statement-breakpoint').map((s) => s.trim()).filter(Boolean);
}

it('links old copies to the link they were sent from and revokes copies of revoked links', async () => {
  const db = createClient({ url: ':memory:' });
  const files = readdirSync('drizzle').filter((f) => /^\d{4}_.*\.sql$/.test(f)).sort();
  const target = files.findIndex((f) => f.startsWith('0008_'));
  for (const f of files.slice(0, target)) for (const sql of statements(f)) await db.execute(sql);
  await db.execute(`INSERT INTO user (id, name, email, email_verified, created_at, updated_at) VALUES ('u1', 'U', 'u@example.test', 1, 0, 0)`);
  await db.execute(`INSERT INTO team (id, name, created_at) VALUES ('t1', 'T', 0)`);
  const expires = 2_000_000_000_000;
  const other = expires + 1;
  const rows: [string, string, number, number, number | null][] = [
    // id, label, created, expires, revoked
    ['root', '', 1, expires, 500],
    ['copyA', 'E-mailed to a@example.test', 2, expires, null],
    ['copyAB', 'E-mailed to a@example.test (e-mailed to b@example.test)', 3, expires, null],
    ['named', 'Night shift', 4, expires, null],
    ['copyN', 'Night shift (e-mailed to c@example.test)', 5, expires, null],
    ['lookalike', 'Night shift (e-mailed to d@example.test)', 6, other, null],
    ['plain', 'E-mailed to nobody in particular', 0, expires, null],
  ];
  for (const [id, label, created, exp, revoked] of rows) {
    await db.execute({
      sql: `INSERT INTO share_link (id, team_id, scope_type, scope_id, label, token_hash, created_by_name, created_at, expires_at, revoked_at) VALUES (?, 't1', 'machine', 'm1', ?, ?, '', ?, ?, ?)`,
      args: [id, label, `hash-${id}`, created, exp, revoked],
    });
  }
  for (const sql of statements(files[target]!)) await db.execute(sql);
  const got = Object.fromEntries((await db.execute('SELECT id, parent_id, revoked_at FROM share_link')).rows.map((r) => [r.id, [r.parent_id, r.revoked_at]]));
  expect(got).toEqual({
    root: [null, 500],
    copyA: ['root', 500],
    copyAB: ['copyA', 500],
    named: [null, null],
    copyN: ['named', null],
    lookalike: [null, null],
    plain: [null, null],
  });
  db.close();
});
