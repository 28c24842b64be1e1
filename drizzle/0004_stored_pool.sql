CREATE TABLE `pool_members` (
	`batch_version_id` int unsigned NOT NULL,
	`study_id` int unsigned NOT NULL,
	`report_id` int unsigned NOT NULL,
	`plan_hash` varchar(64) NOT NULL,
	`rows_total` int unsigned NOT NULL,
	`rows_complete` int unsigned NOT NULL,
	`residual_df` int NOT NULL,
	`delimiter` varchar(8),
	`decimal_mark` varchar(1),
	`encoding` varchar(40),
	CONSTRAINT `pool_members_batch_version_id` PRIMARY KEY(`batch_version_id`)
);
--> statement-breakpoint
CREATE TABLE `pool_states` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`study_id` int unsigned NOT NULL,
	`plan_version` int unsigned NOT NULL,
	`version_ids` json NOT NULL,
	`batches` int unsigned NOT NULL DEFAULT 0,
	`rows_total` int unsigned NOT NULL DEFAULT 0,
	`rows_complete` int unsigned NOT NULL DEFAULT 0,
	`parameters` int unsigned NOT NULL DEFAULT 0,
	`residual_df` int NOT NULL DEFAULT 0,
	`df_target` int unsigned NOT NULL DEFAULT 0,
	`state` json,
	`report` json,
	`error` text,
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `pool_states_id` PRIMARY KEY(`id`),
	CONSTRAINT `pool_states_study_uq` UNIQUE(`study_id`)
);
--> statement-breakpoint
ALTER TABLE `pool_members` ADD CONSTRAINT `pool_members_batch_version_id_batch_versions_id_fk` FOREIGN KEY (`batch_version_id`) REFERENCES `batch_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `pool_members` ADD CONSTRAINT `pool_members_study_id_studies_id_fk` FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `pool_states` ADD CONSTRAINT `pool_states_study_id_studies_id_fk` FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `pool_members_study_idx` ON `pool_members` (`study_id`);