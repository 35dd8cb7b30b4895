CREATE TABLE `kept_episodes` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`version_id` int NOT NULL,
	`company_id` int NOT NULL,
	`pool_id` int NOT NULL,
	`read_as` enum('all','copper','iron','manganese') NOT NULL,
	`seq` smallint unsigned NOT NULL,
	`metal` enum('copper','iron','manganese') NOT NULL,
	`opened_at` datetime(3) NOT NULL,
	`opened_by_test_id` bigint unsigned NOT NULL,
	`closed_at` datetime(3),
	`closed_by_test_id` bigint unsigned,
	`end_at` datetime(3) NOT NULL,
	`peak` double NOT NULL,
	`test_count` int NOT NULL,
	`chronic` boolean NOT NULL DEFAULT false,
	`recurrence` boolean NOT NULL DEFAULT false,
	CONSTRAINT `kept_episodes_id` PRIMARY KEY(`id`),
	CONSTRAINT `kept_episodes_order` UNIQUE(`version_id`,`read_as`,`pool_id`,`seq`)
);
--> statement-breakpoint
CREATE TABLE `kept_pool_spans` (
	`version_id` int NOT NULL,
	`pool_id` int NOT NULL,
	`read_as` enum('any','all','copper','iron','manganese') NOT NULL,
	`company_id` int NOT NULL,
	`first_at` datetime(3) NOT NULL,
	`last_at` datetime(3) NOT NULL,
	`tests` int NOT NULL,
	`latest_balance_at` datetime(3),
	CONSTRAINT `kept_pool_spans_version_id_read_as_pool_id_pk` PRIMARY KEY(`version_id`,`read_as`,`pool_id`)
);
--> statement-breakpoint
CREATE TABLE `kept_versions` (
	`id` int AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`levels` json NOT NULL,
	`state` enum('building','ready','retired') NOT NULL DEFAULT 'building',
	`claimed_by` varchar(80),
	`claim_expires_at` datetime(3),
	`built_through_pool_id` int NOT NULL DEFAULT 0,
	`started_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`ready_at` datetime(3),
	`building_slot` tinyint,
	CONSTRAINT `kept_versions_id` PRIMARY KEY(`id`),
	CONSTRAINT `kept_versions_one_build` UNIQUE(`company_id`,`building_slot`)
);
--> statement-breakpoint
ALTER TABLE `kept_episodes` ADD CONSTRAINT `kept_episodes_version_id_kept_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `kept_versions`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_episodes` ADD CONSTRAINT `kept_episodes_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_episodes` ADD CONSTRAINT `kept_episodes_pool_id_pools_id_fk` FOREIGN KEY (`pool_id`) REFERENCES `pools`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_pool_spans` ADD CONSTRAINT `kept_pool_spans_version_id_kept_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `kept_versions`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_pool_spans` ADD CONSTRAINT `kept_pool_spans_pool_id_pools_id_fk` FOREIGN KEY (`pool_id`) REFERENCES `pools`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_pool_spans` ADD CONSTRAINT `kept_pool_spans_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_versions` ADD CONSTRAINT `kept_versions_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `kept_episodes_pool_idx` ON `kept_episodes` (`pool_id`,`version_id`);--> statement-breakpoint
CREATE INDEX `kept_episodes_company_idx` ON `kept_episodes` (`company_id`);--> statement-breakpoint
CREATE INDEX `kept_pool_spans_pool_idx` ON `kept_pool_spans` (`pool_id`,`version_id`);--> statement-breakpoint
CREATE INDEX `kept_pool_spans_company_idx` ON `kept_pool_spans` (`company_id`);--> statement-breakpoint
CREATE INDEX `kept_versions_company_idx` ON `kept_versions` (`company_id`,`state`);