CREATE TABLE `channel_sources` (
	`channel_id` int NOT NULL,
	`filename` varchar(255) NOT NULL,
	`content_type` varchar(100) NOT NULL,
	`size_bytes` int NOT NULL,
	`sha256` varchar(64) NOT NULL,
	`bytes` longblob NOT NULL,
	CONSTRAINT `channel_sources_channel_id` PRIMARY KEY(`channel_id`)
);
--> statement-breakpoint
CREATE TABLE `channels` (
	`id` int AUTO_INCREMENT NOT NULL,
	`program_id` int NOT NULL,
	`name` varchar(200) NOT NULL,
	`kind` enum('pulse-csv','step-csv','impulse-csv','touchstone','synthetic') NOT NULL,
	`bit_rate_bps` double NOT NULL,
	`pulse` json NOT NULL,
	`insertion_loss` json,
	`loss_at_nyquist_db` double,
	`main_cursor_v` double NOT NULL,
	`derivation` json NOT NULL,
	`created_by` varchar(36),
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	`updated_at` timestamp(3) NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `channels_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `programs` (
	`id` int AUTO_INCREMENT NOT NULL,
	`name` varchar(200) NOT NULL,
	`description` varchar(2000),
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	`updated_at` timestamp(3) NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `programs_id` PRIMARY KEY(`id`),
	CONSTRAINT `programs_name_unique` UNIQUE(`name`)
);
--> statement-breakpoint
CREATE TABLE `budgets` (
	`id` int AUTO_INCREMENT NOT NULL,
	`name` varchar(200) NOT NULL,
	`description` varchar(2000),
	`params` json NOT NULL,
	`created_by` varchar(36),
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	`updated_at` timestamp(3) NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `budgets_id` PRIMARY KEY(`id`),
	CONSTRAINT `budgets_name_unique` UNIQUE(`name`)
);
--> statement-breakpoint
CREATE TABLE `jobs` (
	`id` int AUTO_INCREMENT NOT NULL,
	`kind` enum('run','study','table-version') NOT NULL,
	`target_id` int NOT NULL,
	`status` enum('queued','running','done','failed') NOT NULL DEFAULT 'queued',
	`progress` double NOT NULL DEFAULT 0,
	`error` varchar(2000),
	`attempts` int NOT NULL DEFAULT 0,
	`locked_by` varchar(64),
	`locked_until` timestamp(3),
	`started_at` timestamp(3),
	`finished_at` timestamp(3),
	`compute_ms` bigint,
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	`updated_at` timestamp(3) NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `jobs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `runs` (
	`id` int AUTO_INCREMENT NOT NULL,
	`job_id` int NOT NULL,
	`channel_id` int,
	`budget_id` int,
	`inputs` json NOT NULL,
	`result` json,
	`engine_version` varchar(40),
	`summary` json,
	`rerun_of` int,
	`created_by` varchar(36),
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	`updated_at` timestamp(3) NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `runs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `architecture_studies` (
	`id` int AUTO_INCREMENT NOT NULL,
	`name` varchar(200) NOT NULL,
	`job_id` int NOT NULL,
	`budget_id` int,
	`inputs` json NOT NULL,
	`result` json,
	`engine_version` varchar(40),
	`decision` json,
	`decided_by` varchar(36),
	`decided_at` timestamp(3),
	`created_by` varchar(36),
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	`updated_at` timestamp(3) NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `architecture_studies_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `tap_table_rows` (
	`id` int AUTO_INCREMENT NOT NULL,
	`version_id` int NOT NULL,
	`class_index` int NOT NULL,
	`class_name` varchar(100) NOT NULL,
	`codes` json NOT NULL,
	`values` json NOT NULL,
	`worst_headroom_v` double NOT NULL,
	`channel_count` int NOT NULL,
	CONSTRAINT `tap_table_rows_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `tap_table_versions` (
	`id` int AUTO_INCREMENT NOT NULL,
	`table_id` int NOT NULL,
	`version` int NOT NULL,
	`state` enum('computing','failed','ready','in-review','approved','changes-requested') NOT NULL DEFAULT 'computing',
	`job_id` int NOT NULL,
	`budget_id` int,
	`inputs` json NOT NULL,
	`result` json,
	`engine_version` varchar(40),
	`note` varchar(2000),
	`frozen_at` timestamp(3),
	`created_by` varchar(36),
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	`updated_at` timestamp(3) NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `tap_table_versions_id` PRIMARY KEY(`id`),
	CONSTRAINT `tap_table_versions_table_version` UNIQUE(`table_id`,`version`)
);
--> statement-breakpoint
CREATE TABLE `tap_tables` (
	`id` int AUTO_INCREMENT NOT NULL,
	`name` varchar(200) NOT NULL,
	`description` varchar(2000),
	`study_id` int,
	`created_by` varchar(36),
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	`updated_at` timestamp(3) NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `tap_tables_id` PRIMARY KEY(`id`),
	CONSTRAINT `tap_tables_name_unique` UNIQUE(`name`)
);
--> statement-breakpoint
CREATE TABLE `sign_off_comments` (
	`id` int AUTO_INCREMENT NOT NULL,
	`sign_off_id` int NOT NULL,
	`parent_id` int,
	`author_id` varchar(36) NOT NULL,
	`channel_name` varchar(200),
	`body` text NOT NULL,
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	CONSTRAINT `sign_off_comments_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `sign_offs` (
	`id` int AUTO_INCREMENT NOT NULL,
	`version_id` int NOT NULL,
	`requested_by` varchar(36) NOT NULL,
	`reviewer_id` varchar(36) NOT NULL,
	`state` enum('pending','approved','rejected') NOT NULL DEFAULT 'pending',
	`message` varchar(2000),
	`decision_comment` varchar(4000),
	`decided_at` timestamp(3),
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	`updated_at` timestamp(3) NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `sign_offs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `channel_sources` ADD CONSTRAINT `channel_sources_channel_id_channels_id_fk` FOREIGN KEY (`channel_id`) REFERENCES `channels`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `channels` ADD CONSTRAINT `channels_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `channels` ADD CONSTRAINT `channels_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `budgets` ADD CONSTRAINT `budgets_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_job_id_jobs_id_fk` FOREIGN KEY (`job_id`) REFERENCES `jobs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_channel_id_channels_id_fk` FOREIGN KEY (`channel_id`) REFERENCES `channels`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_budget_id_budgets_id_fk` FOREIGN KEY (`budget_id`) REFERENCES `budgets`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `architecture_studies` ADD CONSTRAINT `architecture_studies_job_id_jobs_id_fk` FOREIGN KEY (`job_id`) REFERENCES `jobs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `architecture_studies` ADD CONSTRAINT `architecture_studies_budget_id_budgets_id_fk` FOREIGN KEY (`budget_id`) REFERENCES `budgets`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `architecture_studies` ADD CONSTRAINT `architecture_studies_decided_by_users_id_fk` FOREIGN KEY (`decided_by`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `architecture_studies` ADD CONSTRAINT `architecture_studies_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tap_table_rows` ADD CONSTRAINT `tap_table_rows_version_id_tap_table_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `tap_table_versions`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tap_table_versions` ADD CONSTRAINT `tap_table_versions_table_id_tap_tables_id_fk` FOREIGN KEY (`table_id`) REFERENCES `tap_tables`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tap_table_versions` ADD CONSTRAINT `tap_table_versions_job_id_jobs_id_fk` FOREIGN KEY (`job_id`) REFERENCES `jobs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tap_table_versions` ADD CONSTRAINT `tap_table_versions_budget_id_budgets_id_fk` FOREIGN KEY (`budget_id`) REFERENCES `budgets`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tap_table_versions` ADD CONSTRAINT `tap_table_versions_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tap_tables` ADD CONSTRAINT `tap_tables_study_id_architecture_studies_id_fk` FOREIGN KEY (`study_id`) REFERENCES `architecture_studies`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tap_tables` ADD CONSTRAINT `tap_tables_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sign_off_comments` ADD CONSTRAINT `sign_off_comments_sign_off_id_sign_offs_id_fk` FOREIGN KEY (`sign_off_id`) REFERENCES `sign_offs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sign_off_comments` ADD CONSTRAINT `sign_off_comments_author_id_users_id_fk` FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sign_offs` ADD CONSTRAINT `sign_offs_version_id_tap_table_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `tap_table_versions`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sign_offs` ADD CONSTRAINT `sign_offs_requested_by_users_id_fk` FOREIGN KEY (`requested_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sign_offs` ADD CONSTRAINT `sign_offs_reviewer_id_users_id_fk` FOREIGN KEY (`reviewer_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `channels_program_idx` ON `channels` (`program_id`);--> statement-breakpoint
CREATE INDEX `jobs_status_idx` ON `jobs` (`status`,`id`);--> statement-breakpoint
CREATE INDEX `jobs_target_idx` ON `jobs` (`kind`,`target_id`);--> statement-breakpoint
CREATE INDEX `runs_channel_idx` ON `runs` (`channel_id`);--> statement-breakpoint
CREATE INDEX `runs_job_idx` ON `runs` (`job_id`);--> statement-breakpoint
CREATE INDEX `tap_table_rows_version_idx` ON `tap_table_rows` (`version_id`);--> statement-breakpoint
CREATE INDEX `sign_off_comments_idx` ON `sign_off_comments` (`sign_off_id`);--> statement-breakpoint
CREATE INDEX `sign_offs_version_idx` ON `sign_offs` (`version_id`);--> statement-breakpoint
CREATE INDEX `sign_offs_reviewer_idx` ON `sign_offs` (`reviewer_id`,`state`);