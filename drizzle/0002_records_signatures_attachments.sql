CREATE TABLE `attachments` (
	`id` text PRIMARY KEY NOT NULL,
	`code_id` text NOT NULL,
	`sha256` text NOT NULL,
	`filename` text NOT NULL,
	`media_type` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`uploaded_by` text NOT NULL,
	`uploaded_at` text NOT NULL,
	FOREIGN KEY (`code_id`) REFERENCES `codes`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`uploaded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `attachments_code_idx` ON `attachments` (`code_id`);--> statement-breakpoint
CREATE TABLE `mail_log` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`sent_at` text NOT NULL,
	`to` text NOT NULL,
	`subject` text NOT NULL,
	`code_id` text,
	`message_id` text,
	`status` text NOT NULL,
	`error` text
);
--> statement-breakpoint
CREATE TABLE `signatures` (
	`id` text PRIMARY KEY NOT NULL,
	`code_id` text NOT NULL,
	`user_id` text NOT NULL,
	`printed_name` text NOT NULL,
	`meaning` text NOT NULL,
	`signed_at` text NOT NULL,
	`record_digest` text NOT NULL,
	`server_signature` text NOT NULL,
	FOREIGN KEY (`code_id`) REFERENCES `codes`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `signatures_code_idx` ON `signatures` (`code_id`);--> statement-breakpoint
ALTER TABLE `codes` ADD `team` text;--> statement-breakpoint
ALTER TABLE `codes` ADD `debrief_notes` text;