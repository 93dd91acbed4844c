CREATE TABLE `job_extras` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`lead_id` integer NOT NULL,
	`catalog_item_id` integer,
	`description` text NOT NULL,
	`quantity` real NOT NULL,
	`cost_cents` integer NOT NULL,
	`client_id` text NOT NULL,
	`recorded_by_user_id` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`lead_id`) REFERENCES `leads`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`catalog_item_id`) REFERENCES `catalog_items`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`recorded_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `job_extras_client_id_unique` ON `job_extras` (`client_id`);--> statement-breakpoint
CREATE INDEX `job_extras_lead_idx` ON `job_extras` (`lead_id`);--> statement-breakpoint
CREATE TABLE `job_hours` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`lead_id` integer NOT NULL,
	`worker_user_id` integer NOT NULL,
	`day` text NOT NULL,
	`hours` real NOT NULL,
	`client_id` text NOT NULL,
	`recorded_by_user_id` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`updated_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`lead_id`) REFERENCES `leads`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`worker_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`recorded_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `job_hours_lead_worker_day_idx` ON `job_hours` (`lead_id`,`worker_user_id`,`day`);--> statement-breakpoint
CREATE INDEX `job_hours_company_day_idx` ON `job_hours` (`company_id`,`day`);--> statement-breakpoint
CREATE TABLE `job_step_ticks` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`lead_id` integer NOT NULL,
	`step_key` text NOT NULL,
	`done` integer NOT NULL,
	`changed_at` text NOT NULL,
	`client_id` text NOT NULL,
	`by_user_id` integer,
	`updated_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`lead_id`) REFERENCES `leads`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `job_step_ticks_lead_step_idx` ON `job_step_ticks` (`lead_id`,`step_key`);