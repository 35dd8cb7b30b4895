CREATE TABLE `alert_events` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`kind` enum('episode_opened','pool_recurring','shared_source') NOT NULL,
	`dedupe_key` varchar(191) NOT NULL,
	`pool_id` int,
	`fill_source_id` int,
	`metal` enum('copper','iron','manganese'),
	`occurred_at` datetime(3) NOT NULL,
	`details` json NOT NULL DEFAULT ('{}'),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `alert_events_id` PRIMARY KEY(`id`),
	CONSTRAINT `alert_events_company_key` UNIQUE(`company_id`,`dedupe_key`)
);
--> statement-breakpoint
CREATE TABLE `import_mappings` (
	`id` int AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`name` varchar(120) NOT NULL,
	`mapping` json NOT NULL,
	`created_by` varchar(36),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `import_mappings_id` PRIMARY KEY(`id`),
	CONSTRAINT `import_mappings_company_name` UNIQUE(`company_id`,`name`)
);
--> statement-breakpoint
CREATE TABLE `import_uploads` (
	`id` varchar(36) NOT NULL,
	`company_id` int NOT NULL,
	`user_id` varchar(36),
	`file_name` varchar(255) NOT NULL,
	`byte_size` bigint NOT NULL,
	`file_sha256` varchar(64) NOT NULL,
	`stored_as` varchar(255) NOT NULL,
	`encoding` varchar(20),
	`delimiter` varchar(4),
	`phase` enum('uploaded','checking','checked','committing','committed','failed','discarded') NOT NULL DEFAULT 'uploaded',
	`rows_total` int,
	`rows_done` int NOT NULL DEFAULT 0,
	`options` json NOT NULL DEFAULT ('{}'),
	`summary` json,
	`error` text,
	`import_batch_id` int,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `import_uploads_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `invitations` (
	`id` int AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`email` varchar(255) NOT NULL,
	`role` enum('owner','manager','technician','analyst') NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`invited_by` varchar(36),
	`expires_at` datetime(3) NOT NULL,
	`accepted_at` datetime(3),
	`accepted_by` varchar(36),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `invitations_id` PRIMARY KEY(`id`),
	CONSTRAINT `invitations_token_hash_unique` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `mail_outbox` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`company_id` int,
	`dedupe_key` varchar(191) NOT NULL,
	`kind` varchar(40) NOT NULL,
	`recipient` varchar(255) NOT NULL,
	`subject` varchar(255) NOT NULL,
	`html` text NOT NULL,
	`text` text NOT NULL,
	`status` enum('pending','sent','failed') NOT NULL DEFAULT 'pending',
	`attempts` int NOT NULL DEFAULT 0,
	`next_attempt_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`last_error` text,
	`sent_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `mail_outbox_id` PRIMARY KEY(`id`),
	CONSTRAINT `mail_outbox_dedupe_key_unique` UNIQUE(`dedupe_key`)
);
--> statement-breakpoint
CREATE TABLE `mail_preferences` (
	`membership_id` int NOT NULL,
	`digest` boolean NOT NULL DEFAULT true,
	`alerts` boolean NOT NULL DEFAULT true,
	`unsubscribe_token` varchar(64) NOT NULL,
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `mail_preferences_membership_id` PRIMARY KEY(`membership_id`),
	CONSTRAINT `mail_preferences_unsubscribe_token_unique` UNIQUE(`unsubscribe_token`)
);
--> statement-breakpoint
ALTER TABLE `alert_events` ADD CONSTRAINT `alert_events_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `alert_events` ADD CONSTRAINT `alert_events_pool_id_pools_id_fk` FOREIGN KEY (`pool_id`) REFERENCES `pools`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `alert_events` ADD CONSTRAINT `alert_events_fill_source_id_fill_sources_id_fk` FOREIGN KEY (`fill_source_id`) REFERENCES `fill_sources`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `import_mappings` ADD CONSTRAINT `import_mappings_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `import_mappings` ADD CONSTRAINT `import_mappings_created_by_user_id_fk` FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `import_uploads` ADD CONSTRAINT `import_uploads_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `import_uploads` ADD CONSTRAINT `import_uploads_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `invitations` ADD CONSTRAINT `invitations_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `invitations` ADD CONSTRAINT `invitations_invited_by_user_id_fk` FOREIGN KEY (`invited_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `invitations` ADD CONSTRAINT `invitations_accepted_by_user_id_fk` FOREIGN KEY (`accepted_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `mail_outbox` ADD CONSTRAINT `mail_outbox_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `mail_preferences` ADD CONSTRAINT `mail_preferences_membership_id_memberships_id_fk` FOREIGN KEY (`membership_id`) REFERENCES `memberships`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `alert_events_company_time_idx` ON `alert_events` (`company_id`,`occurred_at`);--> statement-breakpoint
CREATE INDEX `import_uploads_company_idx` ON `import_uploads` (`company_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `invitations_company_idx` ON `invitations` (`company_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `mail_outbox_due_idx` ON `mail_outbox` (`status`,`next_attempt_at`);