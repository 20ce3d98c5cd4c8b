DROP INDEX `findings_storage_unit_idx`;--> statement-breakpoint
CREATE INDEX `findings_unit_subject_rule_idx` ON `findings` (`storage_unit_id`,`substance_id`,`mixture_id`,`rule`);