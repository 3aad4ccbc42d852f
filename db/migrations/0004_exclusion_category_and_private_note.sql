ALTER TABLE `analysis_exclusions` ADD `category` enum('plot_damaged','not_sown','seed_mix_up','protocol_not_followed','site_data_incomplete','other') DEFAULT 'other' NOT NULL;--> statement-breakpoint
ALTER TABLE `analysis_exclusions` ADD `private_note` text;--> statement-breakpoint
UPDATE `analysis_exclusions` SET `private_note` = `reason`, `category` = 'other';--> statement-breakpoint
ALTER TABLE `analysis_exclusions` DROP COLUMN `reason`;
