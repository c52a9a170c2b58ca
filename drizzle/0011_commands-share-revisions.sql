-- Commands join the one record engine: their trash stamp gains trash_id, and their history moves from
-- command_revision into the one revision table (entity_type 'command'), ids, times and snapshots unchanged.
ALTER TABLE `command` ADD `trash_id` text;--> statement-breakpoint
UPDATE `command` SET `trash_id` = `id` WHERE `deleted_at` IS NOT NULL;--> statement-breakpoint
INSERT INTO `revision` (`id`, `team_id`, `entity_type`, `entity_id`, `version`, `action`, `user_id`, `user_name`, `summary`, `changes`, `snapshot`, `created_at`)
SELECT `id`, `team_id`, 'command', `command_id`, `version`, `action`, `user_id`, `user_name`, `summary`, `changes`, `snapshot`, `created_at` FROM `command_revision`;--> statement-breakpoint
DROP TABLE `command_revision`;
