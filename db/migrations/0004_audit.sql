CREATE TABLE `audit_events` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`shop_id` varchar(36),
	`actor_id` varchar(36),
	`actor_email` varchar(254),
	`action` varchar(40) NOT NULL,
	`subject_type` varchar(24),
	`subject_id` varchar(64),
	`summary` varchar(500) NOT NULL,
	`details` json,
	`address` varchar(64),
	`at` datetime(3) NOT NULL,
	CONSTRAINT `audit_events_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE INDEX `audit_events_shop_at_idx` ON `audit_events` (`shop_id`,`at`);--> statement-breakpoint
CREATE INDEX `audit_events_shop_action_at_idx` ON `audit_events` (`shop_id`,`action`,`at`);