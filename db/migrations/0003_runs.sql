CREATE TABLE `escalations` (
	`id` varchar(36) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`reason` varchar(500) NOT NULL,
	`node_key` varchar(64),
	`from_tree` boolean NOT NULL DEFAULT false,
	`raised_by` varchar(36) NOT NULL,
	`raised_at` datetime(3) NOT NULL,
	`taken_by` varchar(36),
	`taken_at` datetime(3),
	`closed_at` datetime(3),
	CONSTRAINT `escalations_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `meters` (
	`id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`name` varchar(120) NOT NULL,
	`quantity` varchar(16) NOT NULL,
	`unit` varchar(16) NOT NULL,
	`range_max` double NOT NULL,
	`resolution` double NOT NULL,
	`percent` double NOT NULL,
	`counts` int NOT NULL,
	`retired_at` datetime(3),
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `meters_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `reports` (
	`id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`number` int NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`call_id` varchar(36),
	`created_by` varchar(36) NOT NULL,
	`created_at` datetime(3) NOT NULL,
	`sent_to` varchar(254),
	`sent_at` datetime(3),
	`send_count` int NOT NULL DEFAULT 0,
	`message_id` varchar(300),
	CONSTRAINT `reports_id` PRIMARY KEY(`id`),
	CONSTRAINT `reports_shop_number_uq` UNIQUE(`shop_id`,`number`),
	CONSTRAINT `reports_run_uq` UNIQUE(`run_id`)
);
--> statement-breakpoint
CREATE TABLE `run_notes` (
	`id` varchar(36) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`node_key` varchar(64) NOT NULL,
	`idempotency_key` varchar(36) NOT NULL,
	`text` text NOT NULL,
	`author_id` varchar(36) NOT NULL,
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `run_notes_id` PRIMARY KEY(`id`),
	CONSTRAINT `run_notes_run_key_uq` UNIQUE(`run_id`,`idempotency_key`)
);
--> statement-breakpoint
CREATE TABLE `run_parts` (
	`id` varchar(36) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`position` int NOT NULL,
	`part_number` varchar(60) NOT NULL,
	`description` varchar(300) NOT NULL,
	`quantity` int NOT NULL,
	CONSTRAINT `run_parts_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `run_photos` (
	`id` varchar(36) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`node_key` varchar(64) NOT NULL,
	`idempotency_key` varchar(36) NOT NULL,
	`object_key` varchar(200) NOT NULL,
	`content_type` varchar(40) NOT NULL,
	`bytes` int NOT NULL,
	`uploaded_by` varchar(36) NOT NULL,
	`created_at` datetime(3) NOT NULL,
	`deleted_at` datetime(3),
	CONSTRAINT `run_photos_id` PRIMARY KEY(`id`),
	CONSTRAINT `run_photos_run_key_uq` UNIQUE(`run_id`,`idempotency_key`)
);
--> statement-breakpoint
CREATE TABLE `run_steps` (
	`id` varchar(36) NOT NULL,
	`run_id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`seq` int NOT NULL,
	`idempotency_key` varchar(36) NOT NULL,
	`payload_hash` varchar(64) NOT NULL,
	`type` enum('answer','reading','nameplate','acknowledge','continue','undo') NOT NULL,
	`node_key` varchar(64),
	`kind` varchar(16),
	`answer` varchar(220),
	`typed` varchar(120),
	`value` double,
	`unit` varchar(16),
	`si_value` double,
	`si_unit` varchar(16),
	`verdict` enum('low','within','high','marginal'),
	`limits_lo` double,
	`limits_hi` double,
	`limits` json,
	`message` varchar(600),
	`meter_id` varchar(36),
	`meter` json,
	`uncertainty` double,
	`branch` varchar(220),
	`to_node` varchar(64),
	`undoes_seq` int,
	`undone` boolean NOT NULL DEFAULT false,
	`entered_by` varchar(36) NOT NULL,
	`client_at` datetime(3),
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `run_steps_id` PRIMARY KEY(`id`),
	CONSTRAINT `run_steps_run_seq_uq` UNIQUE(`run_id`,`seq`),
	CONSTRAINT `run_steps_run_key_uq` UNIQUE(`run_id`,`idempotency_key`)
);
--> statement-breakpoint
CREATE TABLE `runs` (
	`id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`call_id` varchar(36),
	`unit_id` varchar(36),
	`tree_id` varchar(36) NOT NULL,
	`version_id` varchar(36) NOT NULL,
	`technician_id` varchar(36) NOT NULL,
	`started_by` varchar(36) NOT NULL,
	`practice` boolean NOT NULL DEFAULT false,
	`scenario_id` varchar(36),
	`status` enum('active','paused','escalated','abandoned','done') NOT NULL,
	`step_count` int NOT NULL DEFAULT 0,
	`current_node` varchar(64),
	`end_kind` varchar(16),
	`end_node` varchar(64),
	`root_cause` varchar(300),
	`action_taken` text,
	`minutes_on_job` int,
	`abandon_reason` varchar(500),
	`started_at` datetime(3) NOT NULL,
	`paused_at` datetime(3),
	`completed_at` datetime(3),
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `runs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `service_calls` (
	`id` varchar(36) NOT NULL,
	`shop_id` varchar(36) NOT NULL,
	`number` int NOT NULL,
	`unit_id` varchar(36) NOT NULL,
	`symptom` varchar(300) NOT NULL,
	`priority` enum('low','normal','high','urgent') NOT NULL,
	`status` enum('open','in_progress','escalated','done','cancelled') NOT NULL,
	`assigned_to` varchar(36),
	`notes` text,
	`opened_by` varchar(36) NOT NULL,
	`opened_at` datetime(3) NOT NULL,
	`closed_at` datetime(3),
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `service_calls_id` PRIMARY KEY(`id`),
	CONSTRAINT `service_calls_shop_number_uq` UNIQUE(`shop_id`,`number`)
);
--> statement-breakpoint
ALTER TABLE `escalations` ADD CONSTRAINT `escalations_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `escalations` ADD CONSTRAINT `escalations_raised_by_users_id_fk` FOREIGN KEY (`raised_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `escalations` ADD CONSTRAINT `escalations_taken_by_users_id_fk` FOREIGN KEY (`taken_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `meters` ADD CONSTRAINT `meters_shop_id_shops_id_fk` FOREIGN KEY (`shop_id`) REFERENCES `shops`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reports` ADD CONSTRAINT `reports_shop_id_shops_id_fk` FOREIGN KEY (`shop_id`) REFERENCES `shops`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reports` ADD CONSTRAINT `reports_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reports` ADD CONSTRAINT `reports_call_id_service_calls_id_fk` FOREIGN KEY (`call_id`) REFERENCES `service_calls`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reports` ADD CONSTRAINT `reports_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_notes` ADD CONSTRAINT `run_notes_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_notes` ADD CONSTRAINT `run_notes_author_id_users_id_fk` FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_parts` ADD CONSTRAINT `run_parts_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_photos` ADD CONSTRAINT `run_photos_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_photos` ADD CONSTRAINT `run_photos_uploaded_by_users_id_fk` FOREIGN KEY (`uploaded_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_steps` ADD CONSTRAINT `run_steps_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_steps` ADD CONSTRAINT `run_steps_meter_id_meters_id_fk` FOREIGN KEY (`meter_id`) REFERENCES `meters`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_steps` ADD CONSTRAINT `run_steps_entered_by_users_id_fk` FOREIGN KEY (`entered_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_shop_id_shops_id_fk` FOREIGN KEY (`shop_id`) REFERENCES `shops`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_call_id_service_calls_id_fk` FOREIGN KEY (`call_id`) REFERENCES `service_calls`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_unit_id_equipment_units_id_fk` FOREIGN KEY (`unit_id`) REFERENCES `equipment_units`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_tree_id_trees_id_fk` FOREIGN KEY (`tree_id`) REFERENCES `trees`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_version_id_tree_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `tree_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_technician_id_users_id_fk` FOREIGN KEY (`technician_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_started_by_users_id_fk` FOREIGN KEY (`started_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `service_calls` ADD CONSTRAINT `service_calls_shop_id_shops_id_fk` FOREIGN KEY (`shop_id`) REFERENCES `shops`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `service_calls` ADD CONSTRAINT `service_calls_unit_id_equipment_units_id_fk` FOREIGN KEY (`unit_id`) REFERENCES `equipment_units`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `service_calls` ADD CONSTRAINT `service_calls_assigned_to_users_id_fk` FOREIGN KEY (`assigned_to`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `service_calls` ADD CONSTRAINT `service_calls_opened_by_users_id_fk` FOREIGN KEY (`opened_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `escalations_shop_idx` ON `escalations` (`shop_id`,`closed_at`);--> statement-breakpoint
CREATE INDEX `escalations_run_idx` ON `escalations` (`run_id`);--> statement-breakpoint
CREATE INDEX `meters_shop_idx` ON `meters` (`shop_id`);--> statement-breakpoint
CREATE INDEX `run_notes_run_idx` ON `run_notes` (`run_id`);--> statement-breakpoint
CREATE INDEX `run_parts_run_idx` ON `run_parts` (`run_id`);--> statement-breakpoint
CREATE INDEX `run_parts_shop_part_idx` ON `run_parts` (`shop_id`,`part_number`);--> statement-breakpoint
CREATE INDEX `run_photos_run_idx` ON `run_photos` (`run_id`);--> statement-breakpoint
CREATE INDEX `run_steps_shop_node_idx` ON `run_steps` (`shop_id`,`node_key`);--> statement-breakpoint
CREATE INDEX `runs_shop_status_idx` ON `runs` (`shop_id`,`status`);--> statement-breakpoint
CREATE INDEX `runs_call_idx` ON `runs` (`call_id`);--> statement-breakpoint
CREATE INDEX `runs_unit_idx` ON `runs` (`unit_id`);--> statement-breakpoint
CREATE INDEX `runs_technician_idx` ON `runs` (`technician_id`);--> statement-breakpoint
CREATE INDEX `runs_version_idx` ON `runs` (`version_id`);--> statement-breakpoint
CREATE INDEX `service_calls_shop_status_idx` ON `service_calls` (`shop_id`,`status`);--> statement-breakpoint
CREATE INDEX `service_calls_assigned_idx` ON `service_calls` (`assigned_to`,`status`);--> statement-breakpoint
CREATE INDEX `service_calls_unit_idx` ON `service_calls` (`unit_id`);