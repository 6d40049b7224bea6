CREATE TABLE `campaign_vehicles` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`campaign_id` integer NOT NULL,
	`vehicle_id` integer NOT NULL,
	`done_at` text,
	`done_by` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`campaign_id`) REFERENCES `campaigns`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`vehicle_id`) REFERENCES `vehicles`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`done_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `campaign_vehicles_unique` ON `campaign_vehicles` (`campaign_id`,`vehicle_id`);--> statement-breakpoint
CREATE INDEX `campaign_vehicles_vehicle` ON `campaign_vehicles` (`vehicle_id`);--> statement-breakpoint
CREATE INDEX `campaign_vehicles_org` ON `campaign_vehicles` (`organisation_id`);--> statement-breakpoint
CREATE TABLE `campaigns` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`name` text NOT NULL,
	`note` text,
	`known_issue_id` integer,
	`created_by` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`known_issue_id`) REFERENCES `known_issues`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `campaigns_org_name` ON `campaigns` (`organisation_id`,`name`);--> statement-breakpoint
ALTER TABLE `memberships` ADD `wants_digest` integer DEFAULT false NOT NULL;