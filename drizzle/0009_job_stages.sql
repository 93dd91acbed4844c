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
DROP INDEX "rate_limits_window_idx";--> statement-breakpoint
DROP INDEX "sessions_user_idx";--> statement-breakpoint
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
ALTER TABLE `leads` ADD `called_back_at` text;