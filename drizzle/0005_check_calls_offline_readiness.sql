DROP INDEX `calls_user_deck_time_idx`;--> statement-breakpoint
DROP INDEX `calls_user_deck_pair_time_idx`;--> statement-breakpoint
ALTER TABLE `calls` ADD `kind` text DEFAULT 'watch' NOT NULL;--> statement-breakpoint
UPDATE `calls` SET `kind` = 'check' WHERE `sighting_id` IN (SELECT s.id FROM sightings s JOIN watches w ON w.id = s.watch_id WHERE w.kind = 'check');--> statement-breakpoint
CREATE INDEX `calls_user_deck_time_idx` ON `calls` (`user_id`,`deck_id`,`called_at`,`correct`,`grade`,`anticipation`,`latency_ms`,`aspect`,`condition`,`target_type_id`,`offline`) WHERE kind = 'watch';--> statement-breakpoint
CREATE INDEX `calls_user_deck_pair_time_idx` ON `calls` (`user_id`,`deck_id`,`target_type_id`,`aspect`,`called_at`,`offline`) WHERE kind = 'watch';--> statement-breakpoint
ALTER TABLE `crews` ADD `offline_counts` integer DEFAULT false NOT NULL;