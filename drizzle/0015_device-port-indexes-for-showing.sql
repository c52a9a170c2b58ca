-- `deleted_at` moves to the end of the device list indexes and out of the port index, so showing a long job's rows
-- (or trashing and restoring) moves their entries within a page instead of across the index.
DROP INDEX `device_team_tag_idx`;--> statement-breakpoint
DROP INDEX `device_team_updated_idx`;--> statement-breakpoint
DROP INDEX `device_machine_idx`;--> statement-breakpoint
CREATE INDEX `device_team_tag_idx` ON `device` (`team_id`,`tag`,`id`,`deleted_at`);--> statement-breakpoint
CREATE INDEX `device_team_updated_idx` ON `device` (`team_id`,`updated_at`,`id`,`deleted_at`);--> statement-breakpoint
CREATE INDEX `device_machine_idx` ON `device` (`machine_id`,`tag`,`id`,`deleted_at`);--> statement-breakpoint
DROP INDEX `port_device_idx`;--> statement-breakpoint
CREATE INDEX `port_device_idx` ON `port` (`device_id`,`position`);--> statement-breakpoint
-- A long job writes the search rows of its devices while it stages them (out of sight: searches read only live
-- devices), so showing them in the final transaction adds none; a device coming out of the trash still gets one.
DROP TRIGGER `device_search_back_au`;--> statement-breakpoint
CREATE TRIGGER `device_search_back_au` AFTER UPDATE OF deleted_at ON `device` WHEN old.deleted_at IS NOT NULL AND new.deleted_at IS NULL AND (old.trash_id IS NULL OR old.trash_id NOT LIKE 'job\_%' ESCAPE '\') BEGIN
  INSERT INTO device_search (device_id, team_id, tag, name, maker, model, serial_number, site_name, machine_name)
  SELECT new.id, new.team_id, new.tag, new.name, new.maker, new.model, new.serial_number, s.name, m.name
  FROM machine m JOIN site s ON s.id = m.site_id WHERE m.id = new.machine_id;
END;
