CREATE INDEX `jobs_created_id_idx` ON `jobs` (`created_at`,`id`);--> statement-breakpoint
CREATE INDEX `jobs_status_created_id_idx` ON `jobs` (`status`,`created_at`,`id`);