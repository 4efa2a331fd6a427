CREATE TABLE `protocol_versions` (
	`version` integer PRIMARY KEY NOT NULL,
	`settings` text NOT NULL,
	`saved_at` text NOT NULL,
	`saved_by` text,
	FOREIGN KEY (`saved_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
ALTER TABLE `codes` ADD `weight_source` text;--> statement-breakpoint
ALTER TABLE `codes` ADD `protocol_version` integer;--> statement-breakpoint
ALTER TABLE `codes` ADD `category_changed_at` text;