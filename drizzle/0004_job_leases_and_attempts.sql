CREATE TABLE `job_leases` (
	`name` text PRIMARY KEY NOT NULL,
	`lease_owner` text,
	`lease_expires_at` text,
	`next_run_at` text NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`last_error` text,
	`last_run_at` text
);
--> statement-breakpoint
ALTER TABLE `bookings` ADD `currency` text DEFAULT 'usd' NOT NULL;--> statement-breakpoint
ALTER TABLE `bookings` ADD `refund_attempts` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `bookings` ADD `refund_next_at` text;--> statement-breakpoint
ALTER TABLE `bookings` ADD `refund_last_error` text;--> statement-breakpoint
ALTER TABLE `bookings` ADD `refund_failed_at` text;--> statement-breakpoint
ALTER TABLE `bookings` ADD `refund_lease_owner` text;--> statement-breakpoint
ALTER TABLE `bookings` ADD `refund_lease_expires_at` text;--> statement-breakpoint
CREATE INDEX `bookings_refund_due_idx` ON `bookings` (`refund_next_at`) WHERE status = 'cancelled' and is_paid = 1 and refund_id is null and refund_failed_at is null;--> statement-breakpoint
ALTER TABLE `email_outbox` ADD `lease_owner` text;--> statement-breakpoint
ALTER TABLE `email_outbox` ADD `lease_expires_at` text;--> statement-breakpoint
CREATE INDEX `email_outbox_company_status_idx` ON `email_outbox` (`company_id`,`status`);