CREATE TABLE `notify_attempts` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`outbox_id` integer NOT NULL,
	`at_ms` integer NOT NULL,
	`duration_ms` integer NOT NULL,
	`ok` integer NOT NULL,
	`result` text NOT NULL
);
--> statement-breakpoint
CREATE INDEX `notify_attempts_outbox` ON `notify_attempts` (`outbox_id`);--> statement-breakpoint
CREATE TABLE `notify_escalation` (
	`level` integer PRIMARY KEY NOT NULL,
	`steps_json` text NOT NULL,
	`updated_by` text NOT NULL,
	`updated_at_ms` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `notify_escalations` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`alert_id` integer NOT NULL,
	`step` integer NOT NULL,
	`at_ms` integer NOT NULL,
	`target` text NOT NULL,
	`reached` text NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `notify_escalations_alert_step` ON `notify_escalations` (`alert_id`,`step`);--> statement-breakpoint
CREATE INDEX `notify_escalations_at` ON `notify_escalations` (`at_ms`);--> statement-breakpoint
CREATE TABLE `notify_outbox` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`delivery_id` text NOT NULL,
	`channel` text NOT NULL,
	`target` text NOT NULL,
	`event` text NOT NULL,
	`alert_id` integer,
	`payload_json` text NOT NULL,
	`created_at_ms` integer NOT NULL,
	`status` text NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`next_attempt_at_ms` integer NOT NULL,
	`last_error` text,
	`delivered_at_ms` integer
);
--> statement-breakpoint
CREATE UNIQUE INDEX `notify_outbox_delivery_unique` ON `notify_outbox` (`delivery_id`);--> statement-breakpoint
CREATE INDEX `notify_outbox_status` ON `notify_outbox` (`status`,`next_attempt_at_ms`);--> statement-breakpoint
CREATE TABLE `notify_person_settings` (
	`person_id` integer PRIMARY KEY NOT NULL,
	`email` text,
	`filter_json` text NOT NULL,
	`updated_at_ms` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `notify_used_tokens` (
	`nonce` text PRIMARY KEY NOT NULL,
	`alert_id` integer NOT NULL,
	`used_at_ms` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `notify_webhooks` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`url` text NOT NULL,
	`secret` text NOT NULL,
	`filter_json` text NOT NULL,
	`enabled` integer DEFAULT true NOT NULL,
	`created_by` text NOT NULL,
	`created_at_ms` integer NOT NULL,
	`updated_at_ms` integer NOT NULL
);
