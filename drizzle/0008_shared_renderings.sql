DROP INDEX `variants_file_uq`;--> statement-breakpoint
CREATE INDEX `variants_file_idx` ON `variants` (`file`);