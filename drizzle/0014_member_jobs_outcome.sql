DROP INDEX `member_jobs_status_idx`;--> statement-breakpoint
ALTER TABLE `member_jobs` ADD `outcome` text;--> statement-breakpoint
CREATE INDEX `member_jobs_status_outcome_idx` ON `member_jobs` (`user_id`,`status`,`created_at`,`job_id`,`outcome`);