ALTER TABLE `command` ADD `safe_to_repeat` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `command` ADD `sets_up_device` integer DEFAULT false NOT NULL;