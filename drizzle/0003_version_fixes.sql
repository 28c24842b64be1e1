CREATE TABLE `version_fixes` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`batch_version_id` int unsigned NOT NULL,
	`from_version_id` int unsigned NOT NULL,
	`proposals` json NOT NULL,
	`changes` json NOT NULL,
	`change_count` int unsigned NOT NULL,
	`approved_by_id` int unsigned NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `version_fixes_id` PRIMARY KEY(`id`),
	CONSTRAINT `version_fixes_version_uq` UNIQUE(`batch_version_id`)
);
--> statement-breakpoint
ALTER TABLE `version_fixes` ADD CONSTRAINT `version_fixes_batch_version_id_batch_versions_id_fk` FOREIGN KEY (`batch_version_id`) REFERENCES `batch_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `version_fixes` ADD CONSTRAINT `version_fixes_from_version_id_batch_versions_id_fk` FOREIGN KEY (`from_version_id`) REFERENCES `batch_versions`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `version_fixes` ADD CONSTRAINT `version_fixes_approved_by_id_users_id_fk` FOREIGN KEY (`approved_by_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;