DROP INDEX `device_team_tag_idx`;--> statement-breakpoint
DROP INDEX `device_team_updated_idx`;--> statement-breakpoint
DROP INDEX `device_machine_idx`;--> statement-breakpoint
CREATE INDEX `device_team_tag_idx` ON `device` (`team_id`,`deleted_at`,`tag`,`id`);--> statement-breakpoint
CREATE INDEX `device_team_updated_idx` ON `device` (`team_id`,`deleted_at`,`updated_at`,`id`);--> statement-breakpoint
CREATE INDEX `device_machine_idx` ON `device` (`machine_id`,`deleted_at`,`tag`,`id`);