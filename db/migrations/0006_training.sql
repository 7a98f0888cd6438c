CREATE TABLE `training_assignments` (
	`id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`scenario_id` varchar(36) NOT NULL,
	`trainee_id` varchar(36) NOT NULL,
	`assigned_by` varchar(36) NOT NULL,
	`due_on` date,
	`run_id` varchar(36),
	`created_at` datetime(3) NOT NULL,
	`withdrawn_at` datetime(3),
	CONSTRAINT `training_assignments_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `training_comments` (
	`id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`seq` int NOT NULL,
	`node_key` varchar(64) NOT NULL,
	`text` text NOT NULL,
	`author_id` varchar(36) NOT NULL,
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `training_comments_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `training_reviews` (
	`id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`reviewer_id` varchar(36) NOT NULL,
	`note` text NOT NULL,
	`reviewed_at` datetime(3) NOT NULL,
	CONSTRAINT `training_reviews_id` PRIMARY KEY(`id`),
	CONSTRAINT `training_reviews_run_uq` UNIQUE(`run_id`)
);
--> statement-breakpoint
CREATE TABLE `training_scenarios` (
	`id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`tree_id` varchar(36) NOT NULL,
	`version_id` varchar(36) NOT NULL,
	`name` varchar(120) NOT NULL,
	`complaint` varchar(500) NOT NULL,
	`unit_text` varchar(300) NOT NULL,
	`fault_node` varchar(64) NOT NULL,
	`world` json NOT NULL,
	`check_status` enum('ready','failing') NOT NULL,
	`findings` json NOT NULL,
	`copied_from` varchar(36),
	`created_by` varchar(36) NOT NULL,
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	`retired_at` datetime(3),
	CONSTRAINT `training_scenarios_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `run_steps` ADD `trainee_call` enum('low','within','high','marginal');--> statement-breakpoint
ALTER TABLE `training_assignments` ADD CONSTRAINT `training_assignments_shop_id_shops_id_fk` FOREIGN KEY (`shop_id`) REFERENCES `shops`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_assignments` ADD CONSTRAINT `training_assignments_scenario_id_training_scenarios_id_fk` FOREIGN KEY (`scenario_id`) REFERENCES `training_scenarios`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_assignments` ADD CONSTRAINT `training_assignments_trainee_id_users_id_fk` FOREIGN KEY (`trainee_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_assignments` ADD CONSTRAINT `training_assignments_assigned_by_users_id_fk` FOREIGN KEY (`assigned_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_assignments` ADD CONSTRAINT `training_assignments_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_comments` ADD CONSTRAINT `training_comments_shop_id_shops_id_fk` FOREIGN KEY (`shop_id`) REFERENCES `shops`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_comments` ADD CONSTRAINT `training_comments_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_comments` ADD CONSTRAINT `training_comments_author_id_users_id_fk` FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_reviews` ADD CONSTRAINT `training_reviews_shop_id_shops_id_fk` FOREIGN KEY (`shop_id`) REFERENCES `shops`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_reviews` ADD CONSTRAINT `training_reviews_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_reviews` ADD CONSTRAINT `training_reviews_reviewer_id_users_id_fk` FOREIGN KEY (`reviewer_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_scenarios` ADD CONSTRAINT `training_scenarios_shop_id_shops_id_fk` FOREIGN KEY (`shop_id`) REFERENCES `shops`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_scenarios` ADD CONSTRAINT `training_scenarios_tree_id_trees_id_fk` FOREIGN KEY (`tree_id`) REFERENCES `trees`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_scenarios` ADD CONSTRAINT `training_scenarios_version_id_tree_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `tree_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `training_scenarios` ADD CONSTRAINT `training_scenarios_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `training_assignments_trainee_idx` ON `training_assignments` (`trainee_id`,`withdrawn_at`);--> statement-breakpoint
CREATE INDEX `training_assignments_scenario_idx` ON `training_assignments` (`scenario_id`);--> statement-breakpoint
CREATE INDEX `training_assignments_shop_idx` ON `training_assignments` (`shop_id`);--> statement-breakpoint
CREATE INDEX `training_comments_run_idx` ON `training_comments` (`run_id`,`seq`);--> statement-breakpoint
CREATE INDEX `training_reviews_shop_idx` ON `training_reviews` (`shop_id`);--> statement-breakpoint
CREATE INDEX `training_scenarios_shop_idx` ON `training_scenarios` (`shop_id`,`retired_at`);--> statement-breakpoint
CREATE INDEX `training_scenarios_version_idx` ON `training_scenarios` (`version_id`);