ALTER TABLE `field_log_entry` ADD `done_at` integer;--> statement-breakpoint
ALTER TABLE `field_log_entry` ADD `client_key` text;--> statement-breakpoint
CREATE UNIQUE INDEX `field_log_client_key_idx` ON `field_log_entry` (`team_id`,`client_key`);