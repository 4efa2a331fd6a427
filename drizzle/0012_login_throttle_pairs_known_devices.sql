CREATE TABLE `known_devices` (
	`device_hash` text NOT NULL,
	`username` text NOT NULL,
	`last_seen_at` integer NOT NULL,
	PRIMARY KEY(`device_hash`, `username`)
);
--> statement-breakpoint
CREATE INDEX `login_failures_ip_at_idx` ON `login_failures` (`ip`,`at`);--> statement-breakpoint
CREATE INDEX `login_failures_at_idx` ON `login_failures` (`at`);