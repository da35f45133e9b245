ALTER TABLE `check_attempts` ADD `sign_off_remark` text;--> statement-breakpoint
ALTER TABLE `check_attempts` ADD `withdrawn_by` text REFERENCES users(id);--> statement-breakpoint
ALTER TABLE `check_attempts` ADD `withdrawn_at` integer;--> statement-breakpoint
ALTER TABLE `check_attempts` ADD `withdraw_reason` text;--> statement-breakpoint
ALTER TABLE `invitations` ADD `revoked_at` integer;--> statement-breakpoint
ALTER TABLE `invitations` ADD `revoked_reason` text;--> statement-breakpoint
CREATE INDEX `invitations_email_idx` ON `invitations` (`email`);--> statement-breakpoint
ALTER TABLE `users` ADD `digest_opt_out` integer DEFAULT false NOT NULL;