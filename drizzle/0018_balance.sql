CREATE TABLE `job_balances` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`lead_id` integer NOT NULL,
	`proposal_id` integer NOT NULL,
	`proposal_price_cents` integer NOT NULL,
	`add_ons_cents` integer NOT NULL,
	`change_orders_cents` integer NOT NULL,
	`deposit_cents` integer NOT NULL,
	`amount_cents` integer NOT NULL,
	`opened_at` text NOT NULL,
	`checkout_session_id` text,
	`checkout_attempt` integer DEFAULT 0 NOT NULL,
	`payment_intent_id` text,
	`paid_at` text,
	`refund_payment_intent_id` text,
	`refund_reason` text,
	`refund_owed_at` text,
	`refund_id` text,
	`refunded_at` text,
	`refund_attempts` integer DEFAULT 0 NOT NULL,
	`refund_next_at` text,
	`refund_last_error` text,
	`refund_failed_at` text,
	`refund_lease_owner` text,
	`refund_lease_expires_at` text,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`updated_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`lead_id`) REFERENCES `leads`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`proposal_id`) REFERENCES `proposals`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `job_balances_checkout_session_id_unique` ON `job_balances` (`checkout_session_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `job_balances_lead_unique` ON `job_balances` (`lead_id`);--> statement-breakpoint
CREATE INDEX `job_balances_company_opened_idx` ON `job_balances` (`company_id`,`opened_at`);--> statement-breakpoint
CREATE INDEX `job_balances_refund_due_idx` ON `job_balances` (`refund_next_at`) WHERE refund_owed_at is not null and refund_id is null and refund_failed_at is null;