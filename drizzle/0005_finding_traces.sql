CREATE TABLE `finding_traces` (
	`finding_id` integer PRIMARY KEY NOT NULL,
	`trace` text NOT NULL,
	`text` text,
	`source_ids` text,
	`written_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`finding_id`) REFERENCES `findings`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `trace_sources` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`text` text NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `trace_sources_text_unique` ON `trace_sources` (`text`);--> statement-breakpoint
-- Keep every stored trace: move it to its own table before the column goes (the readable text is rendered by the workbook for these).
INSERT INTO `finding_traces` (`finding_id`, `trace`) SELECT `id`, `trace` FROM `findings` WHERE `trace` IS NOT NULL;--> statement-breakpoint
ALTER TABLE `findings` DROP COLUMN `trace`;