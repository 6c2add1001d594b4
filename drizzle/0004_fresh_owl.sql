ALTER TABLE `sessions` ADD `created_at` integer;--> statement-breakpoint
ALTER TABLE `users` ADD `deactivated_at` integer;