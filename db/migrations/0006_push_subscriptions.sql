CREATE TABLE `notify_push_subscriptions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`person_id` integer NOT NULL,
	`endpoint` text NOT NULL,
	`p256dh` text NOT NULL,
	`auth` text NOT NULL,
	`label` text NOT NULL,
	`user_agent` text,
	`created_at_ms` integer NOT NULL,
	`updated_at_ms` integer NOT NULL,
	`last_delivered_at_ms` integer
);
--> statement-breakpoint
CREATE UNIQUE INDEX `notify_push_subscriptions_endpoint` ON `notify_push_subscriptions` (`endpoint`);--> statement-breakpoint
CREATE INDEX `notify_push_subscriptions_person` ON `notify_push_subscriptions` (`person_id`);