ALTER TABLE `run_notes` ADD `client_at` datetime(3);--> statement-breakpoint
ALTER TABLE `run_photos` ADD `client_at` datetime(3);