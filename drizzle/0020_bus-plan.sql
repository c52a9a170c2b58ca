ALTER TABLE `link` ADD `bus_plan` text;--> statement-breakpoint
ALTER TABLE `link_member` ADD `drop_m` real;--> statement-breakpoint
ALTER TABLE `link_member` ADD `tap_ports` integer;