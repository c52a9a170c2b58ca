-- Rows by trash stamp (restore, purge, and the rows a long job writes out of sight until its final transaction).
CREATE INDEX `device_trash_idx` ON `device` (`trash_id`) WHERE trash_id IS NOT NULL;--> statement-breakpoint
CREATE INDEX `profile_trash_idx` ON `device_profile` (`trash_id`) WHERE trash_id IS NOT NULL;--> statement-breakpoint
CREATE INDEX `link_trash_idx` ON `link` (`trash_id`) WHERE trash_id IS NOT NULL;--> statement-breakpoint
CREATE INDEX `machine_trash_idx` ON `machine` (`trash_id`) WHERE trash_id IS NOT NULL;--> statement-breakpoint
CREATE INDEX `port_trash_idx` ON `port` (`trash_id`) WHERE trash_id IS NOT NULL;--> statement-breakpoint
CREATE INDEX `site_trash_idx` ON `site` (`trash_id`) WHERE trash_id IS NOT NULL;--> statement-breakpoint
CREATE INDEX `command_trash_idx` ON `command` (`trash_id`) WHERE trash_id IS NOT NULL;
--> statement-breakpoint
-- Device search rows exist only for devices not in the trash. The search index finds a row by device_id only by
-- reading every row, so the triggers touch it only when the device had a row: a device coming out of the trash
-- (or out of a job's sight) gets one, a device deleted from the trash never had one.
DROP TRIGGER `device_search_au`;--> statement-breakpoint
CREATE TRIGGER `device_search_au` AFTER UPDATE OF tag, name, maker, model, serial_number, machine_id, deleted_at ON `device` WHEN old.deleted_at IS NULL BEGIN
  DELETE FROM device_search WHERE device_id = old.id;
  INSERT INTO device_search (device_id, team_id, tag, name, maker, model, serial_number, site_name, machine_name)
  SELECT new.id, new.team_id, new.tag, new.name, new.maker, new.model, new.serial_number, s.name, m.name
  FROM machine m JOIN site s ON s.id = m.site_id WHERE m.id = new.machine_id AND new.deleted_at IS NULL;
END;--> statement-breakpoint
CREATE TRIGGER `device_search_back_au` AFTER UPDATE OF deleted_at ON `device` WHEN old.deleted_at IS NOT NULL AND new.deleted_at IS NULL BEGIN
  INSERT INTO device_search (device_id, team_id, tag, name, maker, model, serial_number, site_name, machine_name)
  SELECT new.id, new.team_id, new.tag, new.name, new.maker, new.model, new.serial_number, s.name, m.name
  FROM machine m JOIN site s ON s.id = m.site_id WHERE m.id = new.machine_id;
END;--> statement-breakpoint
DROP TRIGGER `device_search_ad`;--> statement-breakpoint
CREATE TRIGGER `device_search_ad` AFTER DELETE ON `device` WHEN old.deleted_at IS NULL BEGIN
  DELETE FROM device_search WHERE device_id = old.id;
END;
