DROP INDEX `parts_project_file_name_idx`;--> statement-breakpoint
ALTER TABLE `parts` ADD `part_version` integer DEFAULT 1 NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX `parts_project_file_name_version_idx` ON `parts` (`project_id`,`file_name`,`part_version`);