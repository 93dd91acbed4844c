CREATE TABLE `supplier_order_drops` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`order_id` integer NOT NULL,
	`lead_id` integer NOT NULL,
	`requested_on` text NOT NULL,
	`site_address` text NOT NULL,
	`access_notes` text DEFAULT '' NOT NULL,
	`lines_json` text NOT NULL,
	`weight_lb` real NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`order_id`) REFERENCES `supplier_orders`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`lead_id`) REFERENCES `leads`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `supplier_order_drops_order_idx` ON `supplier_order_drops` (`order_id`);--> statement-breakpoint
CREATE INDEX `supplier_order_drops_lead_idx` ON `supplier_order_drops` (`lead_id`);--> statement-breakpoint
CREATE TABLE `supplier_orders` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`supplier_id` integer NOT NULL,
	`status` text DEFAULT 'drafted' NOT NULL,
	`combined_into_id` integer,
	`created_by_user_id` integer,
	`sent_at` text,
	`confirmed_at` text,
	`confirmation_note` text,
	`delivered_at` text,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`updated_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`supplier_id`) REFERENCES `suppliers`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `supplier_orders_company_status_idx` ON `supplier_orders` (`company_id`,`status`,`supplier_id`);--> statement-breakpoint
CREATE TABLE `suppliers` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`company_id` integer NOT NULL,
	`name` text NOT NULL,
	`email` text NOT NULL,
	`phone` text DEFAULT '' NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`updated_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `suppliers_company_name_unique` ON `suppliers` (`company_id`,`name`);--> statement-breakpoint
ALTER TABLE `catalog_items` ADD `supplier_id` integer REFERENCES suppliers(id);--> statement-breakpoint
ALTER TABLE `catalog_items` ADD `order_unit` text DEFAULT 'each' NOT NULL;--> statement-breakpoint
ALTER TABLE `catalog_items` ADD `units_per_order_unit` real DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE `catalog_items` ADD `order_unit_weight_lb` real;