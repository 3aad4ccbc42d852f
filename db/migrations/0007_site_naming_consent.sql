ALTER TABLE `enrolments` ADD `named_in_results` boolean DEFAULT false NOT NULL;--> statement-breakpoint
-- Sites enrolled before consent was recorded were already published by name; they keep it. New enrolments start unnamed.
UPDATE `enrolments` SET `named_in_results` = true;
