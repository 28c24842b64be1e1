CREATE TABLE `if_accepted_questions` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`batch_version_id` int unsigned NOT NULL,
	`study_id` int unsigned NOT NULL,
	`plan_version` int unsigned NOT NULL,
	`version_ids` json NOT NULL,
	`job_id` int unsigned NOT NULL,
	`computed_at` datetime(3) NOT NULL,
	`result` json,
	`error` text,
	CONSTRAINT `if_accepted_questions_id` PRIMARY KEY(`id`),
	CONSTRAINT `if_accepted_questions_version_uq` UNIQUE(`batch_version_id`)
);
--> statement-breakpoint
CREATE TABLE `pool_questions` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`study_id` int unsigned NOT NULL,
	`plan_version` int unsigned NOT NULL,
	`version_ids` json NOT NULL,
	`job_id` int unsigned NOT NULL,
	`computed_at` datetime(3) NOT NULL,
	`result` json,
	`error` text,
	CONSTRAINT `pool_questions_id` PRIMARY KEY(`id`),
	CONSTRAINT `pool_questions_study_uq` UNIQUE(`study_id`)
);
--> statement-breakpoint
ALTER TABLE `check_jobs` MODIFY COLUMN `batch_version_id` int unsigned;--> statement-breakpoint
ALTER TABLE `check_jobs` ADD `kind` enum('check','pool_questions') DEFAULT 'check' NOT NULL;--> statement-breakpoint
ALTER TABLE `check_jobs` ADD `study_id` int unsigned;--> statement-breakpoint
ALTER TABLE `check_jobs` ADD `candidate_version_id` int unsigned;--> statement-breakpoint
ALTER TABLE `if_accepted_questions` ADD CONSTRAINT `if_accepted_questions_batch_version_id_batch_versions_id_fk` FOREIGN KEY (`batch_version_id`) REFERENCES `batch_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `if_accepted_questions` ADD CONSTRAINT `if_accepted_questions_study_id_studies_id_fk` FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `pool_questions` ADD CONSTRAINT `pool_questions_study_id_studies_id_fk` FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `if_accepted_questions_study_idx` ON `if_accepted_questions` (`study_id`);--> statement-breakpoint
ALTER TABLE `check_jobs` ADD CONSTRAINT `check_jobs_study_id_studies_id_fk` FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `check_jobs` ADD CONSTRAINT `check_jobs_candidate_version_id_batch_versions_id_fk` FOREIGN KEY (`candidate_version_id`) REFERENCES `batch_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `check_jobs_kind_study_idx` ON `check_jobs` (`kind`,`study_id`,`status`);