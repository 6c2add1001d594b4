CREATE TABLE `signoffs` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` text NOT NULL,
	`scenario_id` text NOT NULL,
	`revision_id` text NOT NULL,
	`content_hash` text NOT NULL,
	`requested_by` text,
	`reviewer_id` text NOT NULL,
	`state` text DEFAULT 'requested' NOT NULL,
	`request_note` text DEFAULT '' NOT NULL,
	`comment` text DEFAULT '' NOT NULL,
	`created_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	`decided_at` integer,
	`updated_at` integer DEFAULT (unixepoch() * 1000) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`scenario_id`) REFERENCES `scenarios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`revision_id`) REFERENCES `scenario_revisions`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`requested_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`reviewer_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `signoffs_project_id_idx` ON `signoffs` (`project_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `signoffs_scenario_id_idx` ON `signoffs` (`scenario_id`);--> statement-breakpoint
CREATE INDEX `signoffs_reviewer_id_idx` ON `signoffs` (`reviewer_id`);