-- Device search: one FTS5 row per device not in the trash, with its site and machine names.
-- Kept current by triggers, so every writer (services, seeds, restores) updates it the same way.
CREATE VIRTUAL TABLE `device_search` USING fts5(
  device_id UNINDEXED, team_id UNINDEXED, tag, name, maker, model, serial_number, site_name, machine_name,
  tokenize = 'unicode61', prefix = '1 2 3'
);
--> statement-breakpoint
CREATE TRIGGER `device_search_ai` AFTER INSERT ON `device` WHEN new.deleted_at IS NULL BEGIN
  INSERT INTO device_search (device_id, team_id, tag, name, maker, model, serial_number, site_name, machine_name)
  SELECT new.id, new.team_id, new.tag, new.name, new.maker, new.model, new.serial_number, s.name, m.name
  FROM machine m JOIN site s ON s.id = m.site_id WHERE m.id = new.machine_id;
END;
--> statement-breakpoint
CREATE TRIGGER `device_search_au` AFTER UPDATE OF tag, name, maker, model, serial_number, machine_id, deleted_at ON `device` BEGIN
  DELETE FROM device_search WHERE device_id = old.id;
  INSERT INTO device_search (device_id, team_id, tag, name, maker, model, serial_number, site_name, machine_name)
  SELECT new.id, new.team_id, new.tag, new.name, new.maker, new.model, new.serial_number, s.name, m.name
  FROM machine m JOIN site s ON s.id = m.site_id WHERE m.id = new.machine_id AND new.deleted_at IS NULL;
END;
--> statement-breakpoint
CREATE TRIGGER `device_search_ad` AFTER DELETE ON `device` BEGIN
  DELETE FROM device_search WHERE device_id = old.id;
END;
--> statement-breakpoint
CREATE TRIGGER `device_search_machine_au` AFTER UPDATE OF name, site_id ON `machine` BEGIN
  UPDATE device_search SET machine_name = new.name, site_name = (SELECT name FROM site WHERE id = new.site_id)
  WHERE device_id IN (SELECT id FROM device WHERE machine_id = new.id);
END;
--> statement-breakpoint
CREATE TRIGGER `device_search_site_au` AFTER UPDATE OF name ON `site` BEGIN
  UPDATE device_search SET site_name = new.name
  WHERE device_id IN (SELECT d.id FROM device d JOIN machine m ON m.id = d.machine_id WHERE m.site_id = new.id);
END;
