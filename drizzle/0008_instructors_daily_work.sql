CREATE TABLE `removed_views` (
	`id` text PRIMARY KEY NOT NULL,
	`deck_id` text NOT NULL,
	`target_type_id` text NOT NULL,
	`aspect` text NOT NULL,
	`snapshot` text NOT NULL,
	`removed_by` text,
	`removed_at` integer NOT NULL,
	FOREIGN KEY (`deck_id`) REFERENCES `decks`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`target_type_id`) REFERENCES `target_types`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`removed_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `removed_views_deck_idx` ON `removed_views` (`deck_id`,`removed_at`);--> statement-breakpoint
DROP INDEX `variants_file_uq`;--> statement-breakpoint
CREATE INDEX `variants_file_idx` ON `variants` (`file`);--> statement-breakpoint
ALTER TABLE `checks` ADD `due_at` integer;--> statement-breakpoint
ALTER TABLE `checks` ADD `retired_at` integer;--> statement-breakpoint
ALTER TABLE `checks` ADD `target_type_ids` text;