ALTER TABLE `share_link` ADD `parent_id` text;--> statement-breakpoint
CREATE INDEX `share_parent_idx` ON `share_link` (`parent_id`);--> statement-breakpoint
-- Copies e-mailed before copies were linked: the copy's label is its parent's label followed by
-- " (e-mailed to …)" (or "E-mailed to …" for an unlabelled parent), with the same cards and expiry.
UPDATE `share_link` SET `parent_id` = (
  SELECT p.`id` FROM `share_link` p
  WHERE p.`team_id` = `share_link`.`team_id` AND p.`scope_type` = `share_link`.`scope_type` AND p.`scope_id` = `share_link`.`scope_id`
    AND p.`expires_at` = `share_link`.`expires_at` AND p.`created_at` <= `share_link`.`created_at` AND p.`id` <> `share_link`.`id`
    AND ((p.`label` = '' AND `share_link`.`label` LIKE 'E-mailed to %')
      OR substr(`share_link`.`label`, 1, length(p.`label`) + 14) = p.`label` || ' (e-mailed to ')
  ORDER BY length(p.`label`) DESC, p.`created_at` DESC LIMIT 1)
WHERE `parent_id` IS NULL AND (`label` LIKE 'E-mailed to %' OR `label` LIKE '% (e-mailed to %)');--> statement-breakpoint
-- Copies of links revoked before now end with them.
WITH RECURSIVE gone(`id`, `revoked_at`) AS (
  SELECT `id`, `revoked_at` FROM `share_link` WHERE `revoked_at` IS NOT NULL
  UNION SELECT c.`id`, gone.`revoked_at` FROM `share_link` c JOIN gone ON c.`parent_id` = gone.`id`
)
UPDATE `share_link` SET `revoked_at` = (SELECT min(gone.`revoked_at`) FROM gone WHERE gone.`id` = `share_link`.`id`)
WHERE `revoked_at` IS NULL AND `id` IN (SELECT `id` FROM gone);
