CREATE TABLE `batch_certificate` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`batch_id` text NOT NULL,
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
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`batch_id`) REFERENCES `batch`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`issued_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `batch_certificate_workshop_number_unique` ON `batch_certificate` (`workshop_id`,`number`);--> statement-breakpoint
CREATE UNIQUE INDEX `batch_certificate_code_unique` ON `batch_certificate` (`verification_code`);--> statement-breakpoint
CREATE INDEX `batch_certificate_batch_idx` ON `batch_certificate` (`batch_id`);--> statement-breakpoint
CREATE TABLE `certificate_withdrawal` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`certificate_id` text NOT NULL,
	`reason` text NOT NULL,
	`withdrawn_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`withdrawn_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `certificate_withdrawal_certificate_unique` ON `certificate_withdrawal` (`certificate_id`);--> statement-breakpoint
CREATE TABLE `strike_void` (
	`id` text PRIMARY KEY NOT NULL,
	`workshop_id` text NOT NULL,
	`strike_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`reason` text NOT NULL,
	`voided_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`workshop_id`) REFERENCES `organization`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`strike_id`) REFERENCES `strike`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`unit_id`) REFERENCES `unit`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`voided_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `strike_void_strike_unique` ON `strike_void` (`strike_id`);--> statement-breakpoint
CREATE INDEX `strike_void_unit_idx` ON `strike_void` (`unit_id`);--> statement-breakpoint
DROP INDEX `certificate_number_unique`;--> statement-breakpoint
CREATE UNIQUE INDEX `certificate_workshop_number_unique` ON `certificate` (`workshop_id`,`number`);--> statement-breakpoint
DROP INDEX `strike_unit_sha_unique`;--> statement-breakpoint
CREATE INDEX `strike_unit_sha_idx` ON `strike` (`unit_id`,`sha256`);--> statement-breakpoint
ALTER TABLE `disposition` ADD `supersedes_id` text REFERENCES disposition(id);--> statement-breakpoint
CREATE UNIQUE INDEX `disposition_supersedes_unique` ON `disposition` (`supersedes_id`);