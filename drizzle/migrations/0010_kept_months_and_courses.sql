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
CREATE TABLE `kept_treatment_courses` (
	`version_id` int NOT NULL,
	`metal` enum('copper','iron','manganese') NOT NULL,
	`pool_id` int NOT NULL,
	`seq` smallint unsigned NOT NULL,
	`company_id` int NOT NULL,
	`started_at` datetime(3) NOT NULL,
	`treatments` json NOT NULL,
	`combination` varchar(1000) NOT NULL,
	`category_combination` varchar(255) NOT NULL,
	`cost` double NOT NULL,
	`cost_complete` boolean NOT NULL DEFAULT true,
	`baseline_test_id` bigint unsigned,
	`baseline_at` datetime(3),
	`baseline_value` double,
	`baseline_status` enum('elevated','watch','clear','unknown'),
	`ineligible` enum('no-baseline','baseline-clear','baseline-below-detection'),
	`ph_at_treatment` double,
	`ph_stratum` enum('inside','outside','unknown') NOT NULL,
	`follow_up_test_id` bigint unsigned,
	`follow_up_at` datetime(3),
	`follow_up_value` double,
	`follow_up_below_detection` boolean,
	`clock_stopped_at` datetime(3) NOT NULL,
	`cleared` boolean NOT NULL DEFAULT false,
	`censored_by` enum('follow-up-window','end-of-data','different-treatment'),
	`cleared_at` datetime(3),
	`recurrence` enum('recurred','stayed-clear','not-followed-long-enough'),
	CONSTRAINT `kept_treatment_courses_version_id_metal_pool_id_seq_pk` PRIMARY KEY(`version_id`,`metal`,`pool_id`,`seq`)
);
--> statement-breakpoint
ALTER TABLE `kept_versions` ADD `time_zone` varchar(64) DEFAULT 'UTC' NOT NULL;--> statement-breakpoint
ALTER TABLE `kept_month_values` ADD CONSTRAINT `kept_month_values_version_id_kept_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `kept_versions`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_month_values` ADD CONSTRAINT `kept_month_values_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_pool_months` ADD CONSTRAINT `kept_pool_months_version_id_kept_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `kept_versions`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_pool_months` ADD CONSTRAINT `kept_pool_months_pool_id_pools_id_fk` FOREIGN KEY (`pool_id`) REFERENCES `pools`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_pool_months` ADD CONSTRAINT `kept_pool_months_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_treatment_courses` ADD CONSTRAINT `kept_treatment_courses_version_id_kept_versions_id_fk` FOREIGN KEY (`version_id`) REFERENCES `kept_versions`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_treatment_courses` ADD CONSTRAINT `kept_treatment_courses_pool_id_pools_id_fk` FOREIGN KEY (`pool_id`) REFERENCES `pools`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `kept_treatment_courses` ADD CONSTRAINT `kept_treatment_courses_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `kept_month_values_company_idx` ON `kept_month_values` (`company_id`);--> statement-breakpoint
CREATE INDEX `kept_pool_months_pool_idx` ON `kept_pool_months` (`pool_id`,`version_id`);--> statement-breakpoint
CREATE INDEX `kept_pool_months_elevated_idx` ON `kept_pool_months` (`version_id`,`elevated`);--> statement-breakpoint
CREATE INDEX `kept_pool_months_company_idx` ON `kept_pool_months` (`company_id`);--> statement-breakpoint
CREATE INDEX `kept_treatment_courses_pool_idx` ON `kept_treatment_courses` (`pool_id`,`version_id`);--> statement-breakpoint
CREATE INDEX `kept_treatment_courses_company_idx` ON `kept_treatment_courses` (`company_id`);--> statement-breakpoint
-- Versions built before the monthly and course rows existed lack them: they go (their rows cascade), and the next analytics request builds a complete one.
DELETE FROM `kept_versions`;