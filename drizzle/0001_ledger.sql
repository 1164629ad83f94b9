CREATE TABLE `batch` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`code` text NOT NULL,
	`spec_version_id` text NOT NULL,
	`quantity` integer NOT NULL,
	`state` text DEFAULT 'open' NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`released_by` text,
	`released_at` integer,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`spec_version_id`) REFERENCES `spec_version`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`released_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `batch_code_unique` ON `batch` (`workshop_id`,`code`);--> statement-breakpoint
CREATE TABLE `certificate` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`evaluation_id` text NOT NULL,
	`number` text NOT NULL,
	`verification_code` text NOT NULL,
	`recipient_email` text NOT NULL,
	`recipient_name` text,
	`issued_by` text,
	`issued_at` integer NOT NULL,
	`canonical` text NOT NULL,
	`signature` text NOT NULL,
	`pdf_sha256` text NOT NULL,
	`pdf_key` text NOT NULL,
	`amends_id` text,
	`amend_reason` text,
	`superseded_by_id` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`unit_id`) REFERENCES `unit`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`evaluation_id`) REFERENCES `evaluation`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`issued_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `certificate_number_unique` ON `certificate` (`number`);--> statement-breakpoint
CREATE UNIQUE INDEX `certificate_code_unique` ON `certificate` (`verification_code`);--> statement-breakpoint
CREATE INDEX `certificate_unit_idx` ON `certificate` (`unit_id`);--> statement-breakpoint
CREATE TABLE `disposition` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`evaluation_id` text,
	`decision` text NOT NULL,
	`reason` text NOT NULL,
	`decided_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`unit_id`) REFERENCES `unit`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`evaluation_id`) REFERENCES `evaluation`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`decided_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `disposition_unit_idx` ON `disposition` (`unit_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `evaluation` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`spec_version_id` text NOT NULL,
	`verdict` text NOT NULL,
	`detail` text NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`unit_id`) REFERENCES `unit`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`spec_version_id`) REFERENCES `spec_version`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `evaluation_unit_idx` ON `evaluation` (`unit_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `ledger_entry` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`workshop_id` text NOT NULL,
	`seq` integer NOT NULL,
	`kind` text NOT NULL,
	`entity_id` text NOT NULL,
	`content_hash` text NOT NULL,
	`prev_hash` text NOT NULL,
	`hash` text NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `ledger_entry_seq_unique` ON `ledger_entry` (`workshop_id`,`seq`);--> statement-breakpoint
CREATE TABLE `measurement` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`strike_id` text NOT NULL,
	`analyser_version` text NOT NULL,
	`result` text NOT NULL,
	`plot` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`strike_id`) REFERENCES `strike`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `measurement_strike_unique` ON `measurement` (`strike_id`);--> statement-breakpoint
CREATE TABLE `partial` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`measurement_id` text NOT NULL,
	`segment` integer NOT NULL,
	`position` integer NOT NULL,
	`frequency_hz` real NOT NULL,
	`frequency_uncertainty_hz` real NOT NULL,
	`amplitude_db` real NOT NULL,
	`tau_s` real NOT NULL,
	`tau_uncertainty_s` real NOT NULL,
	`t60_s` real NOT NULL,
	`q` real NOT NULL,
	`fit_r2` real NOT NULL,
	`beat_hz` real,
	`tau_unreliable` integer NOT NULL,
	FOREIGN KEY (`measurement_id`) REFERENCES `measurement`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `partial_measurement_idx` ON `partial` (`measurement_id`);--> statement-breakpoint
CREATE TABLE `spec` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `spec_workshop_idx` ON `spec` (`workshop_id`);--> statement-breakpoint
CREATE TABLE `spec_partial` (
	`id` text PRIMARY KEY NOT NULL,
	`spec_version_id` text NOT NULL,
	`position` integer NOT NULL,
	`label` text NOT NULL,
	`is_fundamental` integer NOT NULL,
	`target_kind` text NOT NULL,
	`target_hz` real,
	`ratio` real,
	`tolerance_cents` real NOT NULL,
	`min_t60_s` real,
	`min_q` real,
	`max_beat_hz` real,
	`required` integer NOT NULL,
	FOREIGN KEY (`spec_version_id`) REFERENCES `spec_version`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `spec_version` (
	`id` text PRIMARY KEY NOT NULL,
	`spec_id` text NOT NULL,
	`workshop_id` text NOT NULL,
	`version` integer NOT NULL,
	`name` text NOT NULL,
	`family` text NOT NULL,
	`description` text DEFAULT '' NOT NULL,
	`reference_temperature_c` real NOT NULL,
	`temp_coefficient_per_c` real NOT NULL,
	`decision_rule` text NOT NULL,
	`strikes_required` integer NOT NULL,
	`length_mm` real,
	`change_note` text DEFAULT '' NOT NULL,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`spec_id`) REFERENCES `spec`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `spec_version_unique` ON `spec_version` (`spec_id`,`version`);--> statement-breakpoint
CREATE TABLE `strike` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`uploaded_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`original_name` text NOT NULL,
	`sha256` text NOT NULL,
	`file_key` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`sample_rate` integer,
	`channels` integer,
	`bits_per_sample` integer,
	`encoding` text,
	`duration_s` real,
	`temperature_c` real,
	`support` text,
	`state` text DEFAULT 'queued' NOT NULL,
	`failure_code` text,
	`failure_reason` text,
	`attempts` integer DEFAULT 0 NOT NULL,
	`started_at` integer,
	`finished_at` integer,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`unit_id`) REFERENCES `unit`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`uploaded_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `strike_unit_idx` ON `strike` (`unit_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `strike_state_idx` ON `strike` (`state`);--> statement-breakpoint
CREATE UNIQUE INDEX `strike_unit_sha_unique` ON `strike` (`unit_id`,`sha256`);--> statement-breakpoint
CREATE TABLE `unit` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`batch_id` text NOT NULL,
	`serial` text NOT NULL,
	`position` integer NOT NULL,
	`customer_name` text,
	`customer_email` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`batch_id`) REFERENCES `batch`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `unit_serial_unique` ON `unit` (`workshop_id`,`serial`);--> statement-breakpoint
CREATE INDEX `unit_batch_idx` ON `unit` (`batch_id`,`position`);--> statement-breakpoint
CREATE TABLE `workshop_profile` (
	`workshop_id` text PRIMARY KEY NOT NULL,
	`address` text DEFAULT '' NOT NULL,
	`sending_email` text DEFAULT '' NOT NULL,
	`quality_email` text DEFAULT '' NOT NULL,
	`certificate_prefix` text DEFAULT 'TL' NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade
);
