DROP INDEX `findings_room_idx`;--> statement-breakpoint
CREATE INDEX `findings_room_unit_idx` ON `findings` (`room_id`,`storage_unit_id`);--> statement-breakpoint
ALTER TABLE `rooms` ADD `assessed_at` integer;--> statement-breakpoint
ALTER TABLE `rooms` ADD `assessment_input_key` text;