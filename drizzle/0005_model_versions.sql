CREATE TABLE `model_versions` (
	`id` text PRIMARY KEY NOT NULL,
	`model_id` text NOT NULL,
	`version` integer NOT NULL,
	`name` text NOT NULL,
	`file_name` text NOT NULL,
	`file_key` text NOT NULL,
	`sha256` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`dimension` integer NOT NULL,
	`node_count` integer NOT NULL,
	`member_count` integer NOT NULL,
	`has_design` integer NOT NULL,
	`summary` text NOT NULL,
	`warnings` text NOT NULL,
	`note` text,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`model_id`) REFERENCES `models`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `model_versions_model_version_idx` ON `model_versions` (`model_id`,`version`);--> statement-breakpoint
CREATE INDEX `model_versions_model_idx` ON `model_versions` (`model_id`);--> statement-breakpoint
ALTER TABLE `jobs` ADD `kind` text DEFAULT 'design' NOT NULL;--> statement-breakpoint
ALTER TABLE `jobs` ADD `model_version` integer;