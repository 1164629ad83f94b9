CREATE TABLE `instrument` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`kind` text NOT NULL,
	`name` text NOT NULL,
	`model` text DEFAULT '' NOT NULL,
	`serial` text DEFAULT '' NOT NULL,
	`validity_months` integer NOT NULL,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `instrument_name_unique` ON `instrument` (`workshop_id`,`name`);--> statement-breakpoint
CREATE TABLE `instrument_calibration` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`instrument_id` text NOT NULL,
	`number` text NOT NULL,
	`calibrated_at` integer NOT NULL,
	`valid_until` integer NOT NULL,
	`offset_ppm` real,
	`offset_uncertainty_ppm` real,
	`points` text,
	`uncertainty_c` real,
	`certificate_number` text DEFAULT '' NOT NULL,
	`detail` text NOT NULL,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`instrument_id`) REFERENCES `instrument`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `instrument_calibration_instrument_idx` ON `instrument_calibration` (`instrument_id`,`calibrated_at`);--> statement-breakpoint
CREATE UNIQUE INDEX `instrument_calibration_number_unique` ON `instrument_calibration` (`workshop_id`,`number`);--> statement-breakpoint
ALTER TABLE `strike` ADD `recorder_id` text REFERENCES instrument(id);--> statement-breakpoint
ALTER TABLE `strike` ADD `thermometer_id` text REFERENCES instrument(id);--> statement-breakpoint
ALTER TABLE `workshop_profile` ADD `temp_coefficient_tolerance_percent` real DEFAULT 20 NOT NULL;