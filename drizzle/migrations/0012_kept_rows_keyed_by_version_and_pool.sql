-- Kept rows are worked out again from the tests: empty the kept tables and their versions, and the next request starts a build.
TRUNCATE TABLE `kept_episodes`;--> statement-breakpoint
TRUNCATE TABLE `kept_pool_spans`;--> statement-breakpoint
TRUNCATE TABLE `kept_pool_months`;--> statement-breakpoint
TRUNCATE TABLE `kept_month_values`;--> statement-breakpoint
TRUNCATE TABLE `kept_treatment_courses`;--> statement-breakpoint
DELETE FROM `kept_versions`;--> statement-breakpoint
ALTER TABLE `kept_episodes` DROP FOREIGN KEY `kept_episodes_pool_id_pools_id_fk`;--> statement-breakpoint
ALTER TABLE `kept_episodes` DROP PRIMARY KEY, DROP COLUMN `id`, ADD CONSTRAINT `kept_episodes_pk` PRIMARY KEY(`version_id`,`read_as`,`pool_id`,`seq`),
  DROP INDEX `kept_episodes_order`, DROP INDEX `kept_episodes_pool_idx`;--> statement-breakpoint
ALTER TABLE `kept_pool_months` DROP FOREIGN KEY `kept_pool_months_pool_id_pools_id_fk`;--> statement-breakpoint
ALTER TABLE `kept_pool_months` DROP INDEX `kept_pool_months_pool_idx`, DROP INDEX `kept_pool_months_elevated_idx`, DROP PRIMARY KEY,
  DROP COLUMN `metal`, DROP COLUMN `readings`, DROP COLUMN `elevated`,
  ADD `copper_readings` int NOT NULL, ADD `copper_elevated` int NOT NULL, ADD `iron_readings` int NOT NULL, ADD `iron_elevated` int NOT NULL,
  ADD `manganese_readings` int NOT NULL, ADD `manganese_elevated` int NOT NULL, ADD `elevated_metals` tinyint unsigned NOT NULL, MODIFY `reading_counts` longtext NOT NULL,
  ADD CONSTRAINT `kept_pool_months_pk` PRIMARY KEY(`version_id`,`pool_id`,`month`),
  ADD INDEX `kept_pool_months_elevated_idx` (`version_id`,`elevated_metals`,`month`);
