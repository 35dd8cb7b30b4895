CREATE TABLE `background_jobs` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`job_key` varchar(191) NOT NULL,
	`kind` varchar(40) NOT NULL,
	`company_id` int,
	`payload` json NOT NULL DEFAULT ('{}'),
	`status` enum('pending','done','failed') NOT NULL DEFAULT 'pending',
	`attempts` int NOT NULL DEFAULT 0,
	`claim_token` varchar(36),
	`claimed_by` varchar(255),
	`claim_expires_at` datetime(3),
	`last_error` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`finished_at` datetime(3),
	CONSTRAINT `background_jobs_id` PRIMARY KEY(`id`),
	CONSTRAINT `background_jobs_job_key_unique` UNIQUE(`job_key`)
);
--> statement-breakpoint
ALTER TABLE `background_jobs` ADD CONSTRAINT `background_jobs_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `background_jobs_due_idx` ON `background_jobs` (`status`,`claim_expires_at`);--> statement-breakpoint
CREATE INDEX `background_jobs_finished_idx` ON `background_jobs` (`finished_at`);