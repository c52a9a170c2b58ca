CREATE TABLE `job` (
	`id` text PRIMARY KEY NOT NULL,
	`team_id` text NOT NULL,
	`user_id` text,
	`user_name` text DEFAULT '' NOT NULL,
	`kind` text NOT NULL,
	`state` text NOT NULL,
	`done` integer DEFAULT 0 NOT NULL,
	`total` integer DEFAULT 0 NOT NULL,
	`message` text DEFAULT '' NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	`finished_at` integer,
	FOREIGN KEY (`team_id`) REFERENCES `team`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `job_team_idx` ON `job` (`team_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `job_state_idx` ON `job` (`state`,`updated_at`);--> statement-breakpoint
CREATE TABLE `job_row` (
	`job_id` text NOT NULL,
	`target` text NOT NULL,
	`seq` integer NOT NULL,
	`data` text NOT NULL,
	PRIMARY KEY(`job_id`, `target`, `seq`)
);
