ALTER TABLE `traits` ADD `better_when` enum('higher','lower','neither') DEFAULT 'neither' NOT NULL;--> statement-breakpoint
ALTER TABLE `trial_traits` ADD `better_when` enum('higher','lower','neither');--> statement-breakpoint
UPDATE `traits` SET `better_when` = 'higher' WHERE `built_in` = true AND `code` IN ('marketable_yield', 'quality', 'emerged_final', 'emergence_count');--> statement-breakpoint
UPDATE `traits` SET `better_when` = 'lower' WHERE `built_in` = true AND `code` IN ('emergence_date', 'bolting');
