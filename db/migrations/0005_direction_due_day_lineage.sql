ALTER TABLE `traits` ADD `due_by_day` smallint;--> statement-breakpoint
ALTER TABLE `traits` ADD `better_when` enum('higher','lower','neither') DEFAULT 'neither' NOT NULL;--> statement-breakpoint
ALTER TABLE `trial_traits` ADD `better_when` enum('higher','lower','neither');--> statement-breakpoint
ALTER TABLE `trials` ADD `previous_trial_id` int;--> statement-breakpoint
ALTER TABLE `trials` ADD CONSTRAINT `trials_previous_trial_id_trials_id_fk` FOREIGN KEY (`previous_trial_id`) REFERENCES `trials`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
UPDATE `traits` SET `better_when` = 'higher' WHERE `built_in` = true AND `code` IN ('marketable_yield', 'quality', 'emerged_final', 'emergence_count');--> statement-breakpoint
UPDATE `traits` SET `better_when` = 'lower' WHERE `built_in` = true AND `code` IN ('emergence_date', 'bolting');--> statement-breakpoint
UPDATE `traits` SET `due_by_day` = 0 WHERE `built_in` = true AND `code` = 'seeds_sown';--> statement-breakpoint
UPDATE `traits` SET `due_by_day` = 14 WHERE `built_in` = true AND `code` IN ('emerged_final', 'emergence_date');
