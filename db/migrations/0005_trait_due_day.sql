ALTER TABLE `traits` ADD `due_by_day` smallint;--> statement-breakpoint
UPDATE `traits` SET `due_by_day` = 0 WHERE `built_in` = true AND `code` = 'seeds_sown';--> statement-breakpoint
UPDATE `traits` SET `due_by_day` = 14 WHERE `built_in` = true AND `code` IN ('emerged_final', 'emergence_date');
