CREATE TABLE `channel_aggressors` (
	`id` int AUTO_INCREMENT NOT NULL,
	`channel_id` int NOT NULL,
	`position` int NOT NULL,
	`name` varchar(200) NOT NULL,
	`kind` enum('next','fext') NOT NULL,
	`source` enum('ports','file','coupling') NOT NULL,
	`pulse` json NOT NULL,
	`coupling` json,
	`icn_rms_v` double NOT NULL,
	`derivation` json NOT NULL,
	`filename` varchar(255),
	`content_type` varchar(100),
	`size_bytes` int,
	`sha256` varchar(64),
	`bytes` longblob,
	`created_at` timestamp(3) NOT NULL DEFAULT (now()),
	`updated_at` timestamp(3) NOT NULL DEFAULT (now()) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `channel_aggressors_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `channel_aggressors` ADD CONSTRAINT `channel_aggressors_channel_id_channels_id_fk` FOREIGN KEY (`channel_id`) REFERENCES `channels`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `channel_aggressors_channel_idx` ON `channel_aggressors` (`channel_id`,`position`);