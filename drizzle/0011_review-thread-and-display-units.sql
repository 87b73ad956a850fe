CREATE TABLE `user_preferences` (
	`user_id` text PRIMARY KEY NOT NULL,
	`display_units` text DEFAULT 'model' NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
ALTER TABLE `jobs` ADD `answers_job_id` text;--> statement-breakpoint
CREATE INDEX `jobs_answers_idx` ON `jobs` (`answers_job_id`);