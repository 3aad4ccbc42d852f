CREATE TABLE `sign_in_attempts` (
	`id` int AUTO_INCREMENT NOT NULL,
	`throttle_key` varchar(300) NOT NULL,
	`succeeded` boolean NOT NULL,
	`attempted_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `sign_in_attempts_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `user_tokens` (
	`id` int AUTO_INCREMENT NOT NULL,
	`user_id` int NOT NULL,
	`kind` enum('invite','password_reset') NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`expires_at` timestamp NOT NULL,
	`used_at` timestamp,
	`created_by_id` int,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `user_tokens_id` PRIMARY KEY(`id`),
	CONSTRAINT `user_tokens_hash_unique` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `users` (
	`id` int AUTO_INCREMENT NOT NULL,
	`email` varchar(254) NOT NULL,
	`name` varchar(120) NOT NULL,
	`role` enum('admin','coordinator','cooperator') NOT NULL,
	`password_hash` varchar(255),
	`phone` varchar(40),
	`active` boolean NOT NULL DEFAULT true,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	`updated_at` timestamp NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `users_id` PRIMARY KEY(`id`),
	CONSTRAINT `users_email_unique` UNIQUE(`email`)
);
--> statement-breakpoint
CREATE TABLE `program_coordinators` (
	`id` int AUTO_INCREMENT NOT NULL,
	`program_id` int NOT NULL,
	`user_id` int NOT NULL,
	CONSTRAINT `program_coordinators_id` PRIMARY KEY(`id`),
	CONSTRAINT `program_coordinators_unique` UNIQUE(`program_id`,`user_id`)
);
--> statement-breakpoint
CREATE TABLE `programs` (
	`id` int AUTO_INCREMENT NOT NULL,
	`slug` varchar(80) NOT NULL,
	`name` varchar(160) NOT NULL,
	`description` text,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `programs_id` PRIMARY KEY(`id`),
	CONSTRAINT `programs_slug_unique` UNIQUE(`slug`)
);
--> statement-breakpoint
CREATE TABLE `seasons` (
	`id` int AUTO_INCREMENT NOT NULL,
	`program_id` int NOT NULL,
	`name` varchar(80) NOT NULL,
	`year` int NOT NULL,
	`starts_on` date,
	`ends_on` date,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `seasons_id` PRIMARY KEY(`id`),
	CONSTRAINT `seasons_program_name_unique` UNIQUE(`program_id`,`name`)
);
--> statement-breakpoint
CREATE TABLE `site_cooperators` (
	`id` int AUTO_INCREMENT NOT NULL,
	`site_id` int NOT NULL,
	`user_id` int NOT NULL,
	CONSTRAINT `site_cooperators_id` PRIMARY KEY(`id`),
	CONSTRAINT `site_cooperators_unique` UNIQUE(`site_id`,`user_id`)
);
--> statement-breakpoint
CREATE TABLE `sites` (
	`id` int AUTO_INCREMENT NOT NULL,
	`name` varchar(160) NOT NULL,
	`kind` enum('farm','garden') NOT NULL,
	`region` varchar(120) NOT NULL,
	`latitude` decimal(9,6),
	`longitude` decimal(9,6),
	`growing_setup` enum('indoor_lights','greenhouse','high_tunnel','field') NOT NULL,
	`soil` varchar(160),
	`irrigation` varchar(160),
	`public_description` text,
	`contact_name` varchar(120),
	`contact_email` varchar(254),
	`contact_phone` varchar(40),
	`created_at` timestamp NOT NULL DEFAULT (now()),
	`updated_at` timestamp NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `sites_id` PRIMARY KEY(`id`),
	CONSTRAINT `sites_name_unique` UNIQUE(`name`)
);
--> statement-breakpoint
CREATE TABLE `crops` (
	`id` int AUTO_INCREMENT NOT NULL,
	`name` varchar(80) NOT NULL,
	`crop_group` enum('leafy_greens','brassicas','legumes','roots','alliums','fruiting','herbs','flowers') NOT NULL,
	`scientific_name` varchar(120),
	`created_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `crops_id` PRIMARY KEY(`id`),
	CONSTRAINT `crops_name_unique` UNIQUE(`name`)
);
--> statement-breakpoint
CREATE TABLE `seed_lots` (
	`id` int AUTO_INCREMENT NOT NULL,
	`variety_id` int NOT NULL,
	`source` varchar(120) NOT NULL,
	`lot_code` varchar(60) NOT NULL,
	`label_germination_pct` decimal(5,2),
	`germination_test_date` date,
	`packet_days_to_maturity` int,
	`treated` boolean NOT NULL DEFAULT false,
	`treatment` varchar(160),
	`created_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `seed_lots_id` PRIMARY KEY(`id`),
	CONSTRAINT `seed_lots_variety_source_lot_unique` UNIQUE(`variety_id`,`source`,`lot_code`)
);
--> statement-breakpoint
CREATE TABLE `varieties` (
	`id` int AUTO_INCREMENT NOT NULL,
	`crop_id` int NOT NULL,
	`name` varchar(120) NOT NULL,
	`description` text,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `varieties_id` PRIMARY KEY(`id`),
	CONSTRAINT `varieties_crop_name_unique` UNIQUE(`crop_id`,`name`)
);
--> statement-breakpoint
CREATE TABLE `traits` (
	`id` int AUTO_INCREMENT NOT NULL,
	`code` varchar(40) NOT NULL,
	`name` varchar(120) NOT NULL,
	`unit` varchar(40),
	`value_type` enum('count','date','number','rating','yes_no','text') NOT NULL,
	`min_value` decimal(14,4),
	`max_value` decimal(14,4),
	`due_days_after_sowing` json,
	`due_note` varchar(200),
	`computation` enum('none','days_from_sowing','days_from_transplant') NOT NULL DEFAULT 'none',
	`description` text,
	`built_in` boolean NOT NULL DEFAULT false,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `traits_id` PRIMARY KEY(`id`),
	CONSTRAINT `traits_code_unique` UNIQUE(`code`)
);
--> statement-breakpoint
CREATE TABLE `enrolments` (
	`id` int AUTO_INCREMENT NOT NULL,
	`trial_id` int NOT NULL,
	`site_id` int NOT NULL,
	`cooperator_id` int,
	`sown_on` date,
	`transplanted_on` date,
	`random_seed` int unsigned,
	`randomised_at` timestamp,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `enrolments_id` PRIMARY KEY(`id`),
	CONSTRAINT `enrolments_trial_site_unique` UNIQUE(`trial_id`,`site_id`)
);
--> statement-breakpoint
CREATE TABLE `plots` (
	`id` int AUTO_INCREMENT NOT NULL,
	`enrolment_id` int NOT NULL,
	`trial_id` int NOT NULL,
	`site_id` int NOT NULL,
	`entry_id` int NOT NULL,
	`plot_code` varchar(24) NOT NULL,
	`block` smallint NOT NULL,
	`position` smallint NOT NULL,
	`tray` smallint,
	`tray_slot` smallint,
	CONSTRAINT `plots_id` PRIMARY KEY(`id`),
	CONSTRAINT `plots_code_unique` UNIQUE(`trial_id`,`plot_code`),
	CONSTRAINT `plots_layout_unique` UNIQUE(`enrolment_id`,`block`,`position`)
);
--> statement-breakpoint
CREATE TABLE `trial_entries` (
	`id` int AUTO_INCREMENT NOT NULL,
	`trial_id` int NOT NULL,
	`variety_id` int NOT NULL,
	`seed_lot_id` int,
	`blind_code` varchar(8) NOT NULL,
	`entry_number` smallint NOT NULL,
	`is_check` boolean NOT NULL DEFAULT false,
	CONSTRAINT `trial_entries_id` PRIMARY KEY(`id`),
	CONSTRAINT `trial_entries_code_unique` UNIQUE(`trial_id`,`blind_code`),
	CONSTRAINT `trial_entries_variety_unique` UNIQUE(`trial_id`,`variety_id`),
	CONSTRAINT `trial_entries_number_unique` UNIQUE(`trial_id`,`entry_number`)
);
--> statement-breakpoint
CREATE TABLE `trial_traits` (
	`id` int AUTO_INCREMENT NOT NULL,
	`trial_id` int NOT NULL,
	`trait_id` int NOT NULL,
	`sort_order` smallint NOT NULL DEFAULT 0,
	CONSTRAINT `trial_traits_id` PRIMARY KEY(`id`),
	CONSTRAINT `trial_traits_unique` UNIQUE(`trial_id`,`trait_id`)
);
--> statement-breakpoint
CREATE TABLE `trials` (
	`id` int AUTO_INCREMENT NOT NULL,
	`program_id` int NOT NULL,
	`season_id` int NOT NULL,
	`crop_id` int NOT NULL,
	`code` varchar(40) NOT NULL,
	`title` varchar(200) NOT NULL,
	`purpose` text,
	`design` enum('rcbd','crd') NOT NULL DEFAULT 'rcbd',
	`blocks` smallint NOT NULL,
	`plot_unit` enum('insert','cells','bed_row') NOT NULL DEFAULT 'insert',
	`plot_size` smallint NOT NULL DEFAULT 6,
	`seeds_per_cell` smallint NOT NULL DEFAULT 1,
	`protocol` text,
	`status` enum('draft','open','collecting','analysing','published','archived') NOT NULL DEFAULT 'draft',
	`created_by_id` int,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	`updated_at` timestamp NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `trials_id` PRIMARY KEY(`id`),
	CONSTRAINT `trials_code_unique` UNIQUE(`code`)
);
--> statement-breakpoint
CREATE TABLE `observation_history` (
	`id` int AUTO_INCREMENT NOT NULL,
	`observation_id` int NOT NULL,
	`value_number` decimal(14,4),
	`value_date` date,
	`value_text` varchar(1000),
	`changed_by_id` int,
	`changed_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `observation_history_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `observations` (
	`id` int AUTO_INCREMENT NOT NULL,
	`plot_id` int NOT NULL,
	`trait_id` int NOT NULL,
	`occasion` smallint NOT NULL DEFAULT 0,
	`observed_on` date,
	`value_number` decimal(14,4),
	`value_date` date,
	`value_text` varchar(1000),
	`missing_reason` enum('not_sown','died','animal_damage','lost_label','weather','other'),
	`note` text,
	`recorded_by_id` int,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	`updated_at` timestamp NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `observations_id` PRIMARY KEY(`id`),
	CONSTRAINT `observations_plot_trait_occasion_unique` UNIQUE(`plot_id`,`trait_id`,`occasion`)
);
--> statement-breakpoint
CREATE TABLE `review_comments` (
	`id` int AUTO_INCREMENT NOT NULL,
	`submission_id` int NOT NULL,
	`plot_id` int,
	`observation_id` int,
	`body` text NOT NULL,
	`author_id` int,
	`resolved_at` timestamp,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `review_comments_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `submissions` (
	`id` int AUTO_INCREMENT NOT NULL,
	`enrolment_id` int NOT NULL,
	`status` enum('draft','submitted','returned','accepted') NOT NULL DEFAULT 'draft',
	`submitted_at` timestamp,
	`submitted_by_id` int,
	`reviewed_at` timestamp,
	`reviewed_by_id` int,
	`review_comment` text,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	`updated_at` timestamp NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `submissions_id` PRIMARY KEY(`id`),
	CONSTRAINT `submissions_enrolment_unique` UNIQUE(`enrolment_id`)
);
--> statement-breakpoint
CREATE TABLE `analysis_exclusions` (
	`id` int AUTO_INCREMENT NOT NULL,
	`trial_id` int NOT NULL,
	`site_id` int,
	`plot_id` int,
	`trait_id` int,
	`reason` text NOT NULL,
	`created_by_id` int,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `analysis_exclusions_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `published_reports` (
	`id` int AUTO_INCREMENT NOT NULL,
	`trial_id` int NOT NULL,
	`version` int NOT NULL,
	`trait_id` int,
	`settings` json NOT NULL,
	`snapshot` longtext NOT NULL,
	`change_note` text,
	`storage_key` varchar(200),
	`published_by_id` int,
	`published_at` timestamp NOT NULL DEFAULT (now()),
	`unpublished_at` timestamp,
	`unpublish_reason` text,
	CONSTRAINT `published_reports_id` PRIMARY KEY(`id`),
	CONSTRAINT `published_reports_version_unique` UNIQUE(`trial_id`,`version`)
);
--> statement-breakpoint
CREATE TABLE `audit_log` (
	`id` int AUTO_INCREMENT NOT NULL,
	`actor_id` int,
	`action` varchar(60) NOT NULL,
	`entity` varchar(40) NOT NULL,
	`entity_id` varchar(40) NOT NULL,
	`trial_id` int,
	`old_value` json,
	`new_value` json,
	`at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `audit_log_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `mail_outbox` (
	`id` int AUTO_INCREMENT NOT NULL,
	`to_address` varchar(254) NOT NULL,
	`subject` varchar(250) NOT NULL,
	`text_body` mediumtext NOT NULL,
	`html_body` mediumtext,
	`status` enum('pending','sent','failed') NOT NULL DEFAULT 'pending',
	`attempts` int NOT NULL DEFAULT 0,
	`last_error` text,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	`sent_at` timestamp,
	CONSTRAINT `mail_outbox_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `photos` (
	`id` int AUTO_INCREMENT NOT NULL,
	`enrolment_id` int NOT NULL,
	`plot_id` int,
	`storage_key` varchar(200) NOT NULL,
	`content_type` varchar(60) NOT NULL,
	`bytes` int NOT NULL,
	`caption` varchar(300),
	`taken_on` date,
	`kept_location` boolean NOT NULL DEFAULT false,
	`uploaded_by_id` int,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `photos_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `user_tokens` ADD CONSTRAINT `user_tokens_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `user_tokens` ADD CONSTRAINT `user_tokens_created_by_id_users_id_fk` FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `program_coordinators` ADD CONSTRAINT `program_coordinators_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `program_coordinators` ADD CONSTRAINT `program_coordinators_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `seasons` ADD CONSTRAINT `seasons_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `site_cooperators` ADD CONSTRAINT `site_cooperators_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `site_cooperators` ADD CONSTRAINT `site_cooperators_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `seed_lots` ADD CONSTRAINT `seed_lots_variety_id_varieties_id_fk` FOREIGN KEY (`variety_id`) REFERENCES `varieties`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `varieties` ADD CONSTRAINT `varieties_crop_id_crops_id_fk` FOREIGN KEY (`crop_id`) REFERENCES `crops`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `enrolments` ADD CONSTRAINT `enrolments_trial_id_trials_id_fk` FOREIGN KEY (`trial_id`) REFERENCES `trials`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `enrolments` ADD CONSTRAINT `enrolments_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `enrolments` ADD CONSTRAINT `enrolments_cooperator_id_users_id_fk` FOREIGN KEY (`cooperator_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `plots` ADD CONSTRAINT `plots_enrolment_id_enrolments_id_fk` FOREIGN KEY (`enrolment_id`) REFERENCES `enrolments`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `plots` ADD CONSTRAINT `plots_trial_id_trials_id_fk` FOREIGN KEY (`trial_id`) REFERENCES `trials`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `plots` ADD CONSTRAINT `plots_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `plots` ADD CONSTRAINT `plots_entry_id_trial_entries_id_fk` FOREIGN KEY (`entry_id`) REFERENCES `trial_entries`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `trial_entries` ADD CONSTRAINT `trial_entries_trial_id_trials_id_fk` FOREIGN KEY (`trial_id`) REFERENCES `trials`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `trial_entries` ADD CONSTRAINT `trial_entries_variety_id_varieties_id_fk` FOREIGN KEY (`variety_id`) REFERENCES `varieties`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `trial_entries` ADD CONSTRAINT `trial_entries_seed_lot_id_seed_lots_id_fk` FOREIGN KEY (`seed_lot_id`) REFERENCES `seed_lots`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `trial_traits` ADD CONSTRAINT `trial_traits_trial_id_trials_id_fk` FOREIGN KEY (`trial_id`) REFERENCES `trials`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `trial_traits` ADD CONSTRAINT `trial_traits_trait_id_traits_id_fk` FOREIGN KEY (`trait_id`) REFERENCES `traits`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `trials` ADD CONSTRAINT `trials_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `trials` ADD CONSTRAINT `trials_season_id_seasons_id_fk` FOREIGN KEY (`season_id`) REFERENCES `seasons`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `trials` ADD CONSTRAINT `trials_crop_id_crops_id_fk` FOREIGN KEY (`crop_id`) REFERENCES `crops`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `trials` ADD CONSTRAINT `trials_created_by_id_users_id_fk` FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `observation_history` ADD CONSTRAINT `observation_history_observation_id_observations_id_fk` FOREIGN KEY (`observation_id`) REFERENCES `observations`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `observation_history` ADD CONSTRAINT `observation_history_changed_by_id_users_id_fk` FOREIGN KEY (`changed_by_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `observations` ADD CONSTRAINT `observations_plot_id_plots_id_fk` FOREIGN KEY (`plot_id`) REFERENCES `plots`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `observations` ADD CONSTRAINT `observations_trait_id_traits_id_fk` FOREIGN KEY (`trait_id`) REFERENCES `traits`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `observations` ADD CONSTRAINT `observations_recorded_by_id_users_id_fk` FOREIGN KEY (`recorded_by_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `review_comments` ADD CONSTRAINT `review_comments_submission_id_submissions_id_fk` FOREIGN KEY (`submission_id`) REFERENCES `submissions`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `review_comments` ADD CONSTRAINT `review_comments_plot_id_plots_id_fk` FOREIGN KEY (`plot_id`) REFERENCES `plots`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `review_comments` ADD CONSTRAINT `review_comments_observation_id_observations_id_fk` FOREIGN KEY (`observation_id`) REFERENCES `observations`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `review_comments` ADD CONSTRAINT `review_comments_author_id_users_id_fk` FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `submissions` ADD CONSTRAINT `submissions_enrolment_id_enrolments_id_fk` FOREIGN KEY (`enrolment_id`) REFERENCES `enrolments`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `submissions` ADD CONSTRAINT `submissions_submitted_by_id_users_id_fk` FOREIGN KEY (`submitted_by_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `submissions` ADD CONSTRAINT `submissions_reviewed_by_id_users_id_fk` FOREIGN KEY (`reviewed_by_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `analysis_exclusions` ADD CONSTRAINT `analysis_exclusions_trial_id_trials_id_fk` FOREIGN KEY (`trial_id`) REFERENCES `trials`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `analysis_exclusions` ADD CONSTRAINT `analysis_exclusions_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `analysis_exclusions` ADD CONSTRAINT `analysis_exclusions_plot_id_plots_id_fk` FOREIGN KEY (`plot_id`) REFERENCES `plots`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `analysis_exclusions` ADD CONSTRAINT `analysis_exclusions_trait_id_traits_id_fk` FOREIGN KEY (`trait_id`) REFERENCES `traits`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `analysis_exclusions` ADD CONSTRAINT `analysis_exclusions_created_by_id_users_id_fk` FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `published_reports` ADD CONSTRAINT `published_reports_trial_id_trials_id_fk` FOREIGN KEY (`trial_id`) REFERENCES `trials`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `published_reports` ADD CONSTRAINT `published_reports_trait_id_traits_id_fk` FOREIGN KEY (`trait_id`) REFERENCES `traits`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `published_reports` ADD CONSTRAINT `published_reports_published_by_id_users_id_fk` FOREIGN KEY (`published_by_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `audit_log` ADD CONSTRAINT `audit_log_actor_id_users_id_fk` FOREIGN KEY (`actor_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `photos` ADD CONSTRAINT `photos_enrolment_id_enrolments_id_fk` FOREIGN KEY (`enrolment_id`) REFERENCES `enrolments`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `photos` ADD CONSTRAINT `photos_plot_id_plots_id_fk` FOREIGN KEY (`plot_id`) REFERENCES `plots`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `photos` ADD CONSTRAINT `photos_uploaded_by_id_users_id_fk` FOREIGN KEY (`uploaded_by_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `sign_in_attempts_key_idx` ON `sign_in_attempts` (`throttle_key`,`attempted_at`);--> statement-breakpoint
CREATE INDEX `user_tokens_user_idx` ON `user_tokens` (`user_id`,`kind`);--> statement-breakpoint
CREATE INDEX `users_role_idx` ON `users` (`role`);--> statement-breakpoint
CREATE INDEX `site_cooperators_user_idx` ON `site_cooperators` (`user_id`);--> statement-breakpoint
CREATE INDEX `seed_lots_variety_idx` ON `seed_lots` (`variety_id`);--> statement-breakpoint
CREATE INDEX `enrolments_cooperator_idx` ON `enrolments` (`cooperator_id`);--> statement-breakpoint
CREATE INDEX `plots_entry_idx` ON `plots` (`entry_id`);--> statement-breakpoint
CREATE INDEX `plots_site_idx` ON `plots` (`site_id`,`trial_id`);--> statement-breakpoint
CREATE INDEX `trials_program_season_idx` ON `trials` (`program_id`,`season_id`);--> statement-breakpoint
CREATE INDEX `trials_status_idx` ON `trials` (`status`);--> statement-breakpoint
CREATE INDEX `observation_history_obs_idx` ON `observation_history` (`observation_id`);--> statement-breakpoint
CREATE INDEX `observations_trait_idx` ON `observations` (`trait_id`);--> statement-breakpoint
CREATE INDEX `review_comments_submission_idx` ON `review_comments` (`submission_id`);--> statement-breakpoint
CREATE INDEX `submissions_status_idx` ON `submissions` (`status`);--> statement-breakpoint
CREATE INDEX `analysis_exclusions_trial_idx` ON `analysis_exclusions` (`trial_id`);--> statement-breakpoint
CREATE INDEX `audit_log_entity_idx` ON `audit_log` (`entity`,`entity_id`);--> statement-breakpoint
CREATE INDEX `audit_log_trial_idx` ON `audit_log` (`trial_id`,`at`);--> statement-breakpoint
CREATE INDEX `mail_outbox_status_idx` ON `mail_outbox` (`status`,`created_at`);--> statement-breakpoint
CREATE INDEX `photos_enrolment_idx` ON `photos` (`enrolment_id`);--> statement-breakpoint
CREATE INDEX `photos_plot_idx` ON `photos` (`plot_id`);