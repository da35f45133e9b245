CREATE TABLE `introductions` (
	`id` text PRIMARY KEY NOT NULL,
	`watch_id` text NOT NULL,
	`user_id` text NOT NULL,
	`track_id` text NOT NULL,
	`before_sighting_id` text NOT NULL,
	`ord` integer NOT NULL,
	`target_type_id` text NOT NULL,
	`aspect` text NOT NULL,
	`picture_id` text NOT NULL,
	`look_alike_type_id` text,
	`look_alike_picture_id` text,
	FOREIGN KEY (`watch_id`) REFERENCES `watches`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`track_id`) REFERENCES `tracks`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`before_sighting_id`) REFERENCES `sightings`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`target_type_id`) REFERENCES `target_types`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`picture_id`) REFERENCES `pictures`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`look_alike_type_id`) REFERENCES `target_types`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`look_alike_picture_id`) REFERENCES `pictures`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `introductions_watch_idx` ON `introductions` (`watch_id`,`ord`);--> statement-breakpoint
CREATE TABLE `pictures` (
	`id` text PRIMARY KEY NOT NULL,
	`watch_id` text NOT NULL,
	`user_id` text NOT NULL,
	`target_type_id` text NOT NULL,
	`aspect` text NOT NULL,
	`variant_id` text NOT NULL,
	FOREIGN KEY (`watch_id`) REFERENCES `watches`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`target_type_id`) REFERENCES `target_types`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`variant_id`) REFERENCES `variants`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `pictures_watch_type_aspect_uq` ON `pictures` (`watch_id`,`target_type_id`,`aspect`);--> statement-breakpoint
ALTER TABLE `watches` ADD `practice` integer DEFAULT false NOT NULL;