CREATE TABLE `password_resets` (
	`id` varchar(36) NOT NULL,
	`user_id` varchar(36) NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`requested_by` varchar(36),
	`created_at` datetime(3) NOT NULL,
	`expires_at` datetime(3) NOT NULL,
	`used_at` datetime(3),
	CONSTRAINT `password_resets_id` PRIMARY KEY(`id`),
	CONSTRAINT `password_resets_token_uq` UNIQUE(`token_hash`)
);
--> statement-breakpoint
ALTER TABLE `memberships` ADD `deactivated_at` datetime(3);--> statement-breakpoint
ALTER TABLE `sessions` ADD `last_seen_at` datetime(3);--> statement-breakpoint
ALTER TABLE `sessions` ADD `user_agent` varchar(400);--> statement-breakpoint
ALTER TABLE `sessions` ADD `address` varchar(64);--> statement-breakpoint
ALTER TABLE `sign_in_attempts` ADD `purpose` enum('sign-in','password-reset') DEFAULT 'sign-in' NOT NULL;--> statement-breakpoint
ALTER TABLE `password_resets` ADD CONSTRAINT `password_resets_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `password_resets` ADD CONSTRAINT `password_resets_requested_by_users_id_fk` FOREIGN KEY (`requested_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `password_resets_user_idx` ON `password_resets` (`user_id`);