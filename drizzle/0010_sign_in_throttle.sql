CREATE TABLE `sign_in_throttle` (
	`key` text PRIMARY KEY NOT NULL,
	`points` integer NOT NULL,
	`expire` integer
);
