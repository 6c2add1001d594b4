ALTER TABLE `check_runs` ADD `content_hash` text;--> statement-breakpoint
ALTER TABLE `check_runs` ADD `rules_hash` text;--> statement-breakpoint
ALTER TABLE `check_runs` ADD `engine_version` text;--> statement-breakpoint
ALTER TABLE `signoffs` ADD `waiver` text;--> statement-breakpoint
ALTER TABLE `signoffs` ADD `evidence` text;