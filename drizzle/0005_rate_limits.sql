CREATE TABLE `rate_limits` (
	`key` text PRIMARY KEY NOT NULL,
	`points` integer NOT NULL,
	`window_ends_at` integer NOT NULL
);
--> statement-breakpoint
CREATE INDEX `rate_limits_window_idx` ON `rate_limits` (`window_ends_at`);