ALTER TABLE `workshop_profile` ADD `clock_tolerance_ppm` real DEFAULT 50 NOT NULL;--> statement-breakpoint
ALTER TABLE `workshop_profile` ADD `thermometer_tolerance_c` real DEFAULT 0.5 NOT NULL;