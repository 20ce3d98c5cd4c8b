CREATE TABLE `excursion_crossing_alerts` (
	`excursion_id` integer NOT NULL,
	`threshold_key` text NOT NULL,
	`crossing_at` integer NOT NULL,
	`sent_at` integer NOT NULL,
	PRIMARY KEY(`excursion_id`, `threshold_key`),
	FOREIGN KEY (`excursion_id`) REFERENCES `excursions`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `warm_up_fits` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`storage_unit_id` integer NOT NULL,
	`tau_min` real NOT NULL,
	`rms_error_c` real NOT NULL,
	`excursion_count` integer NOT NULL,
	`reading_count` integer NOT NULL,
	`room_temp_c` real NOT NULL,
	`room_temp_source` text NOT NULL,
	`excursion_ids` text NOT NULL,
	`fitted_at` integer NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`storage_unit_id`) REFERENCES `storage_units`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `warm_up_fits_unit_idx` ON `warm_up_fits` (`storage_unit_id`,`fitted_at`);--> statement-breakpoint
ALTER TABLE `findings` ADD `time_to_danger_min` real;--> statement-breakpoint
ALTER TABLE `findings` ADD `time_to_danger_threshold` text;--> statement-breakpoint
ALTER TABLE `findings` ADD `time_to_danger_temp_c` real;--> statement-breakpoint
ALTER TABLE `storage_units` ADD `warm_up_tau_min` real;--> statement-breakpoint
ALTER TABLE `storage_units` ADD `warm_up_tau_note` text;