ALTER TABLE `kept_pool_spans` ADD `balance_ph` decimal(4,2);--> statement-breakpoint
ALTER TABLE `kept_pool_spans` ADD `balance_temperature_c` decimal(4,1);--> statement-breakpoint
ALTER TABLE `kept_pool_spans` ADD `balance_calcium_hardness` decimal(6,1);--> statement-breakpoint
ALTER TABLE `kept_pool_spans` ADD `balance_total_alkalinity` decimal(5,1);--> statement-breakpoint
ALTER TABLE `kept_pool_spans` ADD `balance_cyanuric_acid` decimal(5,1);--> statement-breakpoint
ALTER TABLE `kept_pool_spans` ADD `balance_salt` decimal(7,1);--> statement-breakpoint
ALTER TABLE `kept_pool_spans` ADD `balance_tds` decimal(7,1);--> statement-breakpoint
-- Kept spans take the inputs of the test they name: of the complete tests at that instant, the last entered (highest id).
UPDATE `kept_pool_spans` s JOIN `water_tests` w ON w.`id` = (
  SELECT MAX(c.`id`) FROM `water_tests` c
  WHERE c.`company_id` = s.`company_id` AND c.`pool_id` = s.`pool_id` AND c.`sampled_at` = s.`latest_balance_at`
    AND c.`ph` IS NOT NULL AND c.`temperature_c` IS NOT NULL AND c.`calcium_hardness` IS NOT NULL AND c.`total_alkalinity` IS NOT NULL
)
SET s.`balance_ph` = w.`ph`, s.`balance_temperature_c` = w.`temperature_c`, s.`balance_calcium_hardness` = w.`calcium_hardness`,
  s.`balance_total_alkalinity` = w.`total_alkalinity`, s.`balance_cyanuric_acid` = w.`cyanuric_acid`, s.`balance_salt` = w.`salt`, s.`balance_tds` = w.`tds`
WHERE s.`read_as` = 'any' AND s.`latest_balance_at` IS NOT NULL;
