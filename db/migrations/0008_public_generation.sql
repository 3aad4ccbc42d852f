CREATE TABLE `public_generation` (
	`id` tinyint NOT NULL,
	`stamp` char(36) NOT NULL,
	`changed_at` timestamp NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `public_generation_id` PRIMARY KEY(`id`)
);
