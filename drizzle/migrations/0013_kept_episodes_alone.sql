-- Kept rows are worked out again from the tests: empty the kept tables and their versions, and the next request starts a build.
TRUNCATE TABLE `kept_episodes`;--> statement-breakpoint
TRUNCATE TABLE `kept_pool_spans`;--> statement-breakpoint
TRUNCATE TABLE `kept_pool_months`;--> statement-breakpoint
TRUNCATE TABLE `kept_month_values`;--> statement-breakpoint
TRUNCATE TABLE `kept_treatment_courses`;--> statement-breakpoint
DELETE FROM `kept_versions`;--> statement-breakpoint
ALTER TABLE `kept_episodes` ADD `alone` boolean DEFAULT false NOT NULL;
