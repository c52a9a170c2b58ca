-- Device search also finds a unit by its earlier serial numbers (`device.former_serials`, a JSON array: its brackets,
-- quotes and commas are separators to the tokenizer). The FTS table gains a column, so it is made again with the
-- same rules as 0002, 0012 and 0015: rows only for live devices, and for the devices a long job has out of sight
-- (it wrote their rows while staging; showing a device whose trash stamp is a job's id adds none).
DROP TRIGGER IF EXISTS `device_search_ai`;--> statement-breakpoint
DROP TRIGGER IF EXISTS `device_search_au`;--> statement-breakpoint
DROP TRIGGER IF EXISTS `device_search_back_au`;--> statement-breakpoint
DROP TRIGGER IF EXISTS `device_search_ad`;--> statement-breakpoint
DROP TRIGGER IF EXISTS `device_search_machine_au`;--> statement-breakpoint
DROP TRIGGER IF EXISTS `device_search_site_au`;--> statement-breakpoint
DROP TABLE `device_search`;--> statement-breakpoint
CREATE VIRTUAL TABLE `device_search` USING fts5(
  device_id UNINDEXED, team_id UNINDEXED, tag, name, maker, model, serial_number, former_serials, site_name, machine_name,
  tokenize = 'unicode61', prefix = '1 2 3'
);--> statement-breakpoint
INSERT INTO device_search (device_id, team_id, tag, name, maker, model, serial_number, former_serials, site_name, machine_name)
  SELECT d.id, d.team_id, d.tag, d.name, d.maker, d.model, d.serial_number, d.former_serials, s.name, m.name
  FROM device d JOIN machine m ON m.id = d.machine_id JOIN site s ON s.id = m.site_id
  WHERE d.deleted_at IS NULL OR d.trash_id LIKE 'job\_%' ESCAPE '\';--> statement-breakpoint
CREATE TRIGGER `device_search_ai` AFTER INSERT ON `device` WHEN new.deleted_at IS NULL BEGIN
  INSERT INTO device_search (device_id, team_id, tag, name, maker, model, serial_number, former_serials, site_name, machine_name)
  SELECT new.id, new.team_id, new.tag, new.name, new.maker, new.model, new.serial_number, new.former_serials, s.name, m.name
  FROM machine m JOIN site s ON s.id = m.site_id WHERE m.id = new.machine_id;
END;--> statement-breakpoint
CREATE TRIGGER `device_search_au` AFTER UPDATE OF tag, name, maker, model, serial_number, former_serials, machine_id, deleted_at ON `device` WHEN old.deleted_at IS NULL BEGIN
  DELETE FROM device_search WHERE device_id = old.id;
  INSERT INTO device_search (device_id, team_id, tag, name, maker, model, serial_number, former_serials, site_name, machine_name)
  SELECT new.id, new.team_id, new.tag, new.name, new.maker, new.model, new.serial_number, new.former_serials, s.name, m.name
  FROM machine m JOIN site s ON s.id = m.site_id WHERE m.id = new.machine_id AND new.deleted_at IS NULL;
END;--> statement-breakpoint
CREATE TRIGGER `device_search_back_au` AFTER UPDATE OF deleted_at ON `device` WHEN old.deleted_at IS NOT NULL AND new.deleted_at IS NULL AND (old.trash_id IS NULL OR old.trash_id NOT LIKE 'job\_%' ESCAPE '\') BEGIN
  INSERT INTO device_search (device_id, team_id, tag, name, maker, model, serial_number, former_serials, site_name, machine_name)
  SELECT new.id, new.team_id, new.tag, new.name, new.maker, new.model, new.serial_number, new.former_serials, s.name, m.name
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
END;
