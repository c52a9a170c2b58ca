DROP INDEX `port_device_name_uq`;--> statement-breakpoint
-- Port names become unique per device ignoring the letter case of A-Z (SQLite's NOCASE). Live ports that
-- would clash keep the name of the first one (by position, then id); each later one is renamed to
-- "name (2)", "name (3)"… in that order, or to "name (duplicate <rowid>)" when that name is taken too,
-- with its version raised and a revision saying why.
CREATE TEMP TABLE `port_rename` AS
  SELECT r.id, r.name AS old_name,
    CASE WHEN EXISTS (
      SELECT 1 FROM port q WHERE q.device_id = r.device_id AND q.deleted_at IS NULL AND q.name = (r.name || ' (' || r.rank || ')') COLLATE NOCASE
    ) THEN r.name || ' (duplicate ' || r.rid || ')' ELSE r.name || ' (' || r.rank || ')' END AS new_name
  FROM (
    SELECT id, rowid AS rid, name, device_id,
      row_number() OVER (PARTITION BY device_id, name COLLATE NOCASE ORDER BY position, id) AS rank
    FROM port WHERE deleted_at IS NULL
  ) r
  WHERE r.rank > 1;--> statement-breakpoint
INSERT INTO `revision` (id, team_id, entity_type, entity_id, version, action, user_id, user_name, summary, changes, snapshot, created_at)
  SELECT 'rev_' || lower(hex(randomblob(12))), p.team_id, 'port', p.id, p.version + 1, 'update', NULL, '',
    'Renamed: another port of this device has the same name in other letter case',
    json_array(json_object('field', 'name', 'from', x.old_name, 'to', x.new_name)),
    json_object('name', x.new_name, 'position', p.position, 'settings', json(p.settings), 'wiring', json(p.wiring), 'notes', p.notes),
    CAST(strftime('%s', 'now') AS INTEGER) * 1000
  FROM port p JOIN port_rename x ON x.id = p.id;--> statement-breakpoint
UPDATE `port` SET name = (SELECT new_name FROM port_rename x WHERE x.id = port.id), version = version + 1
  WHERE id IN (SELECT id FROM port_rename);--> statement-breakpoint
DROP TABLE `port_rename`;--> statement-breakpoint
CREATE UNIQUE INDEX `port_device_name_nocase_uq` ON `port` (`device_id`,"name" COLLATE NOCASE) WHERE deleted_at IS NULL;
