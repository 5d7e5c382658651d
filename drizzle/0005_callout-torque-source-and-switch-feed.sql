ALTER TABLE `callouts` ADD `torque_source` text;--> statement-breakpoint
ALTER TABLE `callouts` ADD `switch_feed` text;