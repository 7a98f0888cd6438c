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
CREATE TABLE `insight_keys` (
	`id` int AUTO_INCREMENT NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`kind` enum('tree','technician','unit','site','customer','equipment','cause','node','part') NOT NULL,
	`name` varchar(400) NOT NULL,
	`category` varchar(32),
	`make` varchar(120),
	`model` varchar(120),
	`a` varchar(64),
	`b` varchar(300),
	CONSTRAINT `insight_keys_id` PRIMARY KEY(`id`),
	CONSTRAINT `insight_keys_name_uq` UNIQUE(`shop_id`,`kind`,`name`)
);
--> statement-breakpoint
CREATE TABLE `insight_parts` (
	`shop_id` varchar(36) NOT NULL,
	`ended_at` datetime(3) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`tree_k` int NOT NULL,
	`technician_k` int NOT NULL,
	`equipment_k` int NOT NULL,
	`unit_k` int,
	`site_k` int,
	`customer_k` int,
	`position` int NOT NULL,
	`part_k` int NOT NULL,
	`quantity` int NOT NULL,
	CONSTRAINT `insight_parts_shop_id_ended_at_run_id_position_pk` PRIMARY KEY(`shop_id`,`ended_at`,`run_id`,`position`)
);
--> statement-breakpoint
CREATE TABLE `insight_readings` (
	`shop_id` varchar(36) NOT NULL,
	`ended_at` datetime(3) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`tree_k` int NOT NULL,
	`technician_k` int NOT NULL,
	`equipment_k` int NOT NULL,
	`unit_k` int,
	`site_k` int,
	`customer_k` int,
	`seq` int NOT NULL,
	`node_k` int NOT NULL,
	`verdict` enum('low','within','high','marginal') NOT NULL,
	CONSTRAINT `insight_readings_shop_id_ended_at_run_id_seq_pk` PRIMARY KEY(`shop_id`,`ended_at`,`run_id`,`seq`)
);
--> statement-breakpoint
CREATE TABLE `insight_runs` (
	`shop_id` varchar(36) NOT NULL,
	`ended_at` datetime(3) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`tree_k` int NOT NULL,
	`technician_k` int NOT NULL,
	`equipment_k` int NOT NULL,
	`unit_k` int,
	`site_k` int,
	`customer_k` int,
	`status` enum('done','abandoned') NOT NULL,
	`cause_k` int,
	`end_node` varchar(64),
	`diagnose_seconds` int,
	`job_minutes` int,
	`escalated` boolean NOT NULL,
	`on_call` boolean NOT NULL,
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
CREATE INDEX `insight_runs_unit_idx` ON `insight_runs` (`shop_id`,`unit_k`,`ended_at`);--> statement-breakpoint
CREATE INDEX `service_calls_unit_opened_idx` ON `service_calls` (`shop_id`,`unit_id`,`opened_at`);