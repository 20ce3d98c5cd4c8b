ALTER TABLE `exposure_limits` ADD `note` text;--> statement-breakpoint
ALTER TABLE `substances` ADD `alternatives` text DEFAULT '[]' NOT NULL;