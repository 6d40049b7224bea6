CREATE TABLE `component_kinds` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer NOT NULL,
	`component_id` integer NOT NULL,
	`kind` text NOT NULL,
	`set_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`component_id`) REFERENCES `components`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `component_kinds_org_component` ON `component_kinds` (`organisation_id`,`component_id`);--> statement-breakpoint
CREATE TABLE `service_rates` (
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
	`kind` text DEFAULT 'failure' NOT NULL,
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
	`posterior_shape` real,
	`posterior_exposure_mi` real,
	`is_signal` integer DEFAULT false NOT NULL,
	`has_too_little_data` integer DEFAULT false NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`run_id`) REFERENCES `analysis_runs`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`generation_id`) REFERENCES `generations`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`component_id`) REFERENCES `components`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `service_rates_run` ON `service_rates` (`run_id`);--> statement-breakpoint
ALTER TABLE `components` ADD `kind` text DEFAULT 'failure' NOT NULL;--> statement-breakpoint
ALTER TABLE `generations` ADD `powertrain` text;--> statement-breakpoint
ALTER TABLE `repair_lines` ADD `is_scheduled` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `repair_lines` ADD `kind` text DEFAULT 'failure' NOT NULL;--> statement-breakpoint
ALTER TABLE `cell_stats` ADD `kind` text DEFAULT 'failure' NOT NULL;--> statement-breakpoint
ALTER TABLE `cell_view_stats` ADD `kind` text DEFAULT 'failure' NOT NULL;--> statement-breakpoint
ALTER TABLE `signals` ADD `kind` text DEFAULT 'failure' NOT NULL;--> statement-breakpoint
ALTER TABLE `staged_generations` ADD `powertrain` text;--> statement-breakpoint
ALTER TABLE `staged_repairs` ADD `is_scheduled` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `staged_repairs` ADD `kind` text DEFAULT 'failure' NOT NULL;--> statement-breakpoint
DROP VIEW `visible_repair_lines`;--> statement-breakpoint
CREATE VIEW `visible_repair_lines` AS select "id", "organisation_id", "repair_order_id", "vehicle_id", "line_no", "opened_on", "odometer_mi", "complaint", "cause", "correction", "dtc_codes", "component_id", "symptom", "labor_hours", "parts_cost_cents", "labor_cost_cents", "part_numbers", "technician", "vendor", "is_warranty", "is_scheduled", "kind", "import_id" from "repair_lines" where "repair_lines"."import_id" is null or "repair_lines"."import_id" not in (select id from imports where status in ('applying', 'failed'));--> statement-breakpoint
-- Recurra's default kinds (db/seed/reference.ts sets them again at every start).
UPDATE `components` SET `kind` = 'service' WHERE `slug` IN ('engine-mechanical/oil-service', 'engine-mechanical/air-filter', 'cooling/coolant', 'transmission/fluid-service', 'brakes/brake-fluid', 'hvac/cabin-filter', 'ignition/spark-plugs');--> statement-breakpoint
UPDATE `components` SET `kind` = 'wear' WHERE `slug` IN ('brakes/front-pads', 'brakes/discs', 'brakes/rear-brakes', 'body-electrical/wipers');--> statement-breakpoint
-- Lines already stored: scheduled work read from their words as isScheduledWork does
-- (lib/component-kinds.ts), in the LIKE patterns SQL allows; imports from now on use that function.
UPDATE `repair_lines` SET `is_scheduled` = 1
 WHERE `dtc_codes` IS NULL
   AND (`complaint` IS NULL OR trim(`complaint`) = '' OR lower(`complaint`) LIKE '%scheduled%' OR lower(`complaint`) LIKE '%maintenance%' OR lower(`complaint`) LIKE '%inspection%' OR lower(`complaint`) LIKE '%oil change%' OR lower(`complaint`) LIKE '%service due%' OR lower(`complaint`) LIKE '%routine%')
   AND (lower(coalesce(`complaint`, '') || ' ' || coalesce(`cause`, '') || ' ' || coalesce(`correction`, '')) LIKE '%scheduled%'
     OR lower(coalesce(`complaint`, '') || ' ' || coalesce(`cause`, '') || ' ' || coalesce(`correction`, '')) LIKE '%per interval%'
     OR lower(coalesce(`complaint`, '') || ' ' || coalesce(`cause`, '') || ' ' || coalesce(`correction`, '')) LIKE '%per schedule%'
     OR lower(coalesce(`complaint`, '') || ' ' || coalesce(`cause`, '') || ' ' || coalesce(`correction`, '')) LIKE '%maintenance%'
     OR lower(coalesce(`complaint`, '') || ' ' || coalesce(`cause`, '') || ' ' || coalesce(`correction`, '')) LIKE '%inspection%'
     OR lower(coalesce(`complaint`, '') || ' ' || coalesce(`cause`, '') || ' ' || coalesce(`correction`, '')) LIKE '%oil change%'
     OR lower(coalesce(`complaint`, '') || ' ' || coalesce(`cause`, '') || ' ' || coalesce(`correction`, '')) LIKE '%service interval%')
   AND lower(coalesce(`complaint`, '') || ' ' || coalesce(`cause`, '') || ' ' || coalesce(`correction`, '')) NOT LIKE '%fail%'
   AND lower(coalesce(`complaint`, '') || ' ' || coalesce(`cause`, '') || ' ' || coalesce(`correction`, '')) NOT LIKE '%leak%'
   AND lower(coalesce(`complaint`, '') || ' ' || coalesce(`cause`, '') || ' ' || coalesce(`correction`, '')) NOT LIKE '%noise%'
   AND lower(coalesce(`complaint`, '') || ' ' || coalesce(`cause`, '') || ' ' || coalesce(`correction`, '')) NOT LIKE '%stall%'
   AND lower(coalesce(`complaint`, '') || ' ' || coalesce(`cause`, '') || ' ' || coalesce(`correction`, '')) NOT LIKE '%fault%';--> statement-breakpoint
UPDATE `repair_lines` SET `kind` = coalesce(
  (SELECT CASE WHEN k.`kind` IN ('service', 'wear') THEN k.`kind` WHEN `repair_lines`.`is_scheduled` THEN 'service' ELSE 'failure' END
     FROM `components` k WHERE k.`id` = `repair_lines`.`component_id`),
  CASE WHEN `is_scheduled` THEN 'service' ELSE 'failure' END);--> statement-breakpoint
-- Cells of earlier runs counted every line: each organisation is recomputed with the kinds.
INSERT INTO `jobs` (`organisation_id`, `kind`, `payload`, `run_after`)
  SELECT `id`, 'recompute', json_object('organisationId', `id`), CAST((julianday('now') - 2440587.5) * 86400000 AS INTEGER)
    FROM `organisations`;
