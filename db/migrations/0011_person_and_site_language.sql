ALTER TABLE `users` ADD `locale` enum('en','es') DEFAULT 'en' NOT NULL;--> statement-breakpoint
ALTER TABLE `sites` ADD `print_locale` enum('en','es');