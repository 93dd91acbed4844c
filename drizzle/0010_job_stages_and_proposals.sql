CREATE TABLE `proposal_terms` (
	`company_id` integer PRIMARY KEY NOT NULL,
	`deposit_kind` text DEFAULT 'percent' NOT NULL,
	`deposit_basis_points` integer DEFAULT 3000 NOT NULL,
	`deposit_fixed_cents` integer DEFAULT 0 NOT NULL,
	`valid_days` integer DEFAULT 30 NOT NULL,
	`included_text` text NOT NULL,
	`excluded_text` text NOT NULL,
	`street_address` text DEFAULT '' NOT NULL,
	`licence_number` text DEFAULT '' NOT NULL,
	`narrow_access_in` real DEFAULT 36 NOT NULL,
	`narrow_access_allowance_cents` integer DEFAULT 0 NOT NULL,
	`steep_slope_allowance_cents` integer DEFAULT 0 NOT NULL,
	`updated_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `proposals` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`lead_id` integer NOT NULL,
	`kind` text NOT NULL,
	`parent_id` integer,
	`token` text NOT NULL,
	`revision_id` integer,
	`document_json` text NOT NULL,
	`design_json` text NOT NULL,
	`plan_json` text NOT NULL,
	`price_cents` integer NOT NULL,
	`status` text DEFAULT 'sent' NOT NULL,
	`expires_at` text NOT NULL,
	`sent_by_user_id` integer,
	`sent_at` text NOT NULL,
	`first_opened_at` text,
	`last_opened_at` text,
	`open_count` integer DEFAULT 0 NOT NULL,
	`withdrawn_at` text,
	`withdraw_reason` text,
	`signer_name` text,
	`signed_at` text,
	`signer_ip` text,
	`signer_user_agent` text,
	`chosen_add_ons_json` text,
	`total_cents` integer,
	`deposit_cents` integer,
	`accepted_pdf_sha256` text,
	`accepted_pdf` blob,
	`signed_pdf` blob,
	`checkout_session_id` text,
	`checkout_attempt` integer DEFAULT 0 NOT NULL,
	`payment_intent_id` text,
	`deposit_paid_at` text,
	`refund_reason` text,
	`refund_owed_at` text,
	`refund_id` text,
	`refunded_at` text,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`updated_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`lead_id`) REFERENCES `leads`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`revision_id`) REFERENCES `lead_revisions`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`sent_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `proposals_token_unique` ON `proposals` (`token`);--> statement-breakpoint
CREATE UNIQUE INDEX `proposals_checkout_session_id_unique` ON `proposals` (`checkout_session_id`);--> statement-breakpoint
CREATE INDEX `proposals_lead_idx` ON `proposals` (`lead_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `proposals_status_expires_idx` ON `proposals` (`status`,`expires_at`);--> statement-breakpoint
CREATE INDEX `proposals_refund_owed_idx` ON `proposals` (`refund_owed_at`,`refund_id`);--> statement-breakpoint
CREATE TABLE `site_visits` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`lead_id` integer NOT NULL,
	`visited_by_user_id` integer,
	`structure_ft` real NOT NULL,
	`property_line_ft` real NOT NULL,
	`branches_ft` real,
	`slope` text NOT NULL,
	`soil` text NOT NULL,
	`access_width_in` real NOT NULL,
	`utility_marks` text NOT NULL,
	`spoil` text NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`updated_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`lead_id`) REFERENCES `leads`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`visited_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `site_visits_lead_unique` ON `site_visits` (`lead_id`);--> statement-breakpoint
DROP INDEX "bookings_checkout_session_id_unique";--> statement-breakpoint
DROP INDEX "bookings_slot_taken_unique";--> statement-breakpoint
DROP INDEX "bookings_company_starts_idx";--> statement-breakpoint
DROP INDEX "bookings_lead_idx";--> statement-breakpoint
DROP INDEX "bookings_status_hold_idx";--> statement-breakpoint
DROP INDEX "bookings_refund_due_idx";--> statement-breakpoint
DROP INDEX "catalog_company_kind_idx";--> statement-breakpoint
DROP INDEX "companies_slug_unique";--> statement-breakpoint
DROP INDEX "consult_blocked_days_unique";--> statement-breakpoint
DROP INDEX "email_outbox_idempotency_key_unique";--> statement-breakpoint
DROP INDEX "email_outbox_due_idx";--> statement-breakpoint
DROP INDEX "email_outbox_company_status_idx";--> statement-breakpoint
DROP INDEX "lead_events_lead_idx";--> statement-breakpoint
DROP INDEX "lead_photos_stored_name_unique";--> statement-breakpoint
DROP INDEX "lead_photos_lead_idx";--> statement-breakpoint
DROP INDEX "lead_revisions_lead_idx";--> statement-breakpoint
DROP INDEX "leads_ref_unique";--> statement-breakpoint
DROP INDEX "leads_company_created_idx";--> statement-breakpoint
DROP INDEX "leads_company_status_created_idx";--> statement-breakpoint
DROP INDEX "leads_company_assignee_idx";--> statement-breakpoint
DROP INDEX "leads_company_email_idx";--> statement-breakpoint
DROP INDEX "leads_company_town_idx";--> statement-breakpoint
DROP INDEX "leads_homeowner_idx";--> statement-breakpoint
DROP INDEX "leads_company_crew_idx";--> statement-breakpoint
DROP INDEX "leads_company_name_idx";--> statement-breakpoint
DROP INDEX "leads_company_price_idx";--> statement-breakpoint
DROP INDEX "one_time_tokens_user_idx";--> statement-breakpoint
DROP INDEX "proposals_token_unique";--> statement-breakpoint
DROP INDEX "proposals_checkout_session_id_unique";--> statement-breakpoint
DROP INDEX "proposals_lead_idx";--> statement-breakpoint
DROP INDEX "proposals_status_expires_idx";--> statement-breakpoint
DROP INDEX "proposals_refund_owed_idx";--> statement-breakpoint
DROP INDEX "rate_limits_window_idx";--> statement-breakpoint
DROP INDEX "sessions_user_idx";--> statement-breakpoint
DROP INDEX "site_visits_lead_unique";--> statement-breakpoint
DROP INDEX "users_email_unique";--> statement-breakpoint
DROP INDEX "users_company_role_idx";--> statement-breakpoint
ALTER TABLE `leads` ALTER COLUMN "status" TO "status" text NOT NULL DEFAULT 'request';--> statement-breakpoint
CREATE UNIQUE INDEX `bookings_checkout_session_id_unique` ON `bookings` (`checkout_session_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `bookings_slot_taken_unique` ON `bookings` (`company_id`,`starts_at`) WHERE status in ('held', 'confirmed');--> statement-breakpoint
CREATE INDEX `bookings_company_starts_idx` ON `bookings` (`company_id`,`starts_at`);--> statement-breakpoint
CREATE INDEX `bookings_lead_idx` ON `bookings` (`lead_id`);--> statement-breakpoint
CREATE INDEX `bookings_status_hold_idx` ON `bookings` (`status`,`hold_expires_at`);--> statement-breakpoint
CREATE INDEX `bookings_refund_due_idx` ON `bookings` (`refund_next_at`) WHERE status = 'cancelled' and is_paid = 1 and refund_id is null and refund_failed_at is null;--> statement-breakpoint
CREATE INDEX `catalog_company_kind_idx` ON `catalog_items` (`company_id`,`kind`,`is_active`,`name`);--> statement-breakpoint
CREATE UNIQUE INDEX `companies_slug_unique` ON `companies` (`slug`);--> statement-breakpoint
CREATE UNIQUE INDEX `consult_blocked_days_unique` ON `consult_blocked_days` (`company_id`,`day`);--> statement-breakpoint
CREATE UNIQUE INDEX `email_outbox_idempotency_key_unique` ON `email_outbox` (`idempotency_key`);--> statement-breakpoint
CREATE INDEX `email_outbox_due_idx` ON `email_outbox` (`status`,`send_after`);--> statement-breakpoint
CREATE INDEX `email_outbox_company_status_idx` ON `email_outbox` (`company_id`,`status`);--> statement-breakpoint
CREATE INDEX `lead_events_lead_idx` ON `lead_events` (`lead_id`,`created_at`);--> statement-breakpoint
CREATE UNIQUE INDEX `lead_photos_stored_name_unique` ON `lead_photos` (`stored_name`);--> statement-breakpoint
CREATE INDEX `lead_photos_lead_idx` ON `lead_photos` (`lead_id`);--> statement-breakpoint
CREATE INDEX `lead_revisions_lead_idx` ON `lead_revisions` (`lead_id`,`created_at`);--> statement-breakpoint
CREATE UNIQUE INDEX `leads_ref_unique` ON `leads` (`ref`);--> statement-breakpoint
CREATE INDEX `leads_company_created_idx` ON `leads` (`company_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `leads_company_status_created_idx` ON `leads` (`company_id`,`status`,`created_at`);--> statement-breakpoint
CREATE INDEX `leads_company_assignee_idx` ON `leads` (`company_id`,`assigned_user_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `leads_company_email_idx` ON `leads` (`company_id`,`email`);--> statement-breakpoint
CREATE INDEX `leads_company_town_idx` ON `leads` (`company_id`,`town`);--> statement-breakpoint
CREATE INDEX `leads_homeowner_idx` ON `leads` (`homeowner_id`);--> statement-breakpoint
CREATE INDEX `leads_company_crew_idx` ON `leads` (`company_id`,`crew_user_id`);--> statement-breakpoint
CREATE INDEX `leads_company_name_idx` ON `leads` (`company_id`,`customer_name`);--> statement-breakpoint
CREATE INDEX `leads_company_price_idx` ON `leads` (`company_id`,`price_low_cents`);--> statement-breakpoint
CREATE INDEX `one_time_tokens_user_idx` ON `one_time_tokens` (`user_id`);--> statement-breakpoint
CREATE INDEX `rate_limits_window_idx` ON `rate_limits` (`window_ends_at`);--> statement-breakpoint
CREATE INDEX `sessions_user_idx` ON `sessions` (`user_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `users_email_unique` ON `users` (`email`);--> statement-breakpoint
CREATE INDEX `users_company_role_idx` ON `users` (`company_id`,`role`);--> statement-breakpoint
ALTER TABLE `leads` ADD `paused_stage` text;--> statement-breakpoint
ALTER TABLE `leads` ADD `called_back_at` text;--> statement-breakpoint
ALTER TABLE `lead_photos` ADD `source` text DEFAULT 'homeowner' NOT NULL;