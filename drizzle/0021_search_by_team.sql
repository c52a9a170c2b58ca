CREATE INDEX `device_team_name_idx` ON `device` (`team_id`,`name`,`id`);--> statement-breakpoint
CREATE INDEX `device_team_role_idx` ON `device` (`team_id`,`role`,`id`);--> statement-breakpoint
CREATE INDEX `device_team_maker_idx` ON `device` (`team_id`,`maker`,`id`);--> statement-breakpoint
CREATE INDEX `device_team_model_idx` ON `device` (`team_id`,`model`,`id`);--> statement-breakpoint
CREATE INDEX `device_team_serial_idx` ON `device` (`team_id`,`serial_number`,`id`);--> statement-breakpoint
-- Search scoped by team in the index itself (docs/api.md, "Search"): every search row carries its team as one indexed
-- token (`'t' || lower(hex(team_id))`, `teamToken()` in src/lib/server/vault/fts.ts), and a query asks for that token
-- beside the typed words, so FTS5 walks only the team's rows instead of matching every team's and filtering. The
-- device's role is indexed too (a converter is found by its role). Same rules as 0019 otherwise: rows only for live
-- devices, and for the devices a long job has out of sight (it wrote their rows while staging).
DROP TRIGGER IF EXISTS `device_search_ai`;--> statement-breakpoint
DROP TRIGGER IF EXISTS `device_search_au`;--> statement-breakpoint
DROP TRIGGER IF EXISTS `device_search_back_au`;--> statement-breakpoint
DROP TRIGGER IF EXISTS `device_search_ad`;--> statement-breakpoint
DROP TRIGGER IF EXISTS `device_search_machine_au`;--> statement-breakpoint
DROP TRIGGER IF EXISTS `device_search_site_au`;--> statement-breakpoint
DROP TABLE `device_search`;--> statement-breakpoint
CREATE VIRTUAL TABLE `device_search` USING fts5(
  device_id UNINDEXED, team, tag, name, role, maker, model, serial_number, former_serials, site_name, machine_name,
  tokenize = 'unicode61', prefix = '1 2 3'
);--> statement-breakpoint
INSERT INTO device_search (device_id, team, tag, name, role, maker, model, serial_number, former_serials, site_name, machine_name)
  SELECT d.id, 't' || lower(hex(d.team_id)), d.tag, d.name, d.role, d.maker, d.model, d.serial_number, d.former_serials, s.name, m.name
  FROM device d JOIN machine m ON m.id = d.machine_id JOIN site s ON s.id = m.site_id
  WHERE d.deleted_at IS NULL OR d.trash_id LIKE 'job\_%' ESCAPE '\';--> statement-breakpoint
CREATE TRIGGER `device_search_ai` AFTER INSERT ON `device` WHEN new.deleted_at IS NULL BEGIN
  INSERT INTO device_search (device_id, team, tag, name, role, maker, model, serial_number, former_serials, site_name, machine_name)
  SELECT new.id, 't' || lower(hex(new.team_id)), new.tag, new.name, new.role, new.maker, new.model, new.serial_number, new.former_serials, s.name, m.name
  FROM machine m JOIN site s ON s.id = m.site_id WHERE m.id = new.machine_id;
END;--> statement-breakpoint
CREATE TRIGGER `device_search_au` AFTER UPDATE OF tag, name, role, maker, model, serial_number, former_serials, machine_id, deleted_at ON `device` WHEN old.deleted_at IS NULL BEGIN
  DELETE FROM device_search WHERE device_id = old.id;
  INSERT INTO device_search (device_id, team, tag, name, role, maker, model, serial_number, former_serials, site_name, machine_name)
  SELECT new.id, 't' || lower(hex(new.team_id)), new.tag, new.name, new.role, new.maker, new.model, new.serial_number, new.former_serials, s.name, m.name
  FROM machine m JOIN site s ON s.id = m.site_id WHERE m.id = new.machine_id AND new.deleted_at IS NULL;
END;--> statement-breakpoint
CREATE TRIGGER `device_search_back_au` AFTER UPDATE OF deleted_at ON `device` WHEN old.deleted_at IS NOT NULL AND new.deleted_at IS NULL AND (old.trash_id IS NULL OR old.trash_id NOT LIKE 'job\_%' ESCAPE '\') BEGIN
  INSERT INTO device_search (device_id, team, tag, name, role, maker, model, serial_number, former_serials, site_name, machine_name)
  SELECT new.id, 't' || lower(hex(new.team_id)), new.tag, new.name, new.role, new.maker, new.model, new.serial_number, new.former_serials, s.name, m.name
  FROM machine m JOIN site s ON s.id = m.site_id WHERE m.id = new.machine_id;
END;--> statement-breakpoint
CREATE TRIGGER `device_search_ad` AFTER DELETE ON `device` WHEN old.deleted_at IS NULL BEGIN
  DELETE FROM device_search WHERE device_id = old.id;
END;--> statement-breakpoint
CREATE TRIGGER `device_search_machine_au` AFTER UPDATE OF name, site_id ON `machine` BEGIN
  UPDATE device_search SET machine_name = new.name, site_name = (SELECT name FROM site WHERE id = new.site_id)
  WHERE device_id IN (SELECT id FROM device WHERE machine_id = new.id);
END;--> statement-breakpoint
CREATE TRIGGER `device_search_site_au` AFTER UPDATE OF name ON `site` BEGIN
  UPDATE device_search SET site_name = new.name
  WHERE device_id IN (SELECT d.id FROM device d JOIN machine m ON m.id = d.machine_id WHERE m.site_id = new.id);
END;--> statement-breakpoint
-- Commands (name; purpose, notes and the text of their literal parts) and port notes (port name; notes) in a second
-- index with the same team token. `record_search_key` gives each record its index row id, so a trigger finds the row
-- to replace by that id instead of reading the whole index. Rows only for live records (a port only while it has
-- notes); a long job's commands and ports get theirs when they come into sight.
CREATE TABLE `record_search_key` (`id` integer PRIMARY KEY, `record_id` text NOT NULL UNIQUE);--> statement-breakpoint
CREATE VIRTUAL TABLE `record_search` USING fts5(
  kind UNINDEXED, record_id UNINDEXED, team, name, body, tokenize = 'unicode61', prefix = '1 2 3'
);--> statement-breakpoint
INSERT INTO record_search_key (record_id) SELECT id FROM `command` x WHERE x.deleted_at IS NULL;--> statement-breakpoint
INSERT INTO record_search (rowid, kind, record_id, team, name, body)
  SELECT k.id, 'command', x.id, 't' || lower(hex(x.team_id)), x.name, x.purpose || ' ' || x.notes || ' ' || coalesce((SELECT group_concat(CAST(unhex(replace(lower(j.value ->> 'bytes'), '0x', ''), ' ,:-') AS TEXT), ' ') FROM json_each(x.template, '$.segments') j WHERE j.value ->> 'type' = 'literal'), '')
  FROM `command` x JOIN record_search_key k ON k.record_id = x.id WHERE x.deleted_at IS NULL;--> statement-breakpoint
CREATE TRIGGER `command_search_ai` AFTER INSERT ON `command` WHEN new.deleted_at IS NULL BEGIN
  INSERT OR IGNORE INTO record_search_key (record_id) VALUES (new.id);
  INSERT INTO record_search (rowid, kind, record_id, team, name, body)
  VALUES ((SELECT id FROM record_search_key WHERE record_id = new.id), 'command', new.id, 't' || lower(hex(new.team_id)), new.name, new.purpose || ' ' || new.notes || ' ' || coalesce((SELECT group_concat(CAST(unhex(replace(lower(j.value ->> 'bytes'), '0x', ''), ' ,:-') AS TEXT), ' ') FROM json_each(new.template, '$.segments') j WHERE j.value ->> 'type' = 'literal'), ''));
END;--> statement-breakpoint
CREATE TRIGGER `command_search_au` AFTER UPDATE OF name, purpose, notes, template, deleted_at ON `command` WHEN old.deleted_at IS NULL BEGIN
  DELETE FROM record_search WHERE rowid = (SELECT id FROM record_search_key WHERE record_id = old.id);
  DELETE FROM record_search_key WHERE record_id = old.id;
  INSERT OR IGNORE INTO record_search_key (record_id) SELECT new.id WHERE new.deleted_at IS NULL;
  INSERT INTO record_search (rowid, kind, record_id, team, name, body)
  SELECT (SELECT id FROM record_search_key WHERE record_id = new.id), 'command', new.id, 't' || lower(hex(new.team_id)), new.name, new.purpose || ' ' || new.notes || ' ' || coalesce((SELECT group_concat(CAST(unhex(replace(lower(j.value ->> 'bytes'), '0x', ''), ' ,:-') AS TEXT), ' ') FROM json_each(new.template, '$.segments') j WHERE j.value ->> 'type' = 'literal'), '')
  WHERE new.deleted_at IS NULL;
END;--> statement-breakpoint
CREATE TRIGGER `command_search_back_au` AFTER UPDATE OF deleted_at ON `command` WHEN old.deleted_at IS NOT NULL AND new.deleted_at IS NULL BEGIN
  INSERT OR IGNORE INTO record_search_key (record_id) VALUES (new.id);
  INSERT INTO record_search (rowid, kind, record_id, team, name, body)
  VALUES ((SELECT id FROM record_search_key WHERE record_id = new.id), 'command', new.id, 't' || lower(hex(new.team_id)), new.name, new.purpose || ' ' || new.notes || ' ' || coalesce((SELECT group_concat(CAST(unhex(replace(lower(j.value ->> 'bytes'), '0x', ''), ' ,:-') AS TEXT), ' ') FROM json_each(new.template, '$.segments') j WHERE j.value ->> 'type' = 'literal'), ''));
END;--> statement-breakpoint
CREATE TRIGGER `command_search_ad` AFTER DELETE ON `command` WHEN old.deleted_at IS NULL BEGIN
  DELETE FROM record_search WHERE rowid = (SELECT id FROM record_search_key WHERE record_id = old.id);
  DELETE FROM record_search_key WHERE record_id = old.id;
END;--> statement-breakpoint
INSERT INTO record_search_key (record_id) SELECT id FROM `port` x WHERE x.deleted_at IS NULL AND x.notes <> '';--> statement-breakpoint
INSERT INTO record_search (rowid, kind, record_id, team, name, body)
  SELECT k.id, 'port', x.id, 't' || lower(hex(x.team_id)), x.name, x.notes
  FROM `port` x JOIN record_search_key k ON k.record_id = x.id WHERE x.deleted_at IS NULL AND x.notes <> '';--> statement-breakpoint
CREATE TRIGGER `port_search_ai` AFTER INSERT ON `port` WHEN new.deleted_at IS NULL AND new.notes <> '' BEGIN
  INSERT OR IGNORE INTO record_search_key (record_id) VALUES (new.id);
  INSERT INTO record_search (rowid, kind, record_id, team, name, body)
  VALUES ((SELECT id FROM record_search_key WHERE record_id = new.id), 'port', new.id, 't' || lower(hex(new.team_id)), new.name, new.notes);
END;--> statement-breakpoint
CREATE TRIGGER `port_search_au` AFTER UPDATE OF name, notes, deleted_at ON `port` WHEN old.deleted_at IS NULL BEGIN
  DELETE FROM record_search WHERE rowid = (SELECT id FROM record_search_key WHERE record_id = old.id);
  DELETE FROM record_search_key WHERE record_id = old.id;
  INSERT OR IGNORE INTO record_search_key (record_id) SELECT new.id WHERE new.deleted_at IS NULL AND new.notes <> '';
  INSERT INTO record_search (rowid, kind, record_id, team, name, body)
  SELECT (SELECT id FROM record_search_key WHERE record_id = new.id), 'port', new.id, 't' || lower(hex(new.team_id)), new.name, new.notes
  WHERE new.deleted_at IS NULL AND new.notes <> '';
END;--> statement-breakpoint
CREATE TRIGGER `port_search_back_au` AFTER UPDATE OF deleted_at ON `port` WHEN old.deleted_at IS NOT NULL AND new.deleted_at IS NULL AND new.notes <> '' BEGIN
  INSERT OR IGNORE INTO record_search_key (record_id) VALUES (new.id);
  INSERT INTO record_search (rowid, kind, record_id, team, name, body)
  VALUES ((SELECT id FROM record_search_key WHERE record_id = new.id), 'port', new.id, 't' || lower(hex(new.team_id)), new.name, new.notes);
END;--> statement-breakpoint
CREATE TRIGGER `port_search_ad` AFTER DELETE ON `port` WHEN old.deleted_at IS NULL BEGIN
  DELETE FROM record_search WHERE rowid = (SELECT id FROM record_search_key WHERE record_id = old.id);
  DELETE FROM record_search_key WHERE record_id = old.id;
END;
