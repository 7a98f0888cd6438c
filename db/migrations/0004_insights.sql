CREATE TABLE `insight_cause_tallies` (
	`shop_id` varchar(36) NOT NULL,
	`tree_id` varchar(36) NOT NULL,
	`make` varchar(120) NOT NULL,
	`model` varchar(120) NOT NULL,
	`end_node` varchar(64) NOT NULL,
	`runs` int NOT NULL,
	CONSTRAINT `insight_cause_tallies_shop_id_tree_id_make_model_end_node_pk` PRIMARY KEY(`shop_id`,`tree_id`,`make`,`model`,`end_node`)
);
--> statement-breakpoint
CREATE TABLE `insight_parts` (
	`shop_id` varchar(36) NOT NULL,
	`ended_at` datetime(3) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`tree_id` varchar(36) NOT NULL,
	`technician_id` varchar(36) NOT NULL,
	`unit_id` varchar(36),
	`site_id` varchar(36),
	`customer_id` varchar(36),
	`category` varchar(32) NOT NULL,
	`make` varchar(120) NOT NULL,
	`model` varchar(120) NOT NULL,
	`position` int NOT NULL,
	`part_number` varchar(60) NOT NULL,
	`description` varchar(300) NOT NULL,
	`quantity` int NOT NULL,
	CONSTRAINT `insight_parts_shop_id_ended_at_run_id_position_pk` PRIMARY KEY(`shop_id`,`ended_at`,`run_id`,`position`)
);
--> statement-breakpoint
CREATE TABLE `insight_readings` (
	`shop_id` varchar(36) NOT NULL,
	`ended_at` datetime(3) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`tree_id` varchar(36) NOT NULL,
	`technician_id` varchar(36) NOT NULL,
	`unit_id` varchar(36),
	`site_id` varchar(36),
	`customer_id` varchar(36),
	`category` varchar(32) NOT NULL,
	`make` varchar(120) NOT NULL,
	`model` varchar(120) NOT NULL,
	`seq` int NOT NULL,
	`node_key` varchar(64) NOT NULL,
	`verdict` enum('low','within','high','marginal') NOT NULL,
	CONSTRAINT `insight_readings_shop_id_ended_at_run_id_seq_pk` PRIMARY KEY(`shop_id`,`ended_at`,`run_id`,`seq`)
);
--> statement-breakpoint
CREATE TABLE `insight_runs` (
	`shop_id` varchar(36) NOT NULL,
	`ended_at` datetime(3) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`tree_id` varchar(36) NOT NULL,
	`technician_id` varchar(36) NOT NULL,
	`unit_id` varchar(36),
	`site_id` varchar(36),
	`customer_id` varchar(36),
	`category` varchar(32) NOT NULL,
	`make` varchar(120) NOT NULL,
	`model` varchar(120) NOT NULL,
	`status` enum('done','abandoned') NOT NULL,
	`version_id` varchar(36) NOT NULL,
	`call_id` varchar(36),
	`end_node` varchar(64),
	`root_cause` varchar(300),
	`started_at` datetime(3) NOT NULL,
	`diagnose_seconds` int,
	`job_minutes` int,
	`escalated` boolean NOT NULL,
	`first_on_call` boolean NOT NULL,
	`came_back` boolean NOT NULL DEFAULT false,
	CONSTRAINT `insight_runs_shop_id_ended_at_run_id_pk` PRIMARY KEY(`shop_id`,`ended_at`,`run_id`),
	CONSTRAINT `insight_runs_run_uq` UNIQUE(`run_id`)
);
--> statement-breakpoint
CREATE TABLE `insight_step_tallies` (
	`shop_id` varchar(36) NOT NULL,
	`tree_id` varchar(36) NOT NULL,
	`node_key` varchar(64) NOT NULL,
	`branch` varchar(220) NOT NULL,
	`runs` int NOT NULL,
	CONSTRAINT `insight_step_tallies_shop_id_tree_id_node_key_branch_pk` PRIMARY KEY(`shop_id`,`tree_id`,`node_key`,`branch`)
);
--> statement-breakpoint
CREATE INDEX `insight_parts_run_idx` ON `insight_parts` (`run_id`);--> statement-breakpoint
CREATE INDEX `insight_readings_run_idx` ON `insight_readings` (`run_id`);--> statement-breakpoint
CREATE INDEX `insight_runs_unit_idx` ON `insight_runs` (`shop_id`,`unit_id`,`ended_at`);--> statement-breakpoint
CREATE INDEX `service_calls_unit_opened_idx` ON `service_calls` (`shop_id`,`unit_id`,`opened_at`);