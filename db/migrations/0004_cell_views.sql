CREATE TABLE `cell_view_stats` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`view_id` integer NOT NULL,
	`make` text NOT NULL,
	`model` text NOT NULL,
	`generation_id` integer,
	`cohort_label` text NOT NULL,
	`band_index` integer NOT NULL,
	`band_from_mi` real NOT NULL,
	`band_to_mi` real NOT NULL,
	`fault_key` text NOT NULL,
	`dtc` text,
	`component_id` integer,
	`events` integer NOT NULL,
	`exposure_mi` real NOT NULL,
	`vehicles_at_risk` integer NOT NULL,
	`vehicles_affected` integer NOT NULL,
	`rate_per_10k` real,
	`rate_lower` real,
	`rate_upper` real,
	`share_affected` real,
	`share_lower` real,
	`share_upper` real,
	`rate_ratio` real,
	`ratio_lower` real,
	`ratio_upper` real,
	`p_value` real,
	`q_value` real,
	`shrunk_rate_per_10k` real,
	`is_signal` integer DEFAULT false NOT NULL,
	`has_too_little_data` integer DEFAULT false NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`view_id`) REFERENCES `cell_views`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`generation_id`) REFERENCES `generations`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`component_id`) REFERENCES `components`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `cell_view_stats_view_rank` ON `cell_view_stats` (`view_id`,`ratio_lower`);--> statement-breakpoint
CREATE TABLE `cell_views` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`run_id` integer NOT NULL,
	`view_key` text NOT NULL,
	`cells` integer NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`run_id`) REFERENCES `analysis_runs`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `cell_views_org_run_key` ON `cell_views` (`organisation_id`,`run_id`,`view_key`);