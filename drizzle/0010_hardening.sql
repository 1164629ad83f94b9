CREATE TABLE `sign_in_failure` (
	`key` text PRIMARY KEY NOT NULL,
	`count` integer NOT NULL,
	`window_started_at` integer NOT NULL
);
--> statement-breakpoint
CREATE INDEX `audit_event_entity_idx` ON `audit_event` (`workshop_id`,`entity_id`,`id`);