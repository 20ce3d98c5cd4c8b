ALTER TABLE `users` ADD `sign_in_method` text DEFAULT 'password' NOT NULL;--> statement-breakpoint
ALTER TABLE `users` ADD `sso_issuer` text;--> statement-breakpoint
ALTER TABLE `users` ADD `sso_subject` text;--> statement-breakpoint
CREATE UNIQUE INDEX `users_sso_identity_unique` ON `users` (`sso_issuer`,`sso_subject`);