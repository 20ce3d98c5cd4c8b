-- finding_traces again, with the readable text before the JSON (a read of the text then skips the JSON's overflow pages) and the text_xml_safe flag; every row is kept. A text stored before is not known to be XML-safe, so its flag is false.
CREATE TABLE `__new_finding_traces` (
	`finding_id` integer PRIMARY KEY NOT NULL,
	`text` text,
	`text_xml_safe` integer DEFAULT false NOT NULL,
	`source_ids` text,
	`written_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`trace` text NOT NULL,
	FOREIGN KEY (`finding_id`) REFERENCES `findings`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
INSERT INTO `__new_finding_traces` (`finding_id`, `text`, `source_ids`, `written_at`, `trace`) SELECT `finding_id`, `text`, `source_ids`, `written_at`, `trace` FROM `finding_traces`;--> statement-breakpoint
DROP TABLE `finding_traces`;--> statement-breakpoint
ALTER TABLE `__new_finding_traces` RENAME TO `finding_traces`;
