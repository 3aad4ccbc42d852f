-- Sites, varieties (with their seed lots) and coordinators' own traits belong to one program.
-- A database that already holds such rows but no program gets one to own them.
INSERT INTO `programs` (`slug`, `name`) SELECT 'default', 'Default program' FROM DUAL WHERE NOT EXISTS (SELECT 1 FROM `programs`) AND (EXISTS (SELECT 1 FROM `sites`) OR EXISTS (SELECT 1 FROM `varieties`) OR EXISTS (SELECT 1 FROM `traits` WHERE `built_in` = false));--> statement-breakpoint
ALTER TABLE `sites` ADD `program_id` int;--> statement-breakpoint
ALTER TABLE `varieties` ADD `program_id` int;--> statement-breakpoint
ALTER TABLE `traits` ADD `program_id` int;--> statement-breakpoint
-- Each row goes to the program of the first trial that uses it, or else to the first program.
UPDATE `sites` SET `program_id` = COALESCE(
  (SELECT t.`program_id` FROM `enrolments` e JOIN `trials` t ON t.`id` = e.`trial_id` WHERE e.`site_id` = `sites`.`id` ORDER BY e.`id` LIMIT 1),
  (SELECT MIN(p.`id`) FROM `programs` p));--> statement-breakpoint
UPDATE `varieties` SET `program_id` = COALESCE(
  (SELECT t.`program_id` FROM `trial_entries` te JOIN `trials` t ON t.`id` = te.`trial_id` WHERE te.`variety_id` = `varieties`.`id` ORDER BY te.`id` LIMIT 1),
  (SELECT MIN(p.`id`) FROM `programs` p));--> statement-breakpoint
UPDATE `traits` SET `program_id` = COALESCE(
  (SELECT t.`program_id` FROM `trial_traits` tt JOIN `trials` t ON t.`id` = tt.`trial_id` WHERE tt.`trait_id` = `traits`.`id` ORDER BY tt.`id` LIMIT 1),
  (SELECT MIN(p.`id`) FROM `programs` p))
  WHERE `built_in` = false;--> statement-breakpoint
ALTER TABLE `sites` MODIFY `program_id` int NOT NULL;--> statement-breakpoint
ALTER TABLE `varieties` MODIFY `program_id` int NOT NULL;--> statement-breakpoint
-- The crop foreign key needs an index of its own before the old (crop, name) key goes.
CREATE INDEX `varieties_crop_idx` ON `varieties` (`crop_id`);--> statement-breakpoint
ALTER TABLE `sites` DROP INDEX `sites_name_unique`;--> statement-breakpoint
ALTER TABLE `varieties` DROP INDEX `varieties_crop_name_unique`;--> statement-breakpoint
ALTER TABLE `traits` DROP INDEX `traits_code_unique`;--> statement-breakpoint
ALTER TABLE `sites` ADD CONSTRAINT `sites_program_name_unique` UNIQUE(`program_id`,`name`);--> statement-breakpoint
ALTER TABLE `varieties` ADD CONSTRAINT `varieties_program_crop_name_unique` UNIQUE(`program_id`,`crop_id`,`name`);--> statement-breakpoint
ALTER TABLE `traits` ADD CONSTRAINT `traits_program_code_unique` UNIQUE(`program_id`,`code`);--> statement-breakpoint
ALTER TABLE `sites` ADD CONSTRAINT `sites_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `varieties` ADD CONSTRAINT `varieties_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `traits` ADD CONSTRAINT `traits_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE restrict ON UPDATE no action;
