CREATE TABLE `scan_starts` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`drill_id` text,
	`seed` integer NOT NULL,
	`seed_chosen` integer DEFAULT false NOT NULL,
	`settings` text NOT NULL,
	`issued_at` integer NOT NULL,
	`used_at` integer,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`drill_id`) REFERENCES `scan_drills`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `scan_starts_user_idx` ON `scan_starts` (`user_id`,`issued_at`);