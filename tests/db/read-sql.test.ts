/** The one rule for which SQL only reads, which the write gate goes by. */
import { expect, it } from 'vitest';
import { isReadSql } from '../../src/db/read-sql';

it('reads: SELECT, VALUES and WITH … SELECT, after whitespace and comments', () => {
  for (const sql of [
    'SELECT 1',
    '  select * from t;',
    '\n-- note\n/* more */ SELECT 1',
    'VALUES (1), (2)',
    'WITH page AS (SELECT id FROM device ORDER BY tag LIMIT ?) SELECT json_object(\'total\', 1) FROM page',
    'with recursive n(v) as (select 1 union all select v + 1 from n where v < 5) select v from n',
    'WITH a AS MATERIALIZED (SELECT 1), b(x) AS NOT MATERIALIZED (SELECT 2) SELECT * FROM a, b',
    'WITH "delete"(x) AS (SELECT \'insert into t\') SELECT x FROM "delete"',
    'SELECT \'it\'\'s; DELETE FROM t\' AS s',
  ]) expect(isReadSql(sql), sql).toBe(true);
});

it('writes: anything that changes data, a second statement, and text that does not scan', () => {
  for (const sql of [
    'INSERT INTO t VALUES (1)',
    'WITH v(n) AS (VALUES (5)) INSERT INTO t SELECT n FROM v',
    'WITH old AS (SELECT id FROM t) DELETE FROM t WHERE id IN old',
    'with x as (select 1) update t set n = 2',
    'WITH x AS (SELECT 1) REPLACE INTO t VALUES (1)',
    'SELECT 1; DELETE FROM t',
    'BEGIN',
    'PRAGMA journal_mode = WAL',
    'CREATE TABLE t (n)',
    'SELECT \'unclosed',
    'WITH x AS (SELECT 1 SELECT 2',
    '/* unclosed SELECT 1',
    '',
  ]) expect(isReadSql(sql), sql).toBe(false);
});
