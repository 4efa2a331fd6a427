ALTER TABLE `tray_items` ADD `lot` text;--> statement-breakpoint
ALTER TABLE `tray_items` ADD `expiry` text;