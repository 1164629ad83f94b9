CREATE TABLE `mode_list` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`spec_version_id` text NOT NULL,
	`condition` text NOT NULL,
	`name` text DEFAULT '' NOT NULL,
	`source_name` text,
	`youngs_modulus_gpa` real,
	`density_kg_m3` real,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`spec_version_id`) REFERENCES `spec_version`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `mode_list_version_idx` ON `mode_list` (`spec_version_id`,`condition`,`created_at`);--> statement-breakpoint
CREATE TABLE `predicted_mode` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`list_id` text NOT NULL,
	`mode` integer NOT NULL,
	`frequency_hz` real NOT NULL,
	`label` text DEFAULT '' NOT NULL,
	`kind` text,
	FOREIGN KEY (`list_id`) REFERENCES `mode_list`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `predicted_mode_unique` ON `predicted_mode` (`list_id`,`mode`);