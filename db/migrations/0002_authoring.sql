CREATE TABLE `tree_images` (
	`id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`tree_id` varchar(36) NOT NULL,
	`object_key` varchar(200) NOT NULL,
	`mime` varchar(40) NOT NULL,
	`bytes` int NOT NULL,
	`filename` varchar(200) NOT NULL,
	`created_by` varchar(36) NOT NULL,
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `tree_images_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `tree_versions` ADD `updated_by` varchar(36);--> statement-breakpoint
ALTER TABLE `tree_versions` ADD `published_by` varchar(36);--> statement-breakpoint
ALTER TABLE `tree_versions` ADD `open_draft_of` varchar(36);--> statement-breakpoint
ALTER TABLE `tree_versions` ADD CONSTRAINT `tree_versions_open_draft_uq` UNIQUE(`open_draft_of`);--> statement-breakpoint
ALTER TABLE `tree_images` ADD CONSTRAINT `tree_images_shop_id_shops_id_fk` FOREIGN KEY (`shop_id`) REFERENCES `shops`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tree_images` ADD CONSTRAINT `tree_images_tree_id_trees_id_fk` FOREIGN KEY (`tree_id`) REFERENCES `trees`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tree_images` ADD CONSTRAINT `tree_images_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `tree_images_tree_idx` ON `tree_images` (`shop_id`,`tree_id`);