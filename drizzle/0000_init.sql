CREATE TABLE `api_keys` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`prefix` text NOT NULL,
	`key_hash` text NOT NULL,
	`scopes` text NOT NULL,
	`created_by_id` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`last_used_at` integer,
	`revoked_at` integer,
	FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `api_keys_hash_unique` ON `api_keys` (`key_hash`);--> statement-breakpoint
CREATE INDEX `api_keys_created_by_idx` ON `api_keys` (`created_by_id`);--> statement-breakpoint
CREATE TABLE `audit_events` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`actor_id` integer,
	`actor_label` text NOT NULL,
	`action` text NOT NULL,
	`entity_type` text NOT NULL,
	`entity_id` text,
	`summary` text NOT NULL,
	`before` text,
	`after` text,
	FOREIGN KEY (`actor_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `audit_events_at_idx` ON `audit_events` (`at`);--> statement-breakpoint
CREATE INDEX `audit_events_entity_idx` ON `audit_events` (`entity_type`,`entity_id`);--> statement-breakpoint
CREATE INDEX `audit_events_actor_idx` ON `audit_events` (`actor_id`);--> statement-breakpoint
CREATE TABLE `container_moves` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`container_id` integer NOT NULL,
	`from_storage_unit_id` integer,
	`to_storage_unit_id` integer NOT NULL,
	`moved_by_id` integer,
	`moved_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`container_id`) REFERENCES `containers`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`from_storage_unit_id`) REFERENCES `storage_units`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`to_storage_unit_id`) REFERENCES `storage_units`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`moved_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `container_moves_container_idx` ON `container_moves` (`container_id`);--> statement-breakpoint
CREATE INDEX `container_moves_from_idx` ON `container_moves` (`from_storage_unit_id`);--> statement-breakpoint
CREATE INDEX `container_moves_to_idx` ON `container_moves` (`to_storage_unit_id`);--> statement-breakpoint
CREATE INDEX `container_moves_moved_by_idx` ON `container_moves` (`moved_by_id`);--> statement-breakpoint
CREATE TABLE `containers` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`label` text NOT NULL,
	`substance_id` integer,
	`mixture_id` integer,
	`amount` real NOT NULL,
	`amount_unit` text NOT NULL,
	`capacity` real,
	`capacity_unit` text,
	`container_kind` text DEFAULT 'glass_bottle' NOT NULL,
	`state` text DEFAULT 'sealed' NOT NULL,
	`storage_unit_id` integer NOT NULL,
	`owner_id` integer,
	`received_at` integer,
	`opened_at` integer,
	`expires_at` integer,
	`sds_file_id` integer,
	`notes` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`substance_id`) REFERENCES `substances`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`mixture_id`) REFERENCES `mixtures`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`storage_unit_id`) REFERENCES `storage_units`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`owner_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`sds_file_id`) REFERENCES `files`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "containers_one_content" CHECK(("containers"."substance_id" is not null and "containers"."mixture_id" is null) or ("containers"."substance_id" is null and "containers"."mixture_id" is not null)),
	CONSTRAINT "containers_amount_non_negative" CHECK("containers"."amount" >= 0)
);
--> statement-breakpoint
CREATE UNIQUE INDEX `containers_label_unique` ON `containers` (`label`);--> statement-breakpoint
CREATE INDEX `containers_substance_idx` ON `containers` (`substance_id`);--> statement-breakpoint
CREATE INDEX `containers_mixture_idx` ON `containers` (`mixture_id`);--> statement-breakpoint
CREATE INDEX `containers_storage_unit_idx` ON `containers` (`storage_unit_id`,`state`);--> statement-breakpoint
CREATE INDEX `containers_owner_idx` ON `containers` (`owner_id`);--> statement-breakpoint
CREATE INDEX `containers_sds_file_idx` ON `containers` (`sds_file_id`);--> statement-breakpoint
CREATE TABLE `email_messages` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`kind` text NOT NULL,
	`to_addresses` text NOT NULL,
	`subject` text NOT NULL,
	`html` text NOT NULL,
	`text` text NOT NULL,
	`status` text DEFAULT 'queued' NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`next_attempt_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`last_error` text,
	`provider_message_id` text,
	`idempotency_key` text NOT NULL,
	`recipient_user_id` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`sent_at` integer,
	FOREIGN KEY (`recipient_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `email_messages_idempotency_unique` ON `email_messages` (`idempotency_key`);--> statement-breakpoint
CREATE INDEX `email_messages_due_idx` ON `email_messages` (`status`,`next_attempt_at`);--> statement-breakpoint
CREATE INDEX `email_messages_recipient_idx` ON `email_messages` (`recipient_user_id`);--> statement-breakpoint
CREATE TABLE `excursions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`sensor_id` integer NOT NULL,
	`room_id` integer,
	`storage_unit_id` integer,
	`threshold_c` real NOT NULL,
	`start_at` integer NOT NULL,
	`end_at` integer,
	`peak_temp_c` real NOT NULL,
	`peak_at` integer NOT NULL,
	`acknowledged_at` integer,
	`acknowledged_by_id` integer,
	`acknowledge_comment` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`sensor_id`) REFERENCES `sensors`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`room_id`) REFERENCES `rooms`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`storage_unit_id`) REFERENCES `storage_units`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`acknowledged_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `excursions_sensor_start_unique` ON `excursions` (`sensor_id`,`start_at`);--> statement-breakpoint
CREATE INDEX `excursions_room_idx` ON `excursions` (`room_id`);--> statement-breakpoint
CREATE INDEX `excursions_storage_unit_idx` ON `excursions` (`storage_unit_id`);--> statement-breakpoint
CREATE INDEX `excursions_acknowledged_by_idx` ON `excursions` (`acknowledged_by_id`);--> statement-breakpoint
CREATE INDEX `excursions_open_idx` ON `excursions` (`end_at`);--> statement-breakpoint
CREATE TABLE `exposure_limits` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`substance_id` integer NOT NULL,
	`kind` text NOT NULL,
	`value` real NOT NULL,
	`unit` text NOT NULL,
	`body` text NOT NULL,
	`source` text NOT NULL,
	FOREIGN KEY (`substance_id`) REFERENCES `substances`(`id`) ON UPDATE no action ON DELETE cascade,
	CONSTRAINT "exposure_limits_value_positive" CHECK("exposure_limits"."value" > 0)
);
--> statement-breakpoint
CREATE INDEX `exposure_limits_substance_idx` ON `exposure_limits` (`substance_id`);--> statement-breakpoint
CREATE TABLE `files` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`stored_name` text NOT NULL,
	`original_name` text NOT NULL,
	`content_type` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`sha256` text NOT NULL,
	`uploaded_by_id` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`uploaded_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `files_stored_name_unique` ON `files` (`stored_name`);--> statement-breakpoint
CREATE INDEX `files_uploaded_by_idx` ON `files` (`uploaded_by_id`);--> statement-breakpoint
CREATE TABLE `finding_events` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`finding_id` integer NOT NULL,
	`kind` text NOT NULL,
	`from_status` text,
	`to_status` text,
	`note` text,
	`actor_id` integer,
	`data` text,
	`at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`finding_id`) REFERENCES `findings`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`actor_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `finding_events_finding_idx` ON `finding_events` (`finding_id`,`at`);--> statement-breakpoint
CREATE INDEX `finding_events_actor_idx` ON `finding_events` (`actor_id`);--> statement-breakpoint
CREATE TABLE `findings` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`fingerprint` text NOT NULL,
	`rule` text NOT NULL,
	`severity` text NOT NULL,
	`status` text DEFAULT 'open' NOT NULL,
	`scenario` text NOT NULL,
	`title` text NOT NULL,
	`site_id` integer,
	`room_id` integer,
	`storage_unit_id` integer,
	`container_id` integer,
	`substance_id` integer,
	`mixture_id` integer,
	`value` real,
	`limit_value` real,
	`ratio` real,
	`unit` text,
	`worst_case_temp_c` real,
	`worst_case_source` text,
	`trace` text,
	`condition_holds` integer DEFAULT true NOT NULL,
	`assignee_id` integer,
	`mitigation_plan` text,
	`risk_accepted_until` integer,
	`first_raised_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`last_evaluated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`resolved_at` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`room_id`) REFERENCES `rooms`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`storage_unit_id`) REFERENCES `storage_units`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`container_id`) REFERENCES `containers`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`substance_id`) REFERENCES `substances`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`mixture_id`) REFERENCES `mixtures`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`assignee_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `findings_fingerprint_unique` ON `findings` (`fingerprint`);--> statement-breakpoint
CREATE INDEX `findings_status_severity_idx` ON `findings` (`status`,`severity`);--> statement-breakpoint
CREATE INDEX `findings_site_idx` ON `findings` (`site_id`);--> statement-breakpoint
CREATE INDEX `findings_room_idx` ON `findings` (`room_id`);--> statement-breakpoint
CREATE INDEX `findings_storage_unit_idx` ON `findings` (`storage_unit_id`);--> statement-breakpoint
CREATE INDEX `findings_container_idx` ON `findings` (`container_id`);--> statement-breakpoint
CREATE INDEX `findings_substance_idx` ON `findings` (`substance_id`);--> statement-breakpoint
CREATE INDEX `findings_mixture_idx` ON `findings` (`mixture_id`);--> statement-breakpoint
CREATE INDEX `findings_assignee_idx` ON `findings` (`assignee_id`);--> statement-breakpoint
CREATE TABLE `jobs` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`kind` text NOT NULL,
	`status` text DEFAULT 'queued' NOT NULL,
	`progress` integer DEFAULT 0 NOT NULL,
	`total` integer,
	`error` text,
	`requested_by_id` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`started_at` integer,
	`finished_at` integer,
	FOREIGN KEY (`requested_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `jobs_status_idx` ON `jobs` (`status`);--> statement-breakpoint
CREATE INDEX `jobs_requested_by_idx` ON `jobs` (`requested_by_id`);--> statement-breakpoint
CREATE TABLE `mixture_components` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`mixture_id` integer NOT NULL,
	`substance_id` integer NOT NULL,
	`fraction` real NOT NULL,
	FOREIGN KEY (`mixture_id`) REFERENCES `mixtures`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`substance_id`) REFERENCES `substances`(`id`) ON UPDATE no action ON DELETE restrict,
	CONSTRAINT "mixture_components_fraction_range" CHECK("mixture_components"."fraction" > 0 and "mixture_components"."fraction" <= 1)
);
--> statement-breakpoint
CREATE UNIQUE INDEX `mixture_components_unique` ON `mixture_components` (`mixture_id`,`substance_id`);--> statement-breakpoint
CREATE INDEX `mixture_components_substance_idx` ON `mixture_components` (`substance_id`);--> statement-breakpoint
CREATE TABLE `mixtures` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`description` text,
	`fraction_basis` text NOT NULL,
	`created_by_id` integer,
	`retired_at` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `mixtures_name_unique` ON `mixtures` (`name`);--> statement-breakpoint
CREATE INDEX `mixtures_created_by_idx` ON `mixtures` (`created_by_id`);--> statement-breakpoint
CREATE TABLE `quantity_limits` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`scope` text NOT NULL,
	`liquid_classes` text NOT NULL,
	`max_volume_l` real NOT NULL,
	`sprinklered_max_volume_l` real,
	`basis` text NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_by_id` integer,
	FOREIGN KEY (`updated_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "quantity_limits_positive" CHECK("quantity_limits"."max_volume_l" > 0)
);
--> statement-breakpoint
CREATE INDEX `quantity_limits_updated_by_idx` ON `quantity_limits` (`updated_by_id`);--> statement-breakpoint
CREATE TABLE `readings` (
	`sensor_id` integer NOT NULL,
	`at` integer NOT NULL,
	`temp_c` real NOT NULL,
	PRIMARY KEY(`sensor_id`, `at`),
	FOREIGN KEY (`sensor_id`) REFERENCES `sensors`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `readings_at_idx` ON `readings` (`at`);--> statement-breakpoint
CREATE TABLE `rooms` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`site_id` integer NOT NULL,
	`code` text NOT NULL,
	`name` text NOT NULL,
	`kind` text DEFAULT 'laboratory' NOT NULL,
	`floor_area_m2` real,
	`height_m` real,
	`air_changes_per_hour` real,
	`mixing_factor` real DEFAULT 0.5 NOT NULL,
	`design_max_temp_c` real,
	`sprinklered` integer DEFAULT false NOT NULL,
	`set_min_c` real,
	`set_max_c` real,
	`excursion_threshold_c` real,
	`excursion_min_duration_min` integer,
	`facilities_contact_id` integer,
	`notes` text,
	`retired_at` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`facilities_contact_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "rooms_mixing_factor_range" CHECK("rooms"."mixing_factor" > 0 and "rooms"."mixing_factor" <= 1)
);
--> statement-breakpoint
CREATE UNIQUE INDEX `rooms_site_code_unique` ON `rooms` (`site_id`,`code`);--> statement-breakpoint
CREATE INDEX `rooms_site_idx` ON `rooms` (`site_id`);--> statement-breakpoint
CREATE INDEX `rooms_facilities_contact_idx` ON `rooms` (`facilities_contact_id`);--> statement-breakpoint
CREATE TABLE `sensors` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`external_id` text NOT NULL,
	`name` text NOT NULL,
	`room_id` integer,
	`storage_unit_id` integer,
	`csv_mapping` text,
	`time_zone` text,
	`active` integer DEFAULT true NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`room_id`) REFERENCES `rooms`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`storage_unit_id`) REFERENCES `storage_units`(`id`) ON UPDATE no action ON DELETE restrict,
	CONSTRAINT "sensors_one_location" CHECK(("sensors"."room_id" is not null and "sensors"."storage_unit_id" is null) or ("sensors"."room_id" is null and "sensors"."storage_unit_id" is not null))
);
--> statement-breakpoint
CREATE UNIQUE INDEX `sensors_external_id_unique` ON `sensors` (`external_id`);--> statement-breakpoint
CREATE INDEX `sensors_room_idx` ON `sensors` (`room_id`);--> statement-breakpoint
CREATE INDEX `sensors_storage_unit_idx` ON `sensors` (`storage_unit_id`);--> statement-breakpoint
CREATE TABLE `settings` (
	`key` text PRIMARY KEY NOT NULL,
	`value` text NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_by_id` integer,
	FOREIGN KEY (`updated_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `settings_updated_by_idx` ON `settings` (`updated_by_id`);--> statement-breakpoint
CREATE TABLE `sign_in_throttles` (
	`key` text PRIMARY KEY NOT NULL,
	`failure_count` integer DEFAULT 0 NOT NULL,
	`first_failure_at` integer NOT NULL,
	`locked_until` integer
);
--> statement-breakpoint
CREATE TABLE `sites` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`address` text,
	`elevation_m` real,
	`atmospheric_pressure_kpa` real DEFAULT 101.325 NOT NULL,
	`retired_at` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `sites_name_unique` ON `sites` (`name`);--> statement-breakpoint
CREATE TABLE `storage_units` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`room_id` integer NOT NULL,
	`code` text NOT NULL,
	`name` text NOT NULL,
	`kind` text NOT NULL,
	`internal_volume_l` real,
	`set_min_c` real,
	`set_max_c` real,
	`excursion_threshold_c` real,
	`excursion_min_duration_min` integer,
	`ventilated` integer DEFAULT false NOT NULL,
	`ignition_source_free` integer DEFAULT false NOT NULL,
	`owner_id` integer,
	`notes` text,
	`retired_at` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`room_id`) REFERENCES `rooms`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`owner_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `storage_units_room_code_unique` ON `storage_units` (`room_id`,`code`);--> statement-breakpoint
CREATE INDEX `storage_units_room_idx` ON `storage_units` (`room_id`);--> statement-breakpoint
CREATE INDEX `storage_units_owner_idx` ON `storage_units` (`owner_id`);--> statement-breakpoint
CREATE TABLE `substances` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`cas` text,
	`name` text NOT NULL,
	`synonyms` text DEFAULT '[]' NOT NULL,
	`formula` text,
	`physical_state` text DEFAULT 'liquid' NOT NULL,
	`molar_mass_g_per_mol` real NOT NULL,
	`normal_boiling_point_c` real,
	`melting_point_c` real,
	`enthalpy_of_vaporization_kj_per_mol` real,
	`enthalpy_of_sublimation_kj_per_mol` real,
	`liquid_density_kg_per_m3` real,
	`flash_point_c` real,
	`lfl_vol_percent` real,
	`ufl_vol_percent` real,
	`autoignition_temp_c` real,
	`correlations` text DEFAULT '[]' NOT NULL,
	`sources` text DEFAULT '{}' NOT NULL,
	`notes` text,
	`sds_file_id` integer,
	`retired_at` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_by_id` integer,
	FOREIGN KEY (`sds_file_id`) REFERENCES `files`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`updated_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "substances_molar_mass_positive" CHECK("substances"."molar_mass_g_per_mol" > 0)
);
--> statement-breakpoint
CREATE UNIQUE INDEX `substances_cas_unique` ON `substances` (`cas`);--> statement-breakpoint
CREATE INDEX `substances_name_idx` ON `substances` (`name`);--> statement-breakpoint
CREATE INDEX `substances_sds_file_idx` ON `substances` (`sds_file_id`);--> statement-breakpoint
CREATE INDEX `substances_updated_by_idx` ON `substances` (`updated_by_id`);--> statement-breakpoint
CREATE TABLE `user_tokens` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`user_id` integer NOT NULL,
	`kind` text NOT NULL,
	`token_hash` text NOT NULL,
	`expires_at` integer NOT NULL,
	`used_at` integer,
	`created_by_id` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `user_tokens_hash_unique` ON `user_tokens` (`token_hash`);--> statement-breakpoint
CREATE INDEX `user_tokens_user_idx` ON `user_tokens` (`user_id`);--> statement-breakpoint
CREATE INDEX `user_tokens_created_by_idx` ON `user_tokens` (`created_by_id`);--> statement-breakpoint
CREATE TABLE `users` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`email` text NOT NULL,
	`name` text NOT NULL,
	`role` text NOT NULL,
	`password_hash` text,
	`active` integer DEFAULT true NOT NULL,
	`session_version` integer DEFAULT 1 NOT NULL,
	`alert_findings` text DEFAULT 'immediate' NOT NULL,
	`alert_excursions` text DEFAULT 'immediate' NOT NULL,
	`daily_digest` integer DEFAULT true NOT NULL,
	`last_sign_in_at` integer,
	`invited_by_id` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`invited_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `users_email_unique` ON `users` (`email`);--> statement-breakpoint
CREATE INDEX `users_invited_by_idx` ON `users` (`invited_by_id`);