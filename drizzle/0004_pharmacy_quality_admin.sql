CREATE TABLE `beds` (
	`id` text PRIMARY KEY NOT NULL,
	`room_id` text NOT NULL,
	`name` text NOT NULL,
	`created_at` text NOT NULL,
	FOREIGN KEY (`room_id`) REFERENCES `rooms`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `beds_room_idx` ON `beds` (`room_id`);--> statement-breakpoint
CREATE TABLE `rooms` (
	`id` text PRIMARY KEY NOT NULL,
	`unit_id` text NOT NULL,
	`name` text NOT NULL,
	`created_at` text NOT NULL,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `rooms_unit_idx` ON `rooms` (`unit_id`);--> statement-breakpoint
CREATE TABLE `user_totp` (
	`user_id` text PRIMARY KEY NOT NULL,
	`secret_encrypted` text NOT NULL,
	`enabled_at` text,
	`recovery_codes` text NOT NULL,
	`created_at` text NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `reconciliation_addenda` (
	`id` text PRIMARY KEY NOT NULL,
	`code_id` text NOT NULL,
	`at` text NOT NULL,
	`user_id` text NOT NULL,
	`text` text NOT NULL,
	`changes` text,
	FOREIGN KEY (`code_id`) REFERENCES `reconciliations`(`code_id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `reconciliation_lines` (
	`id` text PRIMARY KEY NOT NULL,
	`code_id` text NOT NULL,
	`tray_item_id` text,
	`drug_key` text NOT NULL,
	`units_opened` integer DEFAULT 0 NOT NULL,
	`units_wasted` integer DEFAULT 0 NOT NULL,
	`waste_witness` text,
	`lot_numbers` text,
	`note` text,
	FOREIGN KEY (`code_id`) REFERENCES `reconciliations`(`code_id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `reconciliation_lines_code_idx` ON `reconciliation_lines` (`code_id`);--> statement-breakpoint
CREATE TABLE `reconciliations` (
	`code_id` text PRIMARY KEY NOT NULL,
	`tray_id` text,
	`status` text NOT NULL,
	`notes` text,
	`started_by` text NOT NULL,
	`started_at` text NOT NULL,
	`updated_at` text NOT NULL,
	`signed_by` text,
	`signed_at` text,
	FOREIGN KEY (`code_id`) REFERENCES `codes`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`started_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`signed_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `tray_items` (
	`id` text PRIMARY KEY NOT NULL,
	`tray_id` text NOT NULL,
	`drug_key` text NOT NULL,
	`label` text NOT NULL,
	`strength_amount` real NOT NULL,
	`strength_unit` text NOT NULL,
	`volume_ml` real,
	`quantity` integer NOT NULL,
	`controlled` integer DEFAULT false NOT NULL,
	`sort_order` integer DEFAULT 0 NOT NULL,
	FOREIGN KEY (`tray_id`) REFERENCES `tray_templates`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `tray_items_tray_idx` ON `tray_items` (`tray_id`);--> statement-breakpoint
CREATE TABLE `tray_templates` (
	`id` text PRIMARY KEY NOT NULL,
	`name` text NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `tray_templates_name_unique` ON `tray_templates` (`name`);--> statement-breakpoint
CREATE TABLE `unit_trays` (
	`unit_id` text PRIMARY KEY NOT NULL,
	`tray_id` text NOT NULL,
	FOREIGN KEY (`tray_id`) REFERENCES `tray_templates`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `code_metrics` (
	`code_id` text PRIMARY KEY NOT NULL,
	`arrest_at` text NOT NULL,
	`unit_id` text,
	`category` text NOT NULL,
	`first_rhythm` text,
	`outcome` text,
	`any_rosc` integer NOT NULL,
	`sustained_rosc` integer NOT NULL,
	`duration_seconds` real,
	`to_compressions_seconds` real,
	`to_first_shock_seconds` real,
	`to_first_epinephrine_seconds` real,
	`compression_fraction` real,
	`longest_pause_seconds` real,
	`max_pre_shock_pause_seconds` real,
	`targets_missed` text DEFAULT '' NOT NULL,
	`targets_missed_count` integer DEFAULT 0 NOT NULL,
	`computed_at` text NOT NULL,
	FOREIGN KEY (`code_id`) REFERENCES `codes`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `code_metrics_arrest_idx` ON `code_metrics` (`arrest_at`);--> statement-breakpoint
CREATE INDEX `code_metrics_unit_idx` ON `code_metrics` (`unit_id`,`arrest_at`);--> statement-breakpoint
CREATE INDEX `code_metrics_rhythm_idx` ON `code_metrics` (`first_rhythm`,`arrest_at`);--> statement-breakpoint
CREATE TABLE `quality_reviews` (
	`code_id` text PRIMARY KEY NOT NULL,
	`notes` text,
	`debrief_points` text,
	`reviewed_by` text,
	`reviewed_at` text,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`code_id`) REFERENCES `codes`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`reviewed_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
