ALTER TABLE `import_uploads` ADD `claim_id` varchar(36);--> statement-breakpoint
ALTER TABLE `import_uploads` ADD `claim_host` varchar(255);--> statement-breakpoint
ALTER TABLE `import_uploads` ADD `claim_pid` int;--> statement-breakpoint
ALTER TABLE `import_uploads` ADD `claim_heartbeat_at` datetime(3);--> statement-breakpoint
CREATE INDEX `import_uploads_phase_idx` ON `import_uploads` (`phase`);