ALTER TABLE `proposals` ADD `refund_attempts` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `proposals` ADD `refund_next_at` text;--> statement-breakpoint
ALTER TABLE `proposals` ADD `refund_last_error` text;--> statement-breakpoint
ALTER TABLE `proposals` ADD `refund_failed_at` text;--> statement-breakpoint
ALTER TABLE `proposals` ADD `refund_lease_owner` text;--> statement-breakpoint
ALTER TABLE `proposals` ADD `refund_lease_expires_at` text;--> statement-breakpoint
CREATE INDEX `proposals_refund_due_idx` ON `proposals` (`refund_next_at`) WHERE refund_owed_at is not null and refund_id is null and refund_failed_at is null;