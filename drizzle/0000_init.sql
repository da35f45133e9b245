CREATE TABLE `audit_log` (
	`id` text PRIMARY KEY NOT NULL,
	`actor_id` text,
	`action` text NOT NULL,
	`subject_type` text NOT NULL,
	`subject_id` text,
	`detail` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`actor_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `audit_created_idx` ON `audit_log` (`created_at`);--> statement-breakpoint
CREATE TABLE `calls` (
	`id` text PRIMARY KEY NOT NULL,
	`sighting_id` text NOT NULL,
	`user_id` text NOT NULL,
	`deck_id` text NOT NULL,
	`track_id` text,
	`target_type_id` text NOT NULL,
	`called_type_id` text,
	`aspect` text NOT NULL,
	`condition` text NOT NULL,
	`choice_id` text,
	`typed` text,
	`correct` integer NOT NULL,
	`grade` text NOT NULL,
	`anticipation` integer DEFAULT false NOT NULL,
	`latency_ms` integer,
	`frames_shown` integer,
	`frame_interval_ms` real,
	`called_at` integer NOT NULL,
	`received_at` integer NOT NULL,
	`offline` integer DEFAULT false NOT NULL,
	`before` text,
	`after` text,
	`result` text,
	FOREIGN KEY (`sighting_id`) REFERENCES `sightings`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`deck_id`) REFERENCES `decks`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`track_id`) REFERENCES `tracks`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `calls_sighting_uq` ON `calls` (`sighting_id`);--> statement-breakpoint
CREATE INDEX `calls_user_time_idx` ON `calls` (`user_id`,`called_at`);--> statement-breakpoint
CREATE INDEX `calls_deck_time_idx` ON `calls` (`deck_id`,`called_at`);--> statement-breakpoint
CREATE TABLE `check_attempts` (
	`id` text PRIMARY KEY NOT NULL,
	`check_id` text NOT NULL,
	`user_id` text NOT NULL,
	`watch_id` text,
	`status` text DEFAULT 'running' NOT NULL,
	`score` real,
	`passed` integer,
	`signed_off_by` text,
	`signed_off_at` integer,
	`started_at` integer NOT NULL,
	`finished_at` integer,
	FOREIGN KEY (`check_id`) REFERENCES `checks`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`watch_id`) REFERENCES `watches`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`signed_off_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `check_attempts_user_idx` ON `check_attempts` (`user_id`,`check_id`);--> statement-breakpoint
CREATE TABLE `checks` (
	`id` text PRIMARY KEY NOT NULL,
	`deck_id` text NOT NULL,
	`title` text NOT NULL,
	`sighting_count` integer NOT NULL,
	`exposure_ms` integer NOT NULL,
	`conditions` text NOT NULL,
	`aspects` text NOT NULL,
	`pass_mark` real NOT NULL,
	`created_by` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`deck_id`) REFERENCES `decks`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `crews` (
	`id` text PRIMARY KEY NOT NULL,
	`name` text NOT NULL,
	`min_accuracy` real DEFAULT 0.9 NOT NULL,
	`min_calls_per_track` integer DEFAULT 2 NOT NULL,
	`window_days` integer DEFAULT 14 NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `crews_name_uq` ON `crews` (`name`);--> statement-breakpoint
CREATE TABLE `deck_crews` (
	`deck_id` text NOT NULL,
	`crew_id` text NOT NULL,
	PRIMARY KEY(`deck_id`, `crew_id`),
	FOREIGN KEY (`deck_id`) REFERENCES `decks`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`crew_id`) REFERENCES `crews`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `deck_crews_crew_idx` ON `deck_crews` (`crew_id`);--> statement-breakpoint
CREATE TABLE `decks` (
	`id` text PRIMARY KEY NOT NULL,
	`title` text NOT NULL,
	`description` text DEFAULT '' NOT NULL,
	`category` text NOT NULL,
	`owner_id` text NOT NULL,
	`status` text DEFAULT 'draft' NOT NULL,
	`hesitation_ms` integer DEFAULT 1500 NOT NULL,
	`window_ms` integer DEFAULT 5000 NOT NULL,
	`new_per_day` integer DEFAULT 10 NOT NULL,
	`retention` real DEFAULT 0.9 NOT NULL,
	`choice_count` integer DEFAULT 4 NOT NULL,
	`answer_mode` text DEFAULT 'choices' NOT NULL,
	`min_exposure_ms` integer DEFAULT 200 NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`owner_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `invitations` (
	`id` text PRIMARY KEY NOT NULL,
	`token_hash` text NOT NULL,
	`email` text NOT NULL,
	`role` text NOT NULL,
	`crew_id` text,
	`invited_by` text NOT NULL,
	`expires_at` integer NOT NULL,
	`used_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`crew_id`) REFERENCES `crews`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`invited_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `invitations_token_uq` ON `invitations` (`token_hash`);--> statement-breakpoint
CREATE TABLE `jobs` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`deck_id` text,
	`kind` text NOT NULL,
	`state` text DEFAULT 'queued' NOT NULL,
	`progress` real DEFAULT 0 NOT NULL,
	`message` text,
	`file_name` text,
	`view_id` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`deck_id`) REFERENCES `decks`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `look_alikes` (
	`type_id` text NOT NULL,
	`other_id` text NOT NULL,
	PRIMARY KEY(`type_id`, `other_id`),
	FOREIGN KEY (`type_id`) REFERENCES `target_types`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`other_id`) REFERENCES `target_types`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `mails` (
	`id` text PRIMARY KEY NOT NULL,
	`to` text NOT NULL,
	`subject` text NOT NULL,
	`text` text NOT NULL,
	`html` text NOT NULL,
	`transport` text NOT NULL,
	`status` text NOT NULL,
	`error` text,
	`sent_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);
--> statement-breakpoint
CREATE INDEX `mails_sent_idx` ON `mails` (`sent_at`);--> statement-breakpoint
CREATE TABLE `memberships` (
	`crew_id` text NOT NULL,
	`user_id` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	PRIMARY KEY(`crew_id`, `user_id`),
	FOREIGN KEY (`crew_id`) REFERENCES `crews`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `memberships_user_idx` ON `memberships` (`user_id`);--> statement-breakpoint
CREATE TABLE `password_resets` (
	`id` text PRIMARY KEY NOT NULL,
	`token_hash` text NOT NULL,
	`user_id` text NOT NULL,
	`expires_at` integer NOT NULL,
	`used_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `password_resets_token_uq` ON `password_resets` (`token_hash`);--> statement-breakpoint
CREATE TABLE `scan_drill_crews` (
	`drill_id` text NOT NULL,
	`crew_id` text NOT NULL,
	PRIMARY KEY(`drill_id`, `crew_id`),
	FOREIGN KEY (`drill_id`) REFERENCES `scan_drills`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`crew_id`) REFERENCES `crews`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `scan_drills` (
	`id` text PRIMARY KEY NOT NULL,
	`title` text NOT NULL,
	`settings` text NOT NULL,
	`created_by` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `scan_passes` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`drill_id` text,
	`score` text NOT NULL,
	`coverage` real NOT NULL,
	`contacts_found` integer NOT NULL,
	`contacts_shown` integer NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`drill_id`) REFERENCES `scan_drills`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `scan_passes_user_idx` ON `scan_passes` (`user_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `sightings` (
	`id` text PRIMARY KEY NOT NULL,
	`watch_id` text NOT NULL,
	`user_id` text NOT NULL,
	`track_id` text,
	`target_type_id` text NOT NULL,
	`position` integer NOT NULL,
	`variant_id` text,
	`aspect` text NOT NULL,
	`condition` text NOT NULL,
	`range_m` real NOT NULL,
	`binoculars` integer DEFAULT true NOT NULL,
	`apparent_px` real NOT NULL,
	`exposure_ms` integer NOT NULL,
	`window_ms` integer NOT NULL,
	`choices` text NOT NULL,
	`answer_choice_id` text NOT NULL,
	`reshow_of` text,
	`voided_at` integer,
	`issued_at` integer NOT NULL,
	FOREIGN KEY (`watch_id`) REFERENCES `watches`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`track_id`) REFERENCES `tracks`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`target_type_id`) REFERENCES `target_types`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`variant_id`) REFERENCES `variants`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `sightings_watch_idx` ON `sightings` (`watch_id`,`position`);--> statement-breakpoint
CREATE TABLE `tap_baselines` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`simple_ms` real NOT NULL,
	`choice_ms` real NOT NULL,
	`trials` integer NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `tap_baselines_user_idx` ON `tap_baselines` (`user_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `target_types` (
	`id` text PRIMARY KEY NOT NULL,
	`deck_id` text NOT NULL,
	`name` text NOT NULL,
	`category` text NOT NULL,
	`affiliation` text NOT NULL,
	`size_m` real NOT NULL,
	`features` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`deck_id`) REFERENCES `decks`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `target_types_deck_name_uq` ON `target_types` (`deck_id`,`name`);--> statement-breakpoint
CREATE TABLE `tracks` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`deck_id` text NOT NULL,
	`target_type_id` text NOT NULL,
	`aspect` text NOT NULL,
	`due` integer NOT NULL,
	`stability` real DEFAULT 0 NOT NULL,
	`difficulty` real DEFAULT 0 NOT NULL,
	`elapsed_days` integer DEFAULT 0 NOT NULL,
	`scheduled_days` integer DEFAULT 0 NOT NULL,
	`learning_steps` integer DEFAULT 0 NOT NULL,
	`reps` integer DEFAULT 0 NOT NULL,
	`lapses` integer DEFAULT 0 NOT NULL,
	`state` integer DEFAULT 0 NOT NULL,
	`last_review` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`deck_id`) REFERENCES `decks`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`target_type_id`) REFERENCES `target_types`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `tracks_user_type_aspect_uq` ON `tracks` (`user_id`,`target_type_id`,`aspect`);--> statement-breakpoint
CREATE INDEX `tracks_user_deck_due_idx` ON `tracks` (`user_id`,`deck_id`,`due`);--> statement-breakpoint
CREATE TABLE `user_roles` (
	`user_id` text NOT NULL,
	`role` text NOT NULL,
	PRIMARY KEY(`user_id`, `role`),
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `users` (
	`id` text PRIMARY KEY NOT NULL,
	`email` text NOT NULL,
	`name` text NOT NULL,
	`password_hash` text NOT NULL,
	`disabled` integer DEFAULT false NOT NULL,
	`session_version` integer DEFAULT 1 NOT NULL,
	`night_mode` text DEFAULT 'auto' NOT NULL,
	`reminders_opt_out` integer DEFAULT false NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `users_email_uq` ON `users` (`email`);--> statement-breakpoint
CREATE TABLE `variants` (
	`id` text PRIMARY KEY NOT NULL,
	`view_id` text NOT NULL,
	`condition` text NOT NULL,
	`width` integer NOT NULL,
	`height` integer NOT NULL,
	`bytes` integer NOT NULL,
	`contrast` real NOT NULL,
	`file` text NOT NULL,
	FOREIGN KEY (`view_id`) REFERENCES `views`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `variants_view_idx` ON `variants` (`view_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `variants_file_uq` ON `variants` (`file`);--> statement-breakpoint
CREATE TABLE `views` (
	`id` text PRIMARY KEY NOT NULL,
	`target_type_id` text NOT NULL,
	`aspect` text NOT NULL,
	`source_sha` text NOT NULL,
	`width` integer NOT NULL,
	`height` integer NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`target_type_id`) REFERENCES `target_types`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `views_type_idx` ON `views` (`target_type_id`);--> statement-breakpoint
CREATE TABLE `watches` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`deck_id` text,
	`kind` text DEFAULT 'watch' NOT NULL,
	`check_id` text,
	`day` text NOT NULL,
	`status` text DEFAULT 'open' NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`closed_at` integer,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`deck_id`) REFERENCES `decks`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `watches_user_day_idx` ON `watches` (`user_id`,`day`);