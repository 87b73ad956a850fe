CREATE TABLE `member_jobs` (
	`user_id` text NOT NULL,
	`job_id` text NOT NULL,
	`project_id` text NOT NULL,
	`status` text NOT NULL,
	`created_at` integer NOT NULL,
	PRIMARY KEY(`user_id`, `created_at`, `job_id`)
);
--> statement-breakpoint
CREATE INDEX `member_jobs_status_idx` ON `member_jobs` (`user_id`,`status`,`created_at`,`job_id`);--> statement-breakpoint
CREATE INDEX `member_jobs_job_idx` ON `member_jobs` (`job_id`);