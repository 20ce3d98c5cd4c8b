CREATE INDEX `containers_storage_unit_label_idx` ON `containers` (`storage_unit_id`,`label`);--> statement-breakpoint
CREATE INDEX `containers_owner_updated_at_idx` ON `containers` (`owner_id`,`updated_at`);--> statement-breakpoint
CREATE INDEX `containers_state_content_idx` ON `containers` (`state`,`substance_id`,`mixture_id`);