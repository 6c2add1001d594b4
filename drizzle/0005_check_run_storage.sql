ALTER TABLE `check_runs` ADD `figures_gz` blob;--> statement-breakpoint
ALTER TABLE `check_runs` ADD `headline` text;--> statement-breakpoint
ALTER TABLE `check_runs` ADD `figures_bytes` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `check_runs` ADD `pinned` integer DEFAULT false NOT NULL;--> statement-breakpoint
CREATE INDEX `check_runs_retention_idx` ON `check_runs` (`scenario_id`,`check`,`revision_id`,`created_at`);--> statement-breakpoint
-- runs stored before this migration keep their JSON text in `figures`: give them a size and a headline
UPDATE `check_runs` SET `figures_bytes` = length(`figures`), `headline` = json_extract(`figures`, '$.headline') WHERE `figures` IS NOT NULL;
