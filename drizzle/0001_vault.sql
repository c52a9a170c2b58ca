CREATE TABLE `device` (
	`id` text PRIMARY KEY NOT NULL,
	`team_id` text NOT NULL,
	`machine_id` text NOT NULL,
	`profile_id` text,
	`tag` text NOT NULL,
	`name` text DEFAULT '' NOT NULL,
	`role` text DEFAULT 'other' NOT NULL,
	`maker` text DEFAULT '' NOT NULL,
	`model` text DEFAULT '' NOT NULL,
	`serial_number` text DEFAULT '' NOT NULL,
	`firmware` text DEFAULT '' NOT NULL,
	`location` text DEFAULT '' NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	`updated_by` text,
	`deleted_at` integer,
	`deleted_by` text,
	`trash_id` text,
	FOREIGN KEY (`team_id`) REFERENCES `team`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`machine_id`) REFERENCES `machine`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`profile_id`) REFERENCES `device_profile`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`updated_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`deleted_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `device_team_tag_idx` ON `device` (`team_id`,`deleted_at`,`tag`);--> statement-breakpoint
CREATE INDEX `device_team_updated_idx` ON `device` (`team_id`,`deleted_at`,`updated_at`);--> statement-breakpoint
CREATE INDEX `device_machine_idx` ON `device` (`machine_id`,`deleted_at`,`tag`);--> statement-breakpoint
CREATE TABLE `device_profile` (
	`id` text PRIMARY KEY NOT NULL,
	`team_id` text NOT NULL,
	`name` text NOT NULL,
	`role` text DEFAULT 'other' NOT NULL,
	`maker` text DEFAULT '' NOT NULL,
	`model` text DEFAULT '' NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`ports` text NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	`updated_by` text,
	`deleted_at` integer,
	`deleted_by` text,
	`trash_id` text,
	FOREIGN KEY (`team_id`) REFERENCES `team`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`updated_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`deleted_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `profile_team_idx` ON `device_profile` (`team_id`,`deleted_at`,`name`);--> statement-breakpoint
CREATE TABLE `link` (
	`id` text PRIMARY KEY NOT NULL,
	`team_id` text NOT NULL,
	`machine_id` text NOT NULL,
	`name` text NOT NULL,
	`kind` text NOT NULL,
	`cable_type` text DEFAULT '' NOT NULL,
	`cable_length_m` real,
	`notes` text DEFAULT '' NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	`updated_by` text,
	`deleted_at` integer,
	`deleted_by` text,
	`trash_id` text,
	FOREIGN KEY (`team_id`) REFERENCES `team`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`machine_id`) REFERENCES `machine`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`updated_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`deleted_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `link_machine_idx` ON `link` (`machine_id`,`deleted_at`,`name`);--> statement-breakpoint
CREATE INDEX `link_team_idx` ON `link` (`team_id`,`deleted_at`,`name`);--> statement-breakpoint
CREATE TABLE `link_member` (
	`link_id` text NOT NULL,
	`port_id` text NOT NULL,
	`team_id` text NOT NULL,
	`role` text NOT NULL,
	`position` integer DEFAULT 0 NOT NULL,
	`is_end` integer,
	`unit_loads` real,
	PRIMARY KEY(`link_id`, `port_id`),
	FOREIGN KEY (`link_id`) REFERENCES `link`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`port_id`) REFERENCES `port`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`team_id`) REFERENCES `team`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `link_member_port_idx` ON `link_member` (`port_id`);--> statement-breakpoint
CREATE TABLE `machine` (
	`id` text PRIMARY KEY NOT NULL,
	`team_id` text NOT NULL,
	`site_id` text NOT NULL,
	`name` text NOT NULL,
	`code` text DEFAULT '' NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	`updated_by` text,
	`deleted_at` integer,
	`deleted_by` text,
	`trash_id` text,
	FOREIGN KEY (`team_id`) REFERENCES `team`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`site_id`) REFERENCES `site`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`updated_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`deleted_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `machine_site_idx` ON `machine` (`site_id`,`deleted_at`,`name`);--> statement-breakpoint
CREATE INDEX `machine_team_idx` ON `machine` (`team_id`,`deleted_at`,`name`);--> statement-breakpoint
CREATE TABLE `port` (
	`id` text PRIMARY KEY NOT NULL,
	`team_id` text NOT NULL,
	`device_id` text NOT NULL,
	`name` text NOT NULL,
	`position` integer DEFAULT 0 NOT NULL,
	`settings` text NOT NULL,
	`wiring` text NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	`updated_by` text,
	`deleted_at` integer,
	`deleted_by` text,
	`trash_id` text,
	FOREIGN KEY (`team_id`) REFERENCES `team`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`device_id`) REFERENCES `device`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`updated_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`deleted_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `port_device_idx` ON `port` (`device_id`,`deleted_at`,`position`);--> statement-breakpoint
CREATE UNIQUE INDEX `port_device_name_uq` ON `port` (`device_id`,`name`) WHERE deleted_at IS NULL;--> statement-breakpoint
CREATE TABLE `revision` (
	`id` text PRIMARY KEY NOT NULL,
	`team_id` text NOT NULL,
	`entity_type` text NOT NULL,
	`entity_id` text NOT NULL,
	`version` integer NOT NULL,
	`action` text NOT NULL,
	`user_id` text,
	`user_name` text DEFAULT '' NOT NULL,
	`summary` text DEFAULT '' NOT NULL,
	`changes` text NOT NULL,
	`snapshot` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`team_id`) REFERENCES `team`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `revision_entity_idx` ON `revision` (`team_id`,`entity_id`,`version`);--> statement-breakpoint
CREATE INDEX `revision_team_idx` ON `revision` (`team_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `site` (
	`id` text PRIMARY KEY NOT NULL,
	`team_id` text NOT NULL,
	`name` text NOT NULL,
	`customer` text DEFAULT '' NOT NULL,
	`address` text DEFAULT '' NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	`updated_by` text,
	`deleted_at` integer,
	`deleted_by` text,
	`trash_id` text,
	FOREIGN KEY (`team_id`) REFERENCES `team`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`updated_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`deleted_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `site_team_idx` ON `site` (`team_id`,`deleted_at`,`name`);