CREATE TABLE `odometer_readings` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`vehicle_id` integer NOT NULL,
	`read_on` text NOT NULL,
	`odometer_mi` real NOT NULL,
	`source` text NOT NULL,
	`import_id` integer,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`vehicle_id`) REFERENCES `vehicles`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `odometer_readings_vehicle` ON `odometer_readings` (`vehicle_id`,`read_on`);--> statement-breakpoint
CREATE INDEX `odometer_readings_import` ON `odometer_readings` (`import_id`);--> statement-breakpoint
CREATE TABLE `staged_faults` (
	`id` integer PRIMARY KEY NOT NULL,
	`organisation_id` integer NOT NULL,
	`import_id` integer NOT NULL,
	`row_number` integer NOT NULL,
	`vehicle_id` integer,
	`unit_number` text,
	`vin` text,
	`make` text,
	`model` text,
	`model_year` integer,
	`occurred_at` text NOT NULL,
	`odometer_mi` real,
	`dtc` text NOT NULL,
	`mil_on` integer DEFAULT false NOT NULL,
	`status` text DEFAULT 'confirmed' NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`import_id`) REFERENCES `imports`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `staged_fuel` (
	`id` integer PRIMARY KEY NOT NULL,
	`organisation_id` integer NOT NULL,
	`import_id` integer NOT NULL,
	`row_number` integer NOT NULL,
	`vehicle_id` integer,
	`unit_number` text,
	`vin` text,
	`make` text,
	`model` text,
	`model_year` integer,
	`filled_at` text NOT NULL,
	`odometer_mi` real,
	`volume_l` real,
	`price_total_cents` integer,
	`station` text,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`import_id`) REFERENCES `imports`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `staged_generations` (
	`id` integer PRIMARY KEY NOT NULL,
	`organisation_id` integer NOT NULL,
	`import_id` integer NOT NULL,
	`row_number` integer NOT NULL,
	`make` text NOT NULL,
	`model` text NOT NULL,
	`label` text NOT NULL,
	`year_from` integer NOT NULL,
	`year_to` integer NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`import_id`) REFERENCES `imports`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `staged_parts` (
	`id` integer PRIMARY KEY NOT NULL,
	`organisation_id` integer NOT NULL,
	`import_id` integer NOT NULL,
	`row_number` integer NOT NULL,
	`part_number` text NOT NULL,
	`description` text NOT NULL,
	`component_id` integer,
	`on_hand` integer,
	`unit_cost_cents` integer,
	`lead_time_days` integer,
	`part_id` integer,
	`was_new` integer,
	`previous` text,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`import_id`) REFERENCES `imports`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `staged_parts_import` ON `staged_parts` (`import_id`);--> statement-breakpoint
CREATE TABLE `staged_repairs` (
	`id` integer PRIMARY KEY NOT NULL,
	`organisation_id` integer NOT NULL,
	`import_id` integer NOT NULL,
	`row_number` integer NOT NULL,
	`vehicle_id` integer,
	`unit_number` text,
	`vin` text,
	`make` text,
	`model` text,
	`model_year` integer,
	`ro_number` text NOT NULL,
	`opened_on` text NOT NULL,
	`closed_on` text,
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
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`import_id`) REFERENCES `imports`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `staged_vehicles` (
	`id` integer PRIMARY KEY NOT NULL,
	`organisation_id` integer NOT NULL,
	`import_id` integer NOT NULL,
	`row_number` integer NOT NULL,
	`vehicle_id` integer,
	`unit_number` text,
	`vin` text,
	`make` text,
	`model` text,
	`model_year` integer,
	`engine` text,
	`transmission` text,
	`in_service_date` text,
	`odometer_mi` real,
	`odometer_unit` text,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`import_id`) REFERENCES `imports`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
DROP INDEX `fault_events_vehicle`;--> statement-breakpoint
CREATE UNIQUE INDEX `fault_events_vehicle_time_dtc` ON `fault_events` (`vehicle_id`,`occurred_at`,`dtc`);--> statement-breakpoint
DROP INDEX `fuel_vehicle_odometer`;--> statement-breakpoint
DROP INDEX `fuel_vehicle_time`;--> statement-breakpoint
CREATE UNIQUE INDEX `fuel_vehicle_time` ON `fuel_transactions` (`vehicle_id`,`filled_at`);--> statement-breakpoint
DROP INDEX `repair_lines_org_symptom`;--> statement-breakpoint
DROP INDEX `repair_lines_import`;--> statement-breakpoint
DROP INDEX `repair_orders_org_opened`;--> statement-breakpoint
DROP INDEX `imports_org_hash`;--> statement-breakpoint
ALTER TABLE `imports` ADD `bytes_read` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `imports` ADD `rows_duplicate` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `imports` ADD `rows_warning` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `imports` ADD `job_id` integer;--> statement-breakpoint
ALTER TABLE `imports` ADD `started_at` text;--> statement-breakpoint
ALTER TABLE `imports` ADD `cancel_requested_at` text;--> statement-breakpoint
ALTER TABLE `imports` ADD `undone_by` integer REFERENCES users(id);--> statement-breakpoint
CREATE UNIQUE INDEX `imports_org_live_hash` ON `imports` (`organisation_id`,`sha256`) WHERE status not in ('failed', 'cancelled', 'undone');--> statement-breakpoint
ALTER TABLE `generations` ADD `import_id` integer;--> statement-breakpoint
ALTER TABLE `import_rejects` ADD `severity` text DEFAULT 'rejected' NOT NULL;--> statement-breakpoint
ALTER TABLE `import_rejects` ADD `column` text;