CREATE TABLE `scenario_drafts` (
	`scenario_id` text NOT NULL,
	`user_id` text NOT NULL,
	`base_revision_id` text NOT NULL,
	`content` text NOT NULL,
	`updated_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	PRIMARY KEY(`scenario_id`, `user_id`),
	FOREIGN KEY (`scenario_id`) REFERENCES `scenarios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`base_revision_id`) REFERENCES `scenario_revisions`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
ALTER TABLE `scenario_revisions` ADD `note` text;--> statement-breakpoint
ALTER TABLE `scenario_revisions` ADD `summary` text;--> statement-breakpoint
ALTER TABLE `scenario_revisions` ADD `merged_with` integer;