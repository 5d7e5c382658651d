CREATE TABLE `mail_opt_outs` (
	`user_id` integer NOT NULL,
	`kind` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `mail_opt_outs_user_kind` ON `mail_opt_outs` (`user_id`,`kind`);--> statement-breakpoint
CREATE TABLE `outbox` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`kind` text NOT NULL,
	`user_id` integer,
	`to` text NOT NULL,
	`subject` text NOT NULL,
	`text` text NOT NULL,
	`html` text NOT NULL,
	`state` text DEFAULT 'pending' NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`next_attempt_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`claimed_until` integer,
	`last_error` text,
	`sent_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `outbox_due` ON `outbox` (`state`,`next_attempt_at`);--> statement-breakpoint
CREATE TABLE `review_comments` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`revision_id` integer NOT NULL,
	`step_index` integer,
	`editor_id` integer NOT NULL,
	`body` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`revision_id`) REFERENCES `revisions`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`editor_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `review_comments_revision` ON `review_comments` (`revision_id`);--> statement-breakpoint
ALTER TABLE `audit_log` ADD `guide_id` integer REFERENCES guides(id);--> statement-breakpoint
CREATE INDEX `audit_guide` ON `audit_log` (`guide_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `audit_actor` ON `audit_log` (`actor_id`,`created_at`);--> statement-breakpoint
ALTER TABLE `caution_signoffs` ADD `wording` text;--> statement-breakpoint
ALTER TABLE `guides` ADD `unpublished_reason` text;--> statement-breakpoint
ALTER TABLE `guides` ADD `unpublished_at` integer;--> statement-breakpoint
ALTER TABLE `variants` ADD `retired_at` integer;