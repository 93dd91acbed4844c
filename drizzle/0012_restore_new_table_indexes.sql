-- drizzle-kit's statements for the leads.status default (libSQL ALTER COLUMN) drop every index and
-- recreate them, but skip those of the tables created earlier in the same migration; recreate them.
CREATE UNIQUE INDEX IF NOT EXISTS `proposals_token_unique` ON `proposals` (`token`);--> statement-breakpoint
CREATE UNIQUE INDEX IF NOT EXISTS `proposals_checkout_session_id_unique` ON `proposals` (`checkout_session_id`);--> statement-breakpoint
CREATE INDEX IF NOT EXISTS `proposals_lead_idx` ON `proposals` (`lead_id`,`created_at`);--> statement-breakpoint
CREATE INDEX IF NOT EXISTS `proposals_status_expires_idx` ON `proposals` (`status`,`expires_at`);--> statement-breakpoint
CREATE INDEX IF NOT EXISTS `proposals_refund_owed_idx` ON `proposals` (`refund_owed_at`,`refund_id`);--> statement-breakpoint
CREATE UNIQUE INDEX IF NOT EXISTS `site_visits_lead_unique` ON `site_visits` (`lead_id`);
