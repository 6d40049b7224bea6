CREATE TABLE `invitations` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`email` text NOT NULL,
	`role` text NOT NULL,
	`token_hash` text NOT NULL,
	`invited_by` integer,
	`expires_at` text NOT NULL,
	`accepted_at` text,
	`revoked_at` text,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`invited_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `invitations_token_hash_unique` ON `invitations` (`token_hash`);--> statement-breakpoint
CREATE INDEX `invitations_org` ON `invitations` (`organisation_id`,`email`);--> statement-breakpoint
CREATE TABLE `memberships` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`user_id` integer NOT NULL,
	`role` text NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `memberships_org_user` ON `memberships` (`organisation_id`,`user_id`);--> statement-breakpoint
CREATE INDEX `memberships_user` ON `memberships` (`user_id`);--> statement-breakpoint
CREATE TABLE `organisations` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`slug` text NOT NULL,
	`name` text NOT NULL,
	`kind` text DEFAULT 'fleet' NOT NULL,
	`distance_unit` text DEFAULT 'mi' NOT NULL,
	`band_width` integer DEFAULT 25000 NOT NULL,
	`comeback_days` integer DEFAULT 30 NOT NULL,
	`comeback_distance` integer DEFAULT 3000 NOT NULL,
	`refuel_window` integer DEFAULT 20 NOT NULL,
	`confidence_level` real DEFAULT 0.95 NOT NULL,
	`min_exposure` integer DEFAULT 20000 NOT NULL,
	`upload_limit_mb` integer DEFAULT 200 NOT NULL,
	`is_demo` integer DEFAULT false NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `organisations_slug_unique` ON `organisations` (`slug`);--> statement-breakpoint
CREATE TABLE `users` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`email` text NOT NULL,
	`name` text NOT NULL,
	`password_hash` text NOT NULL,
	`digest_opt_in` integer DEFAULT false NOT NULL,
	`disabled_at` text,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `users_email_unique` ON `users` (`email`);--> statement-breakpoint
CREATE TABLE `component_aliases` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`alias` text NOT NULL,
	`component_id` integer NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`component_id`) REFERENCES `components`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `component_aliases_org_alias` ON `component_aliases` (`organisation_id`,`alias`);--> statement-breakpoint
CREATE TABLE `components` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`slug` text NOT NULL,
	`system` text NOT NULL,
	`name` text NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `components_slug_unique` ON `components` (`slug`);--> statement-breakpoint
CREATE UNIQUE INDEX `components_system_name` ON `components` (`system`,`name`);--> statement-breakpoint
CREATE TABLE `dtc_codes` (
	`code` text PRIMARY KEY NOT NULL,
	`description` text NOT NULL,
	`area` text NOT NULL,
	`is_generic` integer NOT NULL,
	`component_id` integer,
	FOREIGN KEY (`component_id`) REFERENCES `components`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `generations` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`make` text NOT NULL,
	`model` text NOT NULL,
	`label` text NOT NULL,
	`year_from` integer NOT NULL,
	`year_to` integer NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `generations_org_label` ON `generations` (`organisation_id`,`make`,`model`,`label`);--> statement-breakpoint
CREATE INDEX `generations_org_model` ON `generations` (`organisation_id`,`make`,`model`);--> statement-breakpoint
CREATE TABLE `vehicles` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`vin` text,
	`unit_number` text,
	`make` text NOT NULL,
	`model` text NOT NULL,
	`model_year` integer NOT NULL,
	`engine` text,
	`transmission` text,
	`in_service_date` text,
	`odometer_unit` text DEFAULT 'mi' NOT NULL,
	`last_odometer_mi` real,
	`last_odometer_on` text,
	`generation_id` integer,
	`import_id` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`generation_id`) REFERENCES `generations`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `vehicles_org_vin` ON `vehicles` (`organisation_id`,`vin`) WHERE vin is not null;--> statement-breakpoint
CREATE UNIQUE INDEX `vehicles_org_unit` ON `vehicles` (`organisation_id`,`unit_number`) WHERE unit_number is not null;--> statement-breakpoint
CREATE INDEX `vehicles_org_cohort` ON `vehicles` (`organisation_id`,`make`,`model`,`model_year`);--> statement-breakpoint
CREATE INDEX `vehicles_org_generation` ON `vehicles` (`organisation_id`,`generation_id`);--> statement-breakpoint
CREATE TABLE `fault_events` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`vehicle_id` integer NOT NULL,
	`occurred_at` text NOT NULL,
	`odometer_mi` real,
	`dtc` text NOT NULL,
	`mil_on` integer DEFAULT false NOT NULL,
	`status` text DEFAULT 'confirmed' NOT NULL,
	`import_id` integer,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`vehicle_id`) REFERENCES `vehicles`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `fault_events_vehicle` ON `fault_events` (`vehicle_id`,`occurred_at`);--> statement-breakpoint
CREATE INDEX `fault_events_org_dtc` ON `fault_events` (`organisation_id`,`dtc`);--> statement-breakpoint
CREATE INDEX `fault_events_import` ON `fault_events` (`import_id`);--> statement-breakpoint
CREATE TABLE `fuel_transactions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`vehicle_id` integer NOT NULL,
	`filled_at` text NOT NULL,
	`odometer_mi` real,
	`volume_l` real,
	`price_total_cents` integer,
	`station` text,
	`import_id` integer,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`vehicle_id`) REFERENCES `vehicles`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `fuel_vehicle_odometer` ON `fuel_transactions` (`vehicle_id`,`odometer_mi`);--> statement-breakpoint
CREATE INDEX `fuel_vehicle_time` ON `fuel_transactions` (`vehicle_id`,`filled_at`);--> statement-breakpoint
CREATE INDEX `fuel_import` ON `fuel_transactions` (`import_id`);--> statement-breakpoint
CREATE TABLE `repair_line_codes` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`repair_line_id` integer NOT NULL,
	`vehicle_id` integer NOT NULL,
	`dtc` text NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`repair_line_id`) REFERENCES `repair_lines`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `repair_line_codes_org_dtc` ON `repair_line_codes` (`organisation_id`,`dtc`);--> statement-breakpoint
CREATE INDEX `repair_line_codes_line` ON `repair_line_codes` (`repair_line_id`);--> statement-breakpoint
CREATE TABLE `repair_lines` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`repair_order_id` integer NOT NULL,
	`vehicle_id` integer NOT NULL,
	`line_no` integer DEFAULT 1 NOT NULL,
	`opened_on` text NOT NULL,
	`odometer_mi` real,
	`complaint` text,
	`cause` text,
	`correction` text,
	`dtc_codes` text,
	`component_id` integer,
	`symptom` text,
	`labor_hours` real,
	`parts_cost_cents` integer,
	`labor_cost_cents` integer,
	`part_numbers` text,
	`technician` text,
	`vendor` text,
	`is_warranty` integer DEFAULT false NOT NULL,
	`import_id` integer,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`repair_order_id`) REFERENCES `repair_orders`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`vehicle_id`) REFERENCES `vehicles`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`component_id`) REFERENCES `components`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `repair_lines_order` ON `repair_lines` (`repair_order_id`);--> statement-breakpoint
CREATE INDEX `repair_lines_vehicle` ON `repair_lines` (`vehicle_id`,`odometer_mi`);--> statement-breakpoint
CREATE INDEX `repair_lines_org_component` ON `repair_lines` (`organisation_id`,`component_id`);--> statement-breakpoint
CREATE INDEX `repair_lines_org_symptom` ON `repair_lines` (`organisation_id`,`symptom`);--> statement-breakpoint
CREATE INDEX `repair_lines_import` ON `repair_lines` (`import_id`);--> statement-breakpoint
CREATE TABLE `repair_orders` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`vehicle_id` integer NOT NULL,
	`ro_number` text NOT NULL,
	`opened_on` text NOT NULL,
	`closed_on` text,
	`odometer_mi` real,
	`vendor` text,
	`import_id` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`vehicle_id`) REFERENCES `vehicles`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `repair_orders_vehicle` ON `repair_orders` (`vehicle_id`,`opened_on`);--> statement-breakpoint
CREATE INDEX `repair_orders_org_number` ON `repair_orders` (`organisation_id`,`ro_number`);--> statement-breakpoint
CREATE INDEX `repair_orders_org_opened` ON `repair_orders` (`organisation_id`,`opened_on`);--> statement-breakpoint
CREATE INDEX `repair_orders_import` ON `repair_orders` (`import_id`);--> statement-breakpoint
CREATE TABLE `parts` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`part_number` text NOT NULL,
	`description` text NOT NULL,
	`component_id` integer,
	`on_hand` integer DEFAULT 0 NOT NULL,
	`unit_cost_cents` integer,
	`lead_time_days` integer,
	`import_id` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`component_id`) REFERENCES `components`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `parts_org_number` ON `parts` (`organisation_id`,`part_number`);--> statement-breakpoint
CREATE INDEX `parts_org_component` ON `parts` (`organisation_id`,`component_id`);--> statement-breakpoint
CREATE TABLE `known_issue_attachments` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`known_issue_id` integer NOT NULL,
	`file_name` text NOT NULL,
	`stored_path` text NOT NULL,
	`content_type` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`uploaded_by` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`known_issue_id`) REFERENCES `known_issues`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`uploaded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `known_issue_attachments_issue` ON `known_issue_attachments` (`known_issue_id`);--> statement-breakpoint
CREATE TABLE `known_issue_cautions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`known_issue_id` integer NOT NULL,
	`kind` text NOT NULL,
	`text` text,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`known_issue_id`) REFERENCES `known_issues`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `known_issue_cautions_issue` ON `known_issue_cautions` (`known_issue_id`);--> statement-breakpoint
CREATE TABLE `known_issue_checks` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`known_issue_id` integer NOT NULL,
	`position` integer NOT NULL,
	`text` text NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`known_issue_id`) REFERENCES `known_issues`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `known_issue_checks_order` ON `known_issue_checks` (`known_issue_id`,`position`);--> statement-breakpoint
CREATE TABLE `known_issue_cohorts` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`known_issue_id` integer NOT NULL,
	`make` text NOT NULL,
	`model` text NOT NULL,
	`generation_id` integer,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`known_issue_id`) REFERENCES `known_issues`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`generation_id`) REFERENCES `generations`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `known_issue_cohorts_issue` ON `known_issue_cohorts` (`known_issue_id`);--> statement-breakpoint
CREATE INDEX `known_issue_cohorts_org_model` ON `known_issue_cohorts` (`organisation_id`,`make`,`model`);--> statement-breakpoint
CREATE TABLE `known_issue_comments` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`known_issue_id` integer NOT NULL,
	`user_id` integer,
	`body` text NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`known_issue_id`) REFERENCES `known_issues`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `known_issue_comments_issue` ON `known_issue_comments` (`known_issue_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `known_issue_findings` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`known_issue_id` integer,
	`vehicle_id` integer NOT NULL,
	`repair_line_id` integer,
	`outcome` text NOT NULL,
	`cause` text,
	`correction` text,
	`odometer_mi` real,
	`user_id` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`known_issue_id`) REFERENCES `known_issues`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `known_issue_findings_issue` ON `known_issue_findings` (`known_issue_id`);--> statement-breakpoint
CREATE INDEX `known_issue_findings_org_vehicle` ON `known_issue_findings` (`organisation_id`,`vehicle_id`);--> statement-breakpoint
CREATE TABLE `known_issue_parts` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`known_issue_id` integer NOT NULL,
	`part_id` integer,
	`part_number` text NOT NULL,
	`quantity` integer DEFAULT 1 NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`known_issue_id`) REFERENCES `known_issues`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`part_id`) REFERENCES `parts`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `known_issue_parts_issue` ON `known_issue_parts` (`known_issue_id`);--> statement-breakpoint
CREATE TABLE `known_issue_states` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`known_issue_id` integer NOT NULL,
	`from_state` text,
	`to_state` text NOT NULL,
	`reason` text NOT NULL,
	`user_id` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`known_issue_id`) REFERENCES `known_issues`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `known_issue_states_issue` ON `known_issue_states` (`known_issue_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `known_issue_watchers` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`known_issue_id` integer NOT NULL,
	`user_id` integer NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`known_issue_id`) REFERENCES `known_issues`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `known_issue_watchers_unique` ON `known_issue_watchers` (`known_issue_id`,`user_id`);--> statement-breakpoint
CREATE TABLE `known_issues` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`title` text NOT NULL,
	`summary` text,
	`state` text DEFAULT 'watching' NOT NULL,
	`mileage_from_mi` real,
	`mileage_to_mi` real,
	`symptoms` text,
	`dtc_codes` text,
	`component_id` integer,
	`fix_description` text,
	`labor_operation` text,
	`typical_hours` real,
	`references` text,
	`signal_id` integer,
	`created_by` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`updated_at` text,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`component_id`) REFERENCES `components`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `known_issues_org_state` ON `known_issues` (`organisation_id`,`state`);--> statement-breakpoint
CREATE TABLE `analysis_runs` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`status` text DEFAULT 'running' NOT NULL,
	`band_width_mi` real NOT NULL,
	`confidence_level` real NOT NULL,
	`cells` integer,
	`signals` integer,
	`readings_ignored` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`finished_at` text,
	`error` text,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `analysis_runs_org` ON `analysis_runs` (`organisation_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `cell_stats` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`run_id` integer NOT NULL,
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
	FOREIGN KEY (`run_id`) REFERENCES `analysis_runs`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`generation_id`) REFERENCES `generations`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`component_id`) REFERENCES `components`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `cell_stats_run_rank` ON `cell_stats` (`run_id`,`ratio_lower`);--> statement-breakpoint
CREATE INDEX `cell_stats_org_cell` ON `cell_stats` (`organisation_id`,`make`,`model`,`cohort_label`,`band_index`);--> statement-breakpoint
CREATE INDEX `cell_stats_org_fault` ON `cell_stats` (`organisation_id`,`fault_key`);--> statement-breakpoint
CREATE TABLE `signals` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`cell_key` text NOT NULL,
	`make` text NOT NULL,
	`model` text NOT NULL,
	`cohort_label` text NOT NULL,
	`band_index` integer NOT NULL,
	`fault_key` text NOT NULL,
	`state` text DEFAULT 'new' NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`last_seen_at` text NOT NULL,
	`last_run_id` integer,
	`known_issue_id` integer,
	`events` integer NOT NULL,
	`exposure_mi` real NOT NULL,
	`rate_ratio` real,
	`ratio_lower` real,
	`ratio_upper` real,
	`q_value` real,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `signals_org_cell` ON `signals` (`organisation_id`,`cell_key`);--> statement-breakpoint
CREATE INDEX `signals_org_state` ON `signals` (`organisation_id`,`state`);--> statement-breakpoint
CREATE TABLE `audit_log` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer,
	`user_id` integer,
	`action` text NOT NULL,
	`entity` text NOT NULL,
	`entity_id` text,
	`detail` text,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `audit_log_org_created` ON `audit_log` (`organisation_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `column_mappings` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`kind` text NOT NULL,
	`mapping` text NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `column_mappings_org_kind` ON `column_mappings` (`organisation_id`,`kind`);--> statement-breakpoint
CREATE TABLE `email_outbox` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer,
	`to_address` text NOT NULL,
	`subject` text NOT NULL,
	`text_body` text NOT NULL,
	`html_body` text,
	`status` text DEFAULT 'queued' NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`last_error` text,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`sent_at` text,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `email_outbox_status` ON `email_outbox` (`status`,`created_at`);--> statement-breakpoint
CREATE TABLE `import_rejects` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`import_id` integer NOT NULL,
	`row_number` integer NOT NULL,
	`reason` text NOT NULL,
	`raw` text,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`import_id`) REFERENCES `imports`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `import_rejects_import` ON `import_rejects` (`import_id`,`row_number`);--> statement-breakpoint
CREATE TABLE `imports` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`kind` text NOT NULL,
	`file_name` text NOT NULL,
	`stored_path` text NOT NULL,
	`sha256` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`status` text DEFAULT 'uploaded' NOT NULL,
	`options` text,
	`rows_total` integer DEFAULT 0 NOT NULL,
	`rows_imported` integer DEFAULT 0 NOT NULL,
	`rows_rejected` integer DEFAULT 0 NOT NULL,
	`vehicles_created` integer DEFAULT 0 NOT NULL,
	`error` text,
	`created_by` integer,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`finished_at` text,
	`undone_at` text,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `imports_org_created` ON `imports` (`organisation_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `imports_org_hash` ON `imports` (`organisation_id`,`sha256`);--> statement-breakpoint
CREATE TABLE `jobs` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer,
	`kind` text NOT NULL,
	`payload` text,
	`status` text DEFAULT 'queued' NOT NULL,
	`run_after` integer NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`max_attempts` integer DEFAULT 3 NOT NULL,
	`lease_owner` text,
	`lease_expires_at` integer,
	`progress` integer,
	`last_error` text,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	`finished_at` text,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `jobs_claim` ON `jobs` (`status`,`run_after`);--> statement-breakpoint
CREATE INDEX `jobs_org` ON `jobs` (`organisation_id`,`created_at`);