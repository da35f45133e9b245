-- SQLite adds a NOT NULL column only with a default; every existing row becomes its own definition,
-- and a row inserted without one (raw SQL) is made its own by the trigger.
ALTER TABLE `target_types` ADD `definition_id` text NOT NULL DEFAULT '';--> statement-breakpoint
UPDATE `target_types` SET `definition_id` = `id`;--> statement-breakpoint
CREATE TRIGGER `target_types_own_definition` AFTER INSERT ON `target_types` WHEN NEW.`definition_id` = ''
BEGIN UPDATE `target_types` SET `definition_id` = NEW.`id` WHERE `id` = NEW.`id`; END;--> statement-breakpoint
CREATE INDEX `target_types_definition_idx` ON `target_types` (`definition_id`);
