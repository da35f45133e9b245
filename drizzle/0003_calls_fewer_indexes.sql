DROP INDEX `calls_user_time_idx`;--> statement-breakpoint
DROP INDEX `calls_deck_time_idx`;