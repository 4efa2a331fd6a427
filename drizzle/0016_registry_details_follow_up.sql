CREATE TABLE `utstein_addenda` (
	`id` text PRIMARY KEY NOT NULL,
	`code_id` text NOT NULL,
	`recorded_at` text NOT NULL,
	`user_id` text NOT NULL,
	`user_name` text NOT NULL,
	`changes` text NOT NULL,
	FOREIGN KEY (`code_id`) REFERENCES `codes`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `utstein_addenda_code_idx` ON `utstein_addenda` (`code_id`,`recorded_at`);--> statement-breakpoint
CREATE TABLE `code_follow_ups` (
	`code_id` text PRIMARY KEY NOT NULL,
	`survival_to_discharge` text,
	`survival_to_discharge_date` text,
	`survival_to_discharge_by` text,
	`survival_to_discharge_by_name` text,
	`survival_to_discharge_at` text,
	`status_30_days` text,
	`status_30_days_date` text,
	`status_30_days_by` text,
	`status_30_days_by_name` text,
	`status_30_days_at` text,
	`neurological_outcome` text,
	`neurological_outcome_date` text,
	`neurological_outcome_by` text,
	`neurological_outcome_by_name` text,
	`neurological_outcome_at` text,
	`complete` integer DEFAULT false NOT NULL,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`code_id`) REFERENCES `codes`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`survival_to_discharge_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`status_30_days_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`neurological_outcome_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `code_follow_ups_complete_idx` ON `code_follow_ups` (`complete`);--> statement-breakpoint
ALTER TABLE `codes` ADD `utstein` text;--> statement-breakpoint
ALTER TABLE `record_seals` ADD `detail_addenda` text;--> statement-breakpoint
ALTER TABLE `code_metrics` ADD `witnessed_or_monitored` integer;