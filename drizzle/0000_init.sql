CREATE TABLE `api_tokens` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`user_id` int unsigned NOT NULL,
	`name` varchar(100) NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`prefix` varchar(16) NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`last_used_at` datetime(3),
	`revoked_at` datetime(3),
	CONSTRAINT `api_tokens_id` PRIMARY KEY(`id`),
	CONSTRAINT `api_tokens_hash_uq` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `audit_events` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`actor_id` int unsigned,
	`action` varchar(80) NOT NULL,
	`object_type` varchar(40) NOT NULL,
	`object_id` varchar(64) NOT NULL,
	`study_id` int unsigned,
	`batch_id` int unsigned,
	`before` json,
	`after` json,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `audit_events_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `batch_versions` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`batch_id` int unsigned NOT NULL,
	`version` int unsigned NOT NULL,
	`plan_id` int unsigned NOT NULL,
	`file_key` varchar(200) NOT NULL,
	`file_url` varchar(1000) NOT NULL,
	`file_name` varchar(300) NOT NULL,
	`file_size` bigint unsigned NOT NULL,
	`content_hash` varchar(64),
	`state` enum('received','checking','ready','accepted','bounced','superseded','unreadable') NOT NULL DEFAULT 'received',
	`progress_rows` bigint unsigned NOT NULL DEFAULT 0,
	`progress_bytes` bigint unsigned NOT NULL DEFAULT 0,
	`uploaded_by_id` int unsigned,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`state_changed_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `batch_versions_id` PRIMARY KEY(`id`),
	CONSTRAINT `batch_versions_batch_version_uq` UNIQUE(`batch_id`,`version`),
	CONSTRAINT `batch_versions_file_key_uq` UNIQUE(`file_key`)
);
--> statement-breakpoint
CREATE TABLE `batches` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`public_id` varchar(32) NOT NULL,
	`study_id` int unsigned NOT NULL,
	`organisation_id` int unsigned NOT NULL,
	`title` varchar(300) NOT NULL,
	`latest_version` int unsigned NOT NULL DEFAULT 0,
	`created_by_id` int unsigned,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `batches_id` PRIMARY KEY(`id`),
	CONSTRAINT `batches_public_id_uq` UNIQUE(`public_id`)
);
--> statement-breakpoint
CREATE TABLE `check_jobs` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`batch_version_id` int unsigned NOT NULL,
	`status` enum('queued','running','done','failed') NOT NULL DEFAULT 'queued',
	`attempts` int unsigned NOT NULL DEFAULT 0,
	`locked_by` varchar(100),
	`heartbeat_at` datetime(3),
	`run_after` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`last_error` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`finished_at` datetime(3),
	CONSTRAINT `check_jobs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `data_plans` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`study_id` int unsigned NOT NULL,
	`version` int unsigned NOT NULL,
	`plan` json NOT NULL,
	`plan_hash` varchar(64) NOT NULL,
	`note` varchar(500),
	`created_by_id` int unsigned,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `data_plans_id` PRIMARY KEY(`id`),
	CONSTRAINT `data_plans_study_version_uq` UNIQUE(`study_id`,`version`)
);
--> statement-breakpoint
CREATE TABLE `decisions` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`batch_version_id` int unsigned NOT NULL,
	`decision` enum('accept','bounce') NOT NULL,
	`comment` text,
	`decided_by_id` int unsigned NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `decisions_id` PRIMARY KEY(`id`),
	CONSTRAINT `decisions_version_uq` UNIQUE(`batch_version_id`)
);
--> statement-breakpoint
CREATE TABLE `email_outbox` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`dedupe_key` varchar(200) NOT NULL,
	`kind` varchar(40) NOT NULL,
	`to_address` varchar(320) NOT NULL,
	`subject` varchar(500) NOT NULL,
	`text_body` text NOT NULL,
	`html_body` text NOT NULL,
	`batch_id` int unsigned,
	`status` enum('pending','sending','sent','failed') NOT NULL DEFAULT 'pending',
	`attempts` int unsigned NOT NULL DEFAULT 0,
	`next_attempt_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`last_error` text,
	`message_id` varchar(300),
	`sent_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `email_outbox_id` PRIMARY KEY(`id`),
	CONSTRAINT `email_outbox_dedupe_uq` UNIQUE(`dedupe_key`)
);
--> statement-breakpoint
CREATE TABLE `finding_comments` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`decision_id` int unsigned,
	`batch_version_id` int unsigned NOT NULL,
	`finding_code` varchar(80) NOT NULL,
	`columns` varchar(1000) NOT NULL DEFAULT '',
	`comment` text NOT NULL,
	`author_id` int unsigned NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `finding_comments_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `organisations` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`name` varchar(200) NOT NULL,
	`slug` varchar(100) NOT NULL,
	`kind` enum('provider','team') NOT NULL DEFAULT 'provider',
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `organisations_id` PRIMARY KEY(`id`),
	CONSTRAINT `organisations_slug_uq` UNIQUE(`slug`)
);
--> statement-breakpoint
CREATE TABLE `reports` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`batch_version_id` int unsigned NOT NULL,
	`plan_id` int unsigned NOT NULL,
	`status` enum('checked','unreadable') NOT NULL,
	`report` json NOT NULL,
	`engine_state` json,
	`blockers` int unsigned NOT NULL DEFAULT 0,
	`warnings` int unsigned NOT NULL DEFAULT 0,
	`notes` int unsigned NOT NULL DEFAULT 0,
	`complete_cases` int unsigned NOT NULL DEFAULT 0,
	`residual_df` int NOT NULL DEFAULT 0,
	`engine_version` varchar(40) NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `reports_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `studies` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`slug` varchar(100) NOT NULL,
	`title` varchar(300) NOT NULL,
	`description` text,
	`team_organisation_id` int unsigned,
	`status` enum('open','closed') NOT NULL DEFAULT 'open',
	`current_plan_version` int unsigned,
	`created_by_id` int unsigned,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `studies_id` PRIMARY KEY(`id`),
	CONSTRAINT `studies_slug_uq` UNIQUE(`slug`)
);
--> statement-breakpoint
CREATE TABLE `study_analysts` (
	`study_id` int unsigned NOT NULL,
	`user_id` int unsigned NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `study_analysts_study_id_user_id_pk` PRIMARY KEY(`study_id`,`user_id`)
);
--> statement-breakpoint
CREATE TABLE `study_providers` (
	`study_id` int unsigned NOT NULL,
	`organisation_id` int unsigned NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `study_providers_study_id_organisation_id_pk` PRIMARY KEY(`study_id`,`organisation_id`)
);
--> statement-breakpoint
CREATE TABLE `user_tokens` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`user_id` int unsigned NOT NULL,
	`kind` enum('invite','reset') NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`expires_at` datetime(3) NOT NULL,
	`used_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `user_tokens_id` PRIMARY KEY(`id`),
	CONSTRAINT `user_tokens_hash_uq` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `users` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`email` varchar(320) NOT NULL,
	`name` varchar(200) NOT NULL,
	`role` enum('provider','analyst','lead','admin') NOT NULL,
	`organisation_id` int unsigned,
	`password_hash` varchar(100),
	`active` boolean NOT NULL DEFAULT true,
	`session_version` int unsigned NOT NULL DEFAULT 1,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `users_id` PRIMARY KEY(`id`),
	CONSTRAINT `users_email_uq` UNIQUE(`email`)
);
--> statement-breakpoint
ALTER TABLE `api_tokens` ADD CONSTRAINT `api_tokens_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `audit_events` ADD CONSTRAINT `audit_events_actor_id_users_id_fk` FOREIGN KEY (`actor_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `batch_versions` ADD CONSTRAINT `batch_versions_batch_id_batches_id_fk` FOREIGN KEY (`batch_id`) REFERENCES `batches`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `batch_versions` ADD CONSTRAINT `batch_versions_plan_id_data_plans_id_fk` FOREIGN KEY (`plan_id`) REFERENCES `data_plans`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `batch_versions` ADD CONSTRAINT `batch_versions_uploaded_by_id_users_id_fk` FOREIGN KEY (`uploaded_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `batches` ADD CONSTRAINT `batches_study_id_studies_id_fk` FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `batches` ADD CONSTRAINT `batches_organisation_id_organisations_id_fk` FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `batches` ADD CONSTRAINT `batches_created_by_id_users_id_fk` FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `check_jobs` ADD CONSTRAINT `check_jobs_batch_version_id_batch_versions_id_fk` FOREIGN KEY (`batch_version_id`) REFERENCES `batch_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `data_plans` ADD CONSTRAINT `data_plans_study_id_studies_id_fk` FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `data_plans` ADD CONSTRAINT `data_plans_created_by_id_users_id_fk` FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `decisions` ADD CONSTRAINT `decisions_batch_version_id_batch_versions_id_fk` FOREIGN KEY (`batch_version_id`) REFERENCES `batch_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `decisions` ADD CONSTRAINT `decisions_decided_by_id_users_id_fk` FOREIGN KEY (`decided_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `finding_comments` ADD CONSTRAINT `finding_comments_decision_id_decisions_id_fk` FOREIGN KEY (`decision_id`) REFERENCES `decisions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `finding_comments` ADD CONSTRAINT `finding_comments_batch_version_id_batch_versions_id_fk` FOREIGN KEY (`batch_version_id`) REFERENCES `batch_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `finding_comments` ADD CONSTRAINT `finding_comments_author_id_users_id_fk` FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reports` ADD CONSTRAINT `reports_batch_version_id_batch_versions_id_fk` FOREIGN KEY (`batch_version_id`) REFERENCES `batch_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reports` ADD CONSTRAINT `reports_plan_id_data_plans_id_fk` FOREIGN KEY (`plan_id`) REFERENCES `data_plans`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `studies` ADD CONSTRAINT `studies_team_organisation_id_organisations_id_fk` FOREIGN KEY (`team_organisation_id`) REFERENCES `organisations`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `studies` ADD CONSTRAINT `studies_created_by_id_users_id_fk` FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `study_analysts` ADD CONSTRAINT `study_analysts_study_id_studies_id_fk` FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `study_analysts` ADD CONSTRAINT `study_analysts_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `study_providers` ADD CONSTRAINT `study_providers_study_id_studies_id_fk` FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `study_providers` ADD CONSTRAINT `study_providers_organisation_id_organisations_id_fk` FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `user_tokens` ADD CONSTRAINT `user_tokens_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `users` ADD CONSTRAINT `users_organisation_id_organisations_id_fk` FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `api_tokens_user_idx` ON `api_tokens` (`user_id`);--> statement-breakpoint
CREATE INDEX `audit_object_idx` ON `audit_events` (`object_type`,`object_id`);--> statement-breakpoint
CREATE INDEX `audit_batch_idx` ON `audit_events` (`batch_id`);--> statement-breakpoint
CREATE INDEX `audit_created_idx` ON `audit_events` (`created_at`);--> statement-breakpoint
CREATE INDEX `batch_versions_state_idx` ON `batch_versions` (`state`);--> statement-breakpoint
CREATE INDEX `batches_study_idx` ON `batches` (`study_id`);--> statement-breakpoint
CREATE INDEX `batches_org_idx` ON `batches` (`organisation_id`);--> statement-breakpoint
CREATE INDEX `check_jobs_status_idx` ON `check_jobs` (`status`,`run_after`);--> statement-breakpoint
CREATE INDEX `check_jobs_version_idx` ON `check_jobs` (`batch_version_id`);--> statement-breakpoint
CREATE INDEX `email_outbox_status_idx` ON `email_outbox` (`status`,`next_attempt_at`);--> statement-breakpoint
CREATE INDEX `finding_comments_version_idx` ON `finding_comments` (`batch_version_id`);--> statement-breakpoint
CREATE INDEX `reports_version_idx` ON `reports` (`batch_version_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `study_analysts_user_idx` ON `study_analysts` (`user_id`);--> statement-breakpoint
CREATE INDEX `study_providers_org_idx` ON `study_providers` (`organisation_id`);--> statement-breakpoint
CREATE INDEX `users_org_idx` ON `users` (`organisation_id`);