ALTER TABLE `storage_units` ADD `assessment_input_key` text;--> statement-breakpoint
ALTER TABLE `storage_units` ADD `assessed_at` integer;