ALTER TABLE `water_tests` ADD `submission_scope` varchar(64) GENERATED ALWAYS AS (coalesce(`submission_key`, '')) STORED;--> statement-breakpoint
ALTER TABLE `water_tests` ADD CONSTRAINT `water_tests_pool_time_entry` UNIQUE(`pool_id`,`sampled_at`,`submission_scope`);--> statement-breakpoint
ALTER TABLE `water_tests` DROP INDEX `water_tests_pool_time`;
