/**
 * Migration 0011 moves command history from command_revision into the one revision table (entity type
 * `command`, ids, versions, times and snapshots unchanged) and gives commands already in the trash their trash_id.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { expect, it } from 'vitest';
import { createClient } from '@libsql/client';

function statements(file: string): string[] {
  return readFileSync(`drizzle/${file}`, 'utf8').split('--> statement-breakpoint').map((s) => s.trim()).filter(Boolean);
}

it('moves every command revision into the revision table and stamps trashed commands with their trash id', async () => {
  const db = createClient({ url: ':memory:' });
  const files = readdirSync('drizzle').filter((f) => /^\d{4}_.*\.sql$/.test(f)).sort();
  const target = files.findIndex((f) => f.startsWith('0011_'));
  expect(target).toBeGreaterThan(0);
  for (const f of files.slice(0, target)) for (const sql of statements(f)) await db.execute(sql);
  await db.execute(`INSERT INTO user (id, name, email, email_verified, created_at, updated_at) VALUES ('u1', 'Uma', 'u@example.test', 1, 0, 0)`);
  await db.execute(`INSERT INTO team (id, name, created_at) VALUES ('t1', 'T', 0)`);
  await db.execute(`INSERT INTO device_profile (id, team_id, name, ports, created_at, updated_at) VALUES ('p1', 't1', 'Drive', '[]', 0, 0)`);
  const template = JSON.stringify({ version: 1, segments: [] });
  for (const [id, deleted] of [['c_live', null], ['c_gone', 777]] as const) {
    await db.execute({
      sql: `INSERT INTO command (id, team_id, profile_id, name, template, field_values, raw_units, version, created_at, updated_at, deleted_at, deleted_by) VALUES (?, 't1', 'p1', ?, ?, '{}', '{}', 2, 0, 0, ?, ?)`,
      args: [id, `Name ${id}`, template, deleted, deleted ? 'u1' : null],
    });
  }
  const snap = (name: string) => JSON.stringify({ name, purpose: '', template: { version: 1, segments: [] }, fieldValues: {}, replyTemplate: null, portName: '', rawUnits: {}, notes: '', movesMachinery: false });
  const old: [string, string, number, string, number][] = [
    ['crev_a1', 'c_live', 1, 'create', 100],
    ['crev_a2', 'c_live', 2, 'update', 200],
    ['crev_b1', 'c_gone', 1, 'create', 300],
    ['crev_b2', 'c_gone', 2, 'delete', 400],
  ];
  for (const [id, commandId, version, action, at] of old) {
    await db.execute({
      sql: `INSERT INTO command_revision (id, team_id, command_id, version, action, user_id, user_name, summary, changes, snapshot, created_at) VALUES (?, 't1', ?, ?, ?, 'u1', 'Uma', ?, ?, ?, ?)`,
      args: [id, commandId, version, action, `summary ${id}`, JSON.stringify([{ field: 'name', from: null, to: id }]), snap(id), at],
    });
  }
  for (const sql of statements(files[target]!)) await db.execute(sql);

  const moved = (await db.execute(`SELECT id, team_id, entity_type, entity_id, version, action, user_id, user_name, summary, changes, snapshot, created_at FROM revision ORDER BY id`)).rows;
  expect(moved.map((r) => ({ ...r }))).toEqual(
    old.map(([id, commandId, version, action, at]) => ({
      id, team_id: 't1', entity_type: 'command', entity_id: commandId, version, action, user_id: 'u1', user_name: 'Uma',
      summary: `summary ${id}`, changes: JSON.stringify([{ field: 'name', from: null, to: id }]), snapshot: snap(id), created_at: at,
    })),
  );
  const tables = (await db.execute(`SELECT name FROM sqlite_master WHERE type = 'table' AND name = 'command_revision'`)).rows;
  expect(tables).toEqual([]);
  const trash = (await db.execute(`SELECT id, trash_id FROM command ORDER BY id`)).rows.map((r) => [r.id, r.trash_id]);
  expect(trash).toEqual([['c_gone', 'c_gone'], ['c_live', null]]);
  db.close();
});
