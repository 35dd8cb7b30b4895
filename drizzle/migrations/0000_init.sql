CREATE TABLE `account` (
	`id` varchar(36) NOT NULL,
	`account_id` varchar(255) NOT NULL,
	`provider_id` varchar(64) NOT NULL,
	`user_id` varchar(36) NOT NULL,
	`access_token` text,
	`refresh_token` text,
	`id_token` text,
	`access_token_expires_at` datetime(3),
	`refresh_token_expires_at` datetime(3),
	`scope` text,
	`password` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `account_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `session` (
	`id` varchar(36) NOT NULL,
	`expires_at` datetime(3) NOT NULL,
	`token` varchar(255) NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`ip_address` varchar(64),
	`user_agent` text,
	`user_id` varchar(36) NOT NULL,
	CONSTRAINT `session_id` PRIMARY KEY(`id`),
	CONSTRAINT `session_token_unique` UNIQUE(`token`)
);
--> statement-breakpoint
CREATE TABLE `user` (
	`id` varchar(36) NOT NULL,
	`name` varchar(200) NOT NULL,
	`email` varchar(255) NOT NULL,
	`email_verified` boolean NOT NULL DEFAULT false,
	`image` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `user_id` PRIMARY KEY(`id`),
	CONSTRAINT `user_email_unique` UNIQUE(`email`)
);
--> statement-breakpoint
CREATE TABLE `verification` (
	`id` varchar(36) NOT NULL,
	`identifier` varchar(255) NOT NULL,
	`value` text NOT NULL,
	`expires_at` datetime(3) NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `verification_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `companies` (
	`id` int AUTO_INCREMENT NOT NULL,
	`name` varchar(200) NOT NULL,
	`town` varchar(120),
	`time_zone` varchar(64) NOT NULL DEFAULT 'UTC',
	`unit_system` enum('us','metric') NOT NULL DEFAULT 'us',
	`settings` json NOT NULL DEFAULT ('{}'),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `companies_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `memberships` (
	`id` int AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`user_id` varchar(36) NOT NULL,
	`role` enum('owner','manager','technician','analyst') NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `memberships_id` PRIMARY KEY(`id`),
	CONSTRAINT `memberships_company_user` UNIQUE(`company_id`,`user_id`)
);
--> statement-breakpoint
CREATE TABLE `route_technicians` (
	`route_id` int NOT NULL,
	`user_id` varchar(36) NOT NULL,
	CONSTRAINT `route_technicians_route_id_user_id_pk` PRIMARY KEY(`route_id`,`user_id`)
);
--> statement-breakpoint
CREATE TABLE `routes` (
	`id` int AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`name` varchar(120) NOT NULL,
	`service_weekdays` varchar(20) NOT NULL DEFAULT '',
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `routes_id` PRIMARY KEY(`id`),
	CONSTRAINT `routes_company_name` UNIQUE(`company_id`,`name`)
);
--> statement-breakpoint
CREATE TABLE `import_batches` (
	`id` int AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`user_id` varchar(36),
	`file_name` varchar(255) NOT NULL,
	`file_sha256` varchar(64),
	`status` enum('committed','undone') NOT NULL DEFAULT 'committed',
	`tests_added` int NOT NULL DEFAULT 0,
	`treatments_added` int NOT NULL DEFAULT 0,
	`rows_duplicate` int NOT NULL DEFAULT 0,
	`rows_refused` int NOT NULL DEFAULT 0,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`undone_at` datetime(3),
	CONSTRAINT `import_batches_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `products` (
	`id` int AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`name` varchar(160) NOT NULL,
	`category` enum('sequestrant','collector_pad','ph_decreaser','copper_algaecide','other_algaecide','chlorine','other') NOT NULL,
	`label_dose` decimal(10,3),
	`dose_unit` varchar(16),
	`dose_basis` enum('per_10k_gal','per_10_m3') NOT NULL DEFAULT 'per_10k_gal',
	`unit_cost` decimal(10,4),
	`active` boolean NOT NULL DEFAULT true,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `products_id` PRIMARY KEY(`id`),
	CONSTRAINT `products_company_name` UNIQUE(`company_id`,`name`)
);
--> statement-breakpoint
CREATE TABLE `treatments` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`pool_id` int NOT NULL,
	`product_id` int NOT NULL,
	`applied_at` datetime(3) NOT NULL,
	`amount` decimal(10,3) NOT NULL,
	`unit` varchar(16) NOT NULL,
	`applied_by` varchar(36),
	`cost` decimal(10,2),
	`water_test_id` bigint unsigned,
	`import_batch_id` int,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `treatments_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `water_tests` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`pool_id` int NOT NULL,
	`sampled_at` datetime(3) NOT NULL,
	`technician_id` varchar(36),
	`free_chlorine` decimal(5,2),
	`combined_chlorine` decimal(5,2),
	`ph` decimal(4,2),
	`total_alkalinity` decimal(5,1),
	`calcium_hardness` decimal(6,1),
	`cyanuric_acid` decimal(5,1),
	`salt` decimal(7,1),
	`tds` decimal(7,1),
	`temperature_c` decimal(4,1),
	`copper` decimal(6,3),
	`copper_below_detection` boolean NOT NULL DEFAULT false,
	`iron` decimal(6,3),
	`iron_below_detection` boolean NOT NULL DEFAULT false,
	`manganese` decimal(6,3),
	`manganese_below_detection` boolean NOT NULL DEFAULT false,
	`hardness_endpoint` enum('clean','blurred'),
	`stain` enum('none','new','existing'),
	`stain_colour` enum('blue_green','red_brown','black_brown','other'),
	`pad_tint` enum('none','tinted','not_fitted'),
	`note` text,
	`import_batch_id` int,
	`submission_key` varchar(64),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `water_tests_id` PRIMARY KEY(`id`),
	CONSTRAINT `water_tests_pool_time` UNIQUE(`pool_id`,`sampled_at`),
	CONSTRAINT `water_tests_submission` UNIQUE(`company_id`,`submission_key`)
);
--> statement-breakpoint
CREATE TABLE `equipment` (
	`id` int AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`pool_id` int NOT NULL,
	`kind` enum('heater','heat_pump','salt_cell','pump','filter','ioniser','other') NOT NULL,
	`exchanger_metal` enum('copper','cupronickel','titanium','none','unknown'),
	`description` varchar(200),
	`installed_on` date,
	`removed_on` date,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `equipment_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `fill_sources` (
	`id` int AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`name` varchar(160) NOT NULL,
	`kind` enum('municipal','private_well','shared_well','trucked','other') NOT NULL,
	`notes` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `fill_sources_id` PRIMARY KEY(`id`),
	CONSTRAINT `fill_sources_company_name` UNIQUE(`company_id`,`name`)
);
--> statement-breakpoint
CREATE TABLE `pools` (
	`id` int AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`route_id` int,
	`fill_source_id` int,
	`account_code` varchar(40) NOT NULL,
	`customer_name` varchar(200) NOT NULL,
	`customer_phone` varchar(40),
	`customer_email` varchar(255),
	`street` varchar(255) NOT NULL,
	`neighbourhood` varchar(120),
	`postal_code` varchar(20),
	`volume_litres` int,
	`surface` enum('plaster','pebble','quartz','vinyl','fibreglass','tile'),
	`sanitiser` enum('chlorine','salt_generator','mineral_assist','other'),
	`active` boolean NOT NULL DEFAULT true,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `pools_id` PRIMARY KEY(`id`),
	CONSTRAINT `pools_company_account` UNIQUE(`company_id`,`account_code`)
);
--> statement-breakpoint
CREATE TABLE `source_tests` (
	`id` int AUTO_INCREMENT NOT NULL,
	`company_id` int NOT NULL,
	`fill_source_id` int NOT NULL,
	`sampled_on` date NOT NULL,
	`copper` decimal(6,3),
	`copper_below_detection` boolean NOT NULL DEFAULT false,
	`iron` decimal(6,3),
	`iron_below_detection` boolean NOT NULL DEFAULT false,
	`manganese` decimal(6,3),
	`manganese_below_detection` boolean NOT NULL DEFAULT false,
	`note` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `source_tests_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `account` ADD CONSTRAINT `account_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `session` ADD CONSTRAINT `session_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `memberships` ADD CONSTRAINT `memberships_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `memberships` ADD CONSTRAINT `memberships_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `route_technicians` ADD CONSTRAINT `route_technicians_route_id_routes_id_fk` FOREIGN KEY (`route_id`) REFERENCES `routes`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `route_technicians` ADD CONSTRAINT `route_technicians_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `routes` ADD CONSTRAINT `routes_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `import_batches` ADD CONSTRAINT `import_batches_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `import_batches` ADD CONSTRAINT `import_batches_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `products` ADD CONSTRAINT `products_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `treatments` ADD CONSTRAINT `treatments_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `treatments` ADD CONSTRAINT `treatments_pool_id_pools_id_fk` FOREIGN KEY (`pool_id`) REFERENCES `pools`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `treatments` ADD CONSTRAINT `treatments_product_id_products_id_fk` FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `treatments` ADD CONSTRAINT `treatments_applied_by_user_id_fk` FOREIGN KEY (`applied_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `treatments` ADD CONSTRAINT `treatments_water_test_id_water_tests_id_fk` FOREIGN KEY (`water_test_id`) REFERENCES `water_tests`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `treatments` ADD CONSTRAINT `treatments_import_batch_id_import_batches_id_fk` FOREIGN KEY (`import_batch_id`) REFERENCES `import_batches`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `water_tests` ADD CONSTRAINT `water_tests_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `water_tests` ADD CONSTRAINT `water_tests_pool_id_pools_id_fk` FOREIGN KEY (`pool_id`) REFERENCES `pools`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `water_tests` ADD CONSTRAINT `water_tests_technician_id_user_id_fk` FOREIGN KEY (`technician_id`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `water_tests` ADD CONSTRAINT `water_tests_import_batch_id_import_batches_id_fk` FOREIGN KEY (`import_batch_id`) REFERENCES `import_batches`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `equipment` ADD CONSTRAINT `equipment_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `equipment` ADD CONSTRAINT `equipment_pool_id_pools_id_fk` FOREIGN KEY (`pool_id`) REFERENCES `pools`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `fill_sources` ADD CONSTRAINT `fill_sources_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `pools` ADD CONSTRAINT `pools_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `pools` ADD CONSTRAINT `pools_route_id_routes_id_fk` FOREIGN KEY (`route_id`) REFERENCES `routes`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `pools` ADD CONSTRAINT `pools_fill_source_id_fill_sources_id_fk` FOREIGN KEY (`fill_source_id`) REFERENCES `fill_sources`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `source_tests` ADD CONSTRAINT `source_tests_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `source_tests` ADD CONSTRAINT `source_tests_fill_source_id_fill_sources_id_fk` FOREIGN KEY (`fill_source_id`) REFERENCES `fill_sources`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `account_user_idx` ON `account` (`user_id`);--> statement-breakpoint
CREATE INDEX `session_user_idx` ON `session` (`user_id`);--> statement-breakpoint
CREATE INDEX `verification_identifier_idx` ON `verification` (`identifier`);--> statement-breakpoint
CREATE INDEX `memberships_user_idx` ON `memberships` (`user_id`);--> statement-breakpoint
CREATE INDEX `route_technicians_user_idx` ON `route_technicians` (`user_id`);--> statement-breakpoint
CREATE INDEX `import_batches_company_idx` ON `import_batches` (`company_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `treatments_pool_time_idx` ON `treatments` (`pool_id`,`applied_at`);--> statement-breakpoint
CREATE INDEX `treatments_company_time_idx` ON `treatments` (`company_id`,`applied_at`);--> statement-breakpoint
CREATE INDEX `treatments_batch_idx` ON `treatments` (`import_batch_id`);--> statement-breakpoint
CREATE INDEX `water_tests_company_time_idx` ON `water_tests` (`company_id`,`sampled_at`);--> statement-breakpoint
CREATE INDEX `water_tests_batch_idx` ON `water_tests` (`import_batch_id`);--> statement-breakpoint
CREATE INDEX `equipment_pool_idx` ON `equipment` (`pool_id`);--> statement-breakpoint
CREATE INDEX `pools_company_route_idx` ON `pools` (`company_id`,`route_id`);--> statement-breakpoint
CREATE INDEX `pools_company_source_idx` ON `pools` (`company_id`,`fill_source_id`);--> statement-breakpoint
CREATE INDEX `source_tests_source_idx` ON `source_tests` (`fill_source_id`,`sampled_on`);