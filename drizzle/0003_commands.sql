CREATE TABLE `command` (
	`id` text PRIMARY KEY NOT NULL,
	`team_id` text NOT NULL,
	`device_id` text,
	`profile_id` text,
	`name` text NOT NULL,
	`purpose` text DEFAULT '' NOT NULL,
	`template` text NOT NULL,
	`field_values` text NOT NULL,
	`reply_template` text,
	`port_name` text DEFAULT '' NOT NULL,
	`raw_units` text NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`moves_machinery` integer DEFAULT false NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	`updated_by` text,
	`deleted_at` integer,
	`deleted_by` text,
	FOREIGN KEY (`team_id`) REFERENCES `team`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`device_id`) REFERENCES `device`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`profile_id`) REFERENCES `device_profile`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`updated_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`deleted_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "command_one_owner" CHECK(("command"."device_id" IS NULL) <> ("command"."profile_id" IS NULL))
);
--> statement-breakpoint
CREATE INDEX `command_device_idx` ON `command` (`device_id`,`deleted_at`,`name`);--> statement-breakpoint
CREATE INDEX `command_profile_idx` ON `command` (`profile_id`,`deleted_at`,`name`);--> statement-breakpoint
CREATE INDEX `command_team_idx` ON `command` (`team_id`,`deleted_at`);--> statement-breakpoint
CREATE TABLE `command_revision` (
	`id` text PRIMARY KEY NOT NULL,
	`team_id` text NOT NULL,
	`command_id` text NOT NULL,
	`version` integer NOT NULL,
	`action` text NOT NULL,
	`user_id` text,
	`user_name` text DEFAULT '' NOT NULL,
	`summary` text DEFAULT '' NOT NULL,
	`changes` text NOT NULL,
	`snapshot` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`team_id`) REFERENCES `team`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`command_id`) REFERENCES `command`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `command_revision_idx` ON `command_revision` (`team_id`,`command_id`,`version`);