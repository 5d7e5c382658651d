-- Readers' own records (issue: my vehicles, parts checklists, fitment reports, work-through mode).
-- The tables existed with no code behind them; the columns added here are nullable or constant-default
-- because SQLite cannot add a column that defaults to an expression (the app sets updated_at).
CREATE TABLE `step_ticks` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`user_id` integer NOT NULL,
	`revision_id` integer NOT NULL,
	`position` integer NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`revision_id`) REFERENCES `revisions`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `step_ticks_reader_step` ON `step_ticks` (`user_id`,`revision_id`,`position`);--> statement-breakpoint
ALTER TABLE `checklist_items` ADD `note` text;--> statement-breakpoint
ALTER TABLE `checklist_items` ADD `source` text;--> statement-breakpoint
ALTER TABLE `checklist_items` ADD `step_index` integer;--> statement-breakpoint
ALTER TABLE `checklist_items` ADD `source_key` text;--> statement-breakpoint
ALTER TABLE `checklist_items` ADD `removed_at` integer;--> statement-breakpoint
ALTER TABLE `checklist_items` ADD `updated_at` integer;--> statement-breakpoint
ALTER TABLE `checklists` ADD `updated_at` integer;--> statement-breakpoint
ALTER TABLE `fitment_reports` ADD `vehicle_id` integer REFERENCES saved_vehicles(id) ON DELETE set null;--> statement-breakpoint
ALTER TABLE `fitment_reports` ADD `year` integer;--> statement-breakpoint
ALTER TABLE `fitment_reports` ADD `updated_at` integer;--> statement-breakpoint
ALTER TABLE `fitment_reports` ADD `hidden_at` integer;--> statement-breakpoint
ALTER TABLE `fitment_reports` ADD `hidden_by` integer REFERENCES users(id);--> statement-breakpoint
ALTER TABLE `fitment_reports` ADD `hidden_reason` text;--> statement-breakpoint
CREATE UNIQUE INDEX `fitment_reports_reader_variant` ON `fitment_reports` (`guide_id`,`user_id`,`variant_id`);--> statement-breakpoint
ALTER TABLE `saved_vehicles` ADD `current` integer DEFAULT false NOT NULL;