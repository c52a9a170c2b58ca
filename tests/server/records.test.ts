/**
 * The record engine's declarations and the named-error catalogue, checked without a server: every declared
 * snapshot key and reference is a column of the entity's table (and a wrong one fails `tsc`), and every named
 * error has its one HTTP status. Behaviour through the server is covered by the vault, command and import tests.
 */
import { getTableColumns } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { RECORD_TYPES, site } from '../../src/db/schema';
import { defineEntity } from '../../src/lib/server/records/entity';
import { entityOf } from '../../src/lib/server/records/entities';
import {
  AppError, BadRequest, Conflict, Duplicate, Forbidden, Gone, Invalid, NotFound, ReferenceMissing, Stale, TooLarge, Unauthenticated, Unsupported,
  duplicateFrom, notFound,
} from '../../src/lib/server/errors';
import { httpStatus, route } from '../../src/lib/server/http';

describe('entity declarations', () => {
  it.each(RECORD_TYPES)('%s: snapshot keys, parent and references are columns of its table (link members aside)', (type) => {
    const e = entityOf(type);
    const columns = Object.keys(getTableColumns(e.table));
    const stored = e.snapshotKeys.filter((k) => !(e.extraKeys ?? []).includes(k));
    expect(stored.filter((k) => !columns.includes(k))).toEqual([]);
    for (const r of [...(e.parent ? [e.parent] : []), ...(e.references ?? [])]) expect(columns).toContain(r.field);
    for (const c of ['id', 'teamId', 'version', 'updatedAt', 'updatedBy', 'deletedAt', 'deletedBy', 'trashId']) expect(columns).toContain(c);
  });

  it('refuses a snapshot key that is not a column (at compile time)', () => {
    const bad = defineEntity({
      type: 'site',
      noun: 'site',
      table: site,
      // @ts-expect-error `customerName` is not a column of site: a renamed column fails tsc.
      snapshotKeys: ['name', 'customerName'],
      describe: (r) => r.name,
    });
    expect(bad.snapshotKeys).toHaveLength(2);
  });
});

describe('named errors', () => {
  it('map to one HTTP status each', () => {
    const cases: [AppError, number][] = [
      [new BadRequest('x'), 400], [new Unauthenticated('x'), 401], [new Forbidden('x'), 403], [notFound('device'), 404],
      [new Stale('x', { version: 2 }), 409], [new Conflict('x'), 409], [new ReferenceMissing('x', []), 409], [new Gone('x'), 410],
      [new TooLarge('x'), 413], [new Unsupported('x'), 415], [new Duplicate('tag', 'x', 'y'), 422], [new Invalid('x'), 422],
    ];
    for (const [err, status] of cases) expect([err.name, httpStatus(err)]).toEqual([err.name, status]);
    expect(notFound('device').message).toBe('No device with that id in this team.');
  });

  it('reads a duplicate from SQLite’s constraint code, not from the message', () => {
    const unique = Object.assign(new Error('anything at all'), { code: 'SQLITE_CONSTRAINT_UNIQUE' });
    const wrapped = Object.assign(new Error('Failed query'), { cause: unique });
    const dup = duplicateFrom(wrapped, 'tag', 'tag: taken', 'Taken.');
    expect(dup).toBeInstanceOf(Duplicate);
    expect((dup as Duplicate).details).toEqual({ fields: { tag: 'Taken.' } });
    const lookalike = new Error('UNIQUE constraint failed: device.tag');
    expect(duplicateFrom(lookalike, 'tag', 'x', 'y')).toBe(lookalike);
  });

  it('become JSON answers with their details through route()', async () => {
    const handler = route(async () => {
      throw new Stale('This site was changed by someone else.', { id: 's1', version: 4 });
    });
    const res = await handler({});
    expect(res.status).toBe(409);
    expect(await res.json()).toEqual({ error: 'This site was changed by someone else.', current: { id: 's1', version: 4 } });
  });
});
