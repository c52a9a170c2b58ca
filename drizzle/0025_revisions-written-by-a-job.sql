ALTER TABLE `revision` ADD `job_id` text;--> statement-breakpoint
CREATE INDEX `revision_job_idx` ON `revision` (`job_id`) WHERE job_id IS NOT NULL;