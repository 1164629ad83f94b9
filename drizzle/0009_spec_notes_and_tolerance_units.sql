ALTER TABLE `spec_partial` ADD `target_note` text;--> statement-breakpoint
ALTER TABLE `spec_partial` ADD `tolerance_unit` text DEFAULT 'cents' NOT NULL;--> statement-breakpoint
ALTER TABLE `spec_partial` ADD `tolerance_value` real;--> statement-breakpoint
ALTER TABLE `spec_version` ADD `reference_pitch_hz` real DEFAULT 440 NOT NULL;