ALTER TABLE `users` ADD `last_signed_in_at` timestamp;--> statement-breakpoint
ALTER TABLE `seasons` ADD `closed_at` timestamp;