CREATE TABLE `field_proposal` (
	`id` text PRIMARY KEY NOT NULL,
	`team_id` text NOT NULL,
	`device_id` text NOT NULL,
	`entry_id` text NOT NULL,
	`kind` text NOT NULL,
	`serial_number` text DEFAULT '' NOT NULL,
	`firmware` text DEFAULT '' NOT NULL,
	`port_id` text,
	`port_name` text DEFAULT '' NOT NULL,
	`port_settings` text,
	`record_serial_number` text DEFAULT '' NOT NULL,
	`record_firmware` text DEFAULT '' NOT NULL,
	`record_version` integer NOT NULL,
	`record_port_settings` text,
	`status` text DEFAULT 'pending' NOT NULL,
	`decision_note` text DEFAULT '' NOT NULL,
	`decided_by` text,
	`decided_by_name` text DEFAULT '' NOT NULL,
	`decided_at` integer,
	`accepted_version` integer,
	`accepted_port_version` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`team_id`) REFERENCES `team`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`device_id`) REFERENCES `device`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`entry_id`) REFERENCES `field_log_entry`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`port_id`) REFERENCES `port`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`decided_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `field_proposal_entry_id_unique` ON `field_proposal` (`entry_id`);--> statement-breakpoint
CREATE INDEX `proposal_team_status_idx` ON `field_proposal` (`team_id`,`status`,`created_at`);--> statement-breakpoint
CREATE INDEX `proposal_device_idx` ON `field_proposal` (`device_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `proposal_port_idx` ON `field_proposal` (`port_id`);--> statement-breakpoint
ALTER TABLE `device` ADD `former_serials` text DEFAULT '[]' NOT NULL;