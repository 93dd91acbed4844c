CREATE TABLE `bookings` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`lead_id` integer NOT NULL,
	`homeowner_id` integer,
	`starts_at` text NOT NULL,
	`ends_at` text NOT NULL,
	`status` text DEFAULT 'held' NOT NULL,
	`hold_expires_at` text NOT NULL,
	`amount_cents` integer NOT NULL,
	`checkout_session_id` text,
	`payment_intent_id` text,
	`is_paid` integer DEFAULT false NOT NULL,
	`refund_id` text,
	`refunded_at` text,
	`cancelled_by` text,
	`cancel_reason` text,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`updated_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`lead_id`) REFERENCES `leads`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`homeowner_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `bookings_checkout_session_id_unique` ON `bookings` (`checkout_session_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `bookings_slot_taken_unique` ON `bookings` (`company_id`,`starts_at`) WHERE status in ('held', 'confirmed');--> statement-breakpoint
CREATE INDEX `bookings_company_starts_idx` ON `bookings` (`company_id`,`starts_at`);--> statement-breakpoint
CREATE INDEX `bookings_lead_idx` ON `bookings` (`lead_id`);--> statement-breakpoint
CREATE INDEX `bookings_status_hold_idx` ON `bookings` (`status`,`hold_expires_at`);--> statement-breakpoint
CREATE TABLE `consult_blocked_days` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`day` text NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `consult_blocked_days_unique` ON `consult_blocked_days` (`company_id`,`day`);--> statement-breakpoint
CREATE TABLE `lead_revisions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`lead_id` integer NOT NULL,
	`author_user_id` integer NOT NULL,
	`design_json` text NOT NULL,
	`plan_json` text NOT NULL,
	`price_low_cents` integer,
	`price_high_cents` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`lead_id`) REFERENCES `leads`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`author_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `lead_revisions_lead_idx` ON `lead_revisions` (`lead_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `payment_events` (
	`id` text PRIMARY KEY NOT NULL,
	`type` text NOT NULL,
	`booking_id` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`booking_id`) REFERENCES `bookings`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
ALTER TABLE `companies` ADD `consult_hours_json` text DEFAULT '{"1":[[540,1020]],"2":[[540,1020]],"3":[[540,1020]],"4":[[540,1020]],"5":[[540,960]]}' NOT NULL;--> statement-breakpoint
ALTER TABLE `companies` ADD `consult_slot_minutes` integer DEFAULT 60 NOT NULL;--> statement-breakpoint
ALTER TABLE `companies` ADD `consult_horizon_days` integer DEFAULT 21 NOT NULL;--> statement-breakpoint
ALTER TABLE `leads` ADD `crew_user_id` integer REFERENCES users(id);--> statement-breakpoint
CREATE INDEX `leads_company_crew_idx` ON `leads` (`company_id`,`crew_user_id`);--> statement-breakpoint
CREATE INDEX `leads_company_name_idx` ON `leads` (`company_id`,`customer_name`);--> statement-breakpoint
CREATE INDEX `leads_company_price_idx` ON `leads` (`company_id`,`price_low_cents`);--> statement-breakpoint
ALTER TABLE `users` ADD `inbox_seen_at` text;