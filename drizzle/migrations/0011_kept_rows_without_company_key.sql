ALTER TABLE `kept_episodes` DROP FOREIGN KEY `kept_episodes_company_id_companies_id_fk`;
--> statement-breakpoint
ALTER TABLE `kept_month_values` DROP FOREIGN KEY `kept_month_values_company_id_companies_id_fk`;
--> statement-breakpoint
ALTER TABLE `kept_pool_months` DROP FOREIGN KEY `kept_pool_months_company_id_companies_id_fk`;
--> statement-breakpoint
ALTER TABLE `kept_pool_spans` DROP FOREIGN KEY `kept_pool_spans_company_id_companies_id_fk`;
--> statement-breakpoint
ALTER TABLE `kept_treatment_courses` DROP FOREIGN KEY `kept_treatment_courses_company_id_companies_id_fk`;
--> statement-breakpoint
DROP INDEX `kept_episodes_company_idx` ON `kept_episodes`;--> statement-breakpoint
DROP INDEX `kept_month_values_company_idx` ON `kept_month_values`;--> statement-breakpoint
DROP INDEX `kept_pool_months_company_idx` ON `kept_pool_months`;--> statement-breakpoint
DROP INDEX `kept_pool_spans_company_idx` ON `kept_pool_spans`;--> statement-breakpoint
DROP INDEX `kept_treatment_courses_company_idx` ON `kept_treatment_courses`;