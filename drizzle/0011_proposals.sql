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
ALTER TABLE `lead_photos` ADD `source` text DEFAULT 'homeowner' NOT NULL;