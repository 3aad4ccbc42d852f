CREATE TABLE `client_saves` (
	`id` int AUTO_INCREMENT NOT NULL,
	`user_id` int NOT NULL,
	`client_save_id` varchar(36) NOT NULL,
	`trial_id` int NOT NULL,
	`site_id` int NOT NULL,
	`answer` mediumtext NOT NULL,
	`created_at` timestamp NOT NULL DEFAULT (now()),
	CONSTRAINT `client_saves_id` PRIMARY KEY(`id`),
	CONSTRAINT `client_saves_user_id_unique` UNIQUE(`user_id`,`client_save_id`)
);
--> statement-breakpoint
ALTER TABLE `client_saves` ADD CONSTRAINT `client_saves_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;