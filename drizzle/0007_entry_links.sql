CREATE TABLE `entry_links` (
	`entry_id` text PRIMARY KEY NOT NULL,
	`code_id` text NOT NULL,
	`position` integer NOT NULL,
	`prev_hash` text NOT NULL,
	`hash` text NOT NULL,
	FOREIGN KEY (`entry_id`) REFERENCES `entries`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`code_id`) REFERENCES `codes`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `entry_links_code_position_idx` ON `entry_links` (`code_id`,`position`);