ALTER TABLE `cell_stats` ADD `posterior_shape` real;--> statement-breakpoint
ALTER TABLE `cell_stats` ADD `posterior_exposure_mi` real;--> statement-breakpoint
ALTER TABLE `cell_view_stats` ADD `posterior_shape` real;--> statement-breakpoint
ALTER TABLE `cell_view_stats` ADD `posterior_exposure_mi` real;