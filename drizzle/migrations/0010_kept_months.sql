CREATE TABLE `kept_month_values` (
	`version_id` int NOT NULL,
	`metal` enum('copper','iron','manganese') NOT NULL,
	`month` char(7) NOT NULL,
	`value` decimal(6,3) NOT NULL,
	`below_detection` boolean NOT NULL DEFAULT false,
	`company_id` int NOT NULL,
	`n` int NOT NULL,
	CONSTRAINT `kept_month_values_pk` PRIMARY KEY(`version_id`,`metal`,`month`,`value`,`below_detection`)
);
--> statement-breakpoint
CREATE TABLE `kept_pool_months` (
	`version_id` int NOT NULL,
	`pool_id` int NOT NULL,
	`metal` enum('copper','iron','manganese') NOT NULL,
	`month` char(7) NOT NULL,
	`company_id` int NOT NULL,
	`readings` int NOT NULL,
	`elevated` int NOT NULL,
	`days` smallint unsigned NOT NULL,
	`reading_counts` json NOT NULL,
	CONSTRAINT `kept_pool_months_pk` PRIMARY KEY(`version_id`,`pool_id`,`metal`,`month`)
);
--> statement-breakpoint
ALTER TABLE `kept_versions` ADD `time_zone` varchar(64) DEFAULT 'UTC' NOT NULL;--> statement-breakpoint
ALTER TABLE `kept_month_values` ADD CONSTRAINT `kept_month_values_version_id_kept_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `kept_versions`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_month_values` ADD CONSTRAINT `kept_month_values_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_pool_months` ADD CONSTRAINT `kept_pool_months_version_id_kept_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `kept_versions`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_pool_months` ADD CONSTRAINT `kept_pool_months_pool_id_pools_id_fk` FOREIGN KEY (`pool_id`) REFERENCES `pools`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_pool_months` ADD CONSTRAINT `kept_pool_months_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `kept_month_values_company_idx` ON `kept_month_values` (`company_id`);--> statement-breakpoint
CREATE INDEX `kept_pool_months_pool_idx` ON `kept_pool_months` (`pool_id`,`version_id`);--> statement-breakpoint
CREATE INDEX `kept_pool_months_elevated_idx` ON `kept_pool_months` (`version_id`,`elevated`);--> statement-breakpoint
CREATE INDEX `kept_pool_months_company_idx` ON `kept_pool_months` (`company_id`);--> statement-breakpoint
-- Versions built before the monthly rows existed lack them: drop them, and the next analytics request builds a complete one.
DELETE FROM `kept_versions`;