CREATE TABLE `tree_branches` (
	`id` varchar(36) NOT NULL,
	`version_id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`from_key` varchar(64) NOT NULL,
	`branch_key` varchar(220) NOT NULL,
	`position` int NOT NULL,
	`to_key` varchar(64) NOT NULL,
	`recheck_max` int,
	`recheck_on_exceed` varchar(64),
	CONSTRAINT `tree_branches_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `tree_nodes` (
	`id` varchar(36) NOT NULL,
	`version_id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`node_key` varchar(64) NOT NULL,
	`position` int NOT NULL,
	`kind` varchar(16) NOT NULL,
	`title` varchar(300) NOT NULL,
	`body` text,
	`data` json NOT NULL,
	`x` double,
	`y` double,
	CONSTRAINT `tree_nodes_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `tree_versions` (
	`id` varchar(36) NOT NULL,
	`tree_id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`number` int,
	`state` enum('draft','published','retired') NOT NULL,
	`title` varchar(200) NOT NULL,
	`category` varchar(32) NOT NULL,
	`symptom` varchar(300) NOT NULL,
	`equipment` varchar(300),
	`description` text,
	`start_key` varchar(64) NOT NULL,
	`change_note` varchar(500),
	`author_id` varchar(36) NOT NULL,
	`based_on_id` varchar(36),
	`revision` int NOT NULL DEFAULT 1,
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	`published_at` datetime(3),
	`retired_at` datetime(3),
	CONSTRAINT `tree_versions_id` PRIMARY KEY(`id`),
	CONSTRAINT `tree_versions_tree_number_uq` UNIQUE(`tree_id`,`number`)
);
--> statement-breakpoint
CREATE TABLE `trees` (
	`id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`title` varchar(200) NOT NULL,
	`category` varchar(32) NOT NULL,
	`symptom` varchar(300) NOT NULL,
	`created_by` varchar(36) NOT NULL,
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `trees_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `tree_branches` ADD CONSTRAINT `tree_branches_version_id_tree_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `tree_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tree_nodes` ADD CONSTRAINT `tree_nodes_version_id_tree_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `tree_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tree_versions` ADD CONSTRAINT `tree_versions_tree_id_trees_id_fk` FOREIGN KEY (`tree_id`) REFERENCES `trees`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tree_versions` ADD CONSTRAINT `tree_versions_shop_id_shops_id_fk` FOREIGN KEY (`shop_id`) REFERENCES `shops`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tree_versions` ADD CONSTRAINT `tree_versions_author_id_users_id_fk` FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `trees` ADD CONSTRAINT `trees_shop_id_shops_id_fk` FOREIGN KEY (`shop_id`) REFERENCES `shops`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `trees` ADD CONSTRAINT `trees_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `tree_branches_version_idx` ON `tree_branches` (`version_id`,`from_key`);--> statement-breakpoint
CREATE INDEX `tree_nodes_version_idx` ON `tree_nodes` (`version_id`,`position`);--> statement-breakpoint
CREATE INDEX `tree_nodes_key_idx` ON `tree_nodes` (`version_id`,`node_key`);--> statement-breakpoint
CREATE INDEX `tree_versions_tree_idx` ON `tree_versions` (`tree_id`);--> statement-breakpoint
CREATE INDEX `trees_shop_idx` ON `trees` (`shop_id`);