CREATE TABLE `section_catalogues` (
	`id` text PRIMARY KEY NOT NULL,
	`name` text NOT NULL,
	`description` text,
	`file_name` text NOT NULL,
	`sha256` text NOT NULL,
	`section_count` integer NOT NULL,
	`families` text NOT NULL,
	`dimension_names` text NOT NULL,
	`sections` text NOT NULL,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`retired_at` integer,
	`retired_by` text,
	`retire_reason` text,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`retired_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `section_catalogues_created_idx` ON `section_catalogues` (`created_at`);