ALTER TABLE `routes` ADD `active` boolean DEFAULT true NOT NULL;--> statement-breakpoint
ALTER TABLE `fill_sources` ADD `active` boolean DEFAULT true NOT NULL;