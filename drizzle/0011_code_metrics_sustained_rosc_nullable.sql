PRAGMA foreign_keys=OFF;--> statement-breakpoint
CREATE TABLE `__new_code_metrics` (
	`code_id` text PRIMARY KEY NOT NULL,
	`arrest_at` text NOT NULL,
	`unit_id` text,
	`category` text NOT NULL,
	`first_rhythm` text,
	`outcome` text,
	`any_rosc` integer NOT NULL,
	`sustained_rosc` integer,
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
INSERT INTO `__new_code_metrics`("code_id", "arrest_at", "unit_id", "category", "first_rhythm", "outcome", "any_rosc", "sustained_rosc", "duration_seconds", "to_compressions_seconds", "to_first_shock_seconds", "to_first_epinephrine_seconds", "compression_fraction", "longest_pause_seconds", "max_pre_shock_pause_seconds", "targets_missed", "targets_missed_count", "computed_at") SELECT "code_id", "arrest_at", "unit_id", "category", "first_rhythm", "outcome", "any_rosc", "sustained_rosc", "duration_seconds", "to_compressions_seconds", "to_first_shock_seconds", "to_first_epinephrine_seconds", "compression_fraction", "longest_pause_seconds", "max_pre_shock_pause_seconds", "targets_missed", "targets_missed_count", "computed_at" FROM `code_metrics`;--> statement-breakpoint
DROP TABLE `code_metrics`;--> statement-breakpoint
ALTER TABLE `__new_code_metrics` RENAME TO `code_metrics`;--> statement-breakpoint
PRAGMA foreign_keys=ON;--> statement-breakpoint
CREATE INDEX `code_metrics_arrest_idx` ON `code_metrics` (`arrest_at`);--> statement-breakpoint
CREATE INDEX `code_metrics_unit_idx` ON `code_metrics` (`unit_id`,`arrest_at`);--> statement-breakpoint
CREATE INDEX `code_metrics_rhythm_idx` ON `code_metrics` (`first_rhythm`,`arrest_at`);--> statement-breakpoint
-- The clinical core's rules changed (sustained ROSC may be unknown, PEA, the last stop of an ended code): the
-- rows are derived data, so drop them and let the server recompute every ended code at start.
DELETE FROM `code_metrics`;
