ALTER TABLE `bookings` ADD `calendar_sequence` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `lead_revisions` ADD `sent_at` text;