CREATE TABLE `build_crew` (
	`build_id` integer NOT NULL,
	`user_id` integer NOT NULL,
	`company_id` integer NOT NULL,
	PRIMARY KEY(`build_id`, `user_id`),
	FOREIGN KEY (`build_id`) REFERENCES `builds`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `build_crew_user_idx` ON `build_crew` (`user_id`);--> statement-breakpoint
CREATE TABLE `builds` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`lead_id` integer NOT NULL,
	`status` text DEFAULT 'booked' NOT NULL,
	`dates_json` text NOT NULL,
	`first_day` text NOT NULL,
	`last_day` text NOT NULL,
	`sequence` integer DEFAULT 0 NOT NULL,
	`labour_hours` real NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`stage_before` text NOT NULL,
	`booked_by_user_id` integer,
	`cancelled_at` text,
	`cancel_reason` text,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`updated_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`lead_id`) REFERENCES `leads`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`booked_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `builds_company_days_idx` ON `builds` (`company_id`,`first_day`,`last_day`);--> statement-breakpoint
CREATE UNIQUE INDEX `builds_one_booked_per_lead` ON `builds` (`lead_id`) WHERE status = 'booked';--> statement-breakpoint
ALTER TABLE `companies` ADD `crew_size` integer DEFAULT 2 NOT NULL;--> statement-breakpoint
ALTER TABLE `companies` ADD `crew_day_hours` real DEFAULT 8 NOT NULL;--> statement-breakpoint
ALTER TABLE `companies` ADD `work_weekdays_json` text DEFAULT '[1,2,3,4,5]' NOT NULL;--> statement-breakpoint
ALTER TABLE `users` ADD `calendar_feed_token_hash` text;--> statement-breakpoint
CREATE UNIQUE INDEX `users_calendar_feed_unique` ON `users` (`calendar_feed_token_hash`);