CREATE TABLE `shop_counters` (
	`shop_id` varchar(36) NOT NULL,
	`name` varchar(16) NOT NULL,
	`last` int NOT NULL,
	CONSTRAINT `shop_counters_shop_id_name_pk` PRIMARY KEY(`shop_id`,`name`)
);
--> statement-breakpoint
ALTER TABLE `shop_counters` ADD CONSTRAINT `shop_counters_shop_id_shops_id_fk` FOREIGN KEY (`shop_id`) REFERENCES `shops`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
INSERT INTO `shop_counters` (`shop_id`, `name`, `last`) SELECT `shop_id`, 'call', MAX(`number`) FROM `service_calls` GROUP BY `shop_id`;
--> statement-breakpoint
INSERT INTO `shop_counters` (`shop_id`, `name`, `last`) SELECT `shop_id`, 'report', MAX(`number`) FROM `reports` GROUP BY `shop_id`;
