DROP INDEX `fitment_variant`;--> statement-breakpoint
CREATE INDEX `fitment_revision_status_variant` ON `fitment` (`revision_id`,`status`,`variant_id`);--> statement-breakpoint
CREATE INDEX `fitment_variant_status_revision` ON `fitment` (`variant_id`,`status`,`revision_id`);--> statement-breakpoint
DROP INDEX `guides_state`;--> statement-breakpoint
CREATE INDEX `guides_state_published` ON `guides` (`state`,`published_at`);--> statement-breakpoint
CREATE INDEX `guides_published_revision` ON `guides` (`published_revision_id`);