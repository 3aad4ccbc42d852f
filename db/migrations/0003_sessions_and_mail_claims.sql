ALTER TABLE `users` ADD `session_generation` int DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `mail_outbox` ADD `claimed_until` timestamp;