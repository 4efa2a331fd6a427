CREATE TABLE `record_seals` (
	`code_id` text PRIMARY KEY NOT NULL,
	`entries` integer NOT NULL,
	`head` text NOT NULL,
	`signatures` integer NOT NULL,
	`attachments` text NOT NULL,
	`mac` text NOT NULL,
	`sealed_at` text NOT NULL,
	FOREIGN KEY (`code_id`) REFERENCES `codes`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
ALTER TABLE `codes` ADD `facility_name` text;--> statement-breakpoint
ALTER TABLE `entries` ADD `user_name` text;