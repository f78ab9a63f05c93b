CREATE TABLE `sweep_channels` (
	`sweep_id` int NOT NULL,
	`position` int NOT NULL,
	`channel_id` int NOT NULL,
	`kind` enum('pulse-csv','step-csv','impulse-csv','touchstone','synthetic') NOT NULL,
	`pulse` json NOT NULL,
	`derivation` json NOT NULL,
	CONSTRAINT `sweep_channels_sweep_id_position_pk` PRIMARY KEY(`sweep_id`,`position`)
);
--> statement-breakpoint
CREATE TABLE `sweep_results` (
	`id` int AUTO_INCREMENT NOT NULL,
	`sweep_id` int NOT NULL,
	`channel_id` int NOT NULL,
	`corner_index` int NOT NULL,
	`limiter_headroom_v` double,
	`eye_height_v` double,
	`linear_headroom_v` double,
	`linear_reach_exhausted` boolean,
	`fewest_dfe_taps` int,
	`setting` json,
	`error` varchar(1000),
	`compute_ms` int NOT NULL,
	`job_id` int NOT NULL,
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `sweep_results_id` PRIMARY KEY(`id`),
	CONSTRAINT `sweep_results_pair` UNIQUE(`sweep_id`,`channel_id`,`corner_index`)
);
--> statement-breakpoint
CREATE TABLE `sweeps` (
	`id` int AUTO_INCREMENT NOT NULL,
	`name` varchar(200) NOT NULL,
	`job_id` int NOT NULL,
	`budget_id` int,
	`inputs` json NOT NULL,
	`pair_count` int NOT NULL,
	`summary` json,
	`engine_version` varchar(40),
	`created_by` varchar(36),
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	`updated_at` timestamp(3) NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `sweeps_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `jobs` MODIFY COLUMN `kind` enum('run','study','table-version','sweep','sweep-batch') NOT NULL;--> statement-breakpoint
ALTER TABLE `jobs` MODIFY COLUMN `status` enum('queued','waiting','running','done','failed') NOT NULL DEFAULT 'queued';--> statement-breakpoint
ALTER TABLE `jobs` ADD `queue` enum('embedded','bullmq') DEFAULT 'embedded' NOT NULL;--> statement-breakpoint
ALTER TABLE `jobs` ADD `parent_id` int;--> statement-breakpoint
ALTER TABLE `jobs` ADD `part` int;--> statement-breakpoint
ALTER TABLE `jobs` ADD `lock_token` varchar(36);--> statement-breakpoint
ALTER TABLE `jobs` ADD `result` json;--> statement-breakpoint
ALTER TABLE `sweep_channels` ADD CONSTRAINT `sweep_channels_sweep_id_sweeps_id_fk` FOREIGN KEY (`sweep_id`) REFERENCES `sweeps`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sweep_results` ADD CONSTRAINT `sweep_results_sweep_id_sweeps_id_fk` FOREIGN KEY (`sweep_id`) REFERENCES `sweeps`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sweeps` ADD CONSTRAINT `sweeps_job_id_jobs_id_fk` FOREIGN KEY (`job_id`) REFERENCES `jobs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sweeps` ADD CONSTRAINT `sweeps_budget_id_budgets_id_fk` FOREIGN KEY (`budget_id`) REFERENCES `budgets`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sweeps` ADD CONSTRAINT `sweeps_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `sweep_results_job_idx` ON `sweep_results` (`job_id`);--> statement-breakpoint
CREATE INDEX `jobs_queue_idx` ON `jobs` (`queue`,`status`,`id`);--> statement-breakpoint
CREATE INDEX `jobs_parent_idx` ON `jobs` (`parent_id`,`status`);