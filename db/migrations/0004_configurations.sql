CREATE TABLE `configuration_changes` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`structure_id` integer NOT NULL,
	`at_ms` integer NOT NULL,
	`from_name` text NOT NULL,
	`to_name` text NOT NULL,
	`by` text NOT NULL,
	`note` text,
	`alert_id` integer,
	`reason` text NOT NULL
);
--> statement-breakpoint
CREATE INDEX `configuration_changes_structure_at` ON `configuration_changes` (`structure_id`,`at_ms`);--> statement-breakpoint
CREATE INDEX `configuration_changes_at` ON `configuration_changes` (`at_ms`);--> statement-breakpoint
ALTER TABLE `alerts` ADD `move_to_configuration` text;--> statement-breakpoint
ALTER TABLE `alerts` ADD `action_done_at_ms` integer;--> statement-breakpoint
ALTER TABLE `alerts` ADD `action_done_by` text;--> statement-breakpoint
ALTER TABLE `alerts` ADD `overdue_at_ms` integer;--> statement-breakpoint
ALTER TABLE `sites` ADD `action_due_ms` integer DEFAULT 300000 NOT NULL;