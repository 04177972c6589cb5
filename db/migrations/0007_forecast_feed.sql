CREATE TABLE `forecast_polls` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`at_ms` integer NOT NULL,
	`url` text NOT NULL,
	`http_status` integer,
	`ok` integer NOT NULL,
	`error` text,
	`format` text,
	`rows_json` text,
	`notes_json` text NOT NULL,
	`bytes` integer,
	`duration_ms` integer NOT NULL
);
--> statement-breakpoint
CREATE INDEX `forecast_polls_at` ON `forecast_polls` (`at_ms`);--> statement-breakpoint
CREATE INDEX `forecast_polls_url_at` ON `forecast_polls` (`url`,`at_ms`);--> statement-breakpoint
ALTER TABLE `sites` ADD `forecast_feed_url` text;--> statement-breakpoint
ALTER TABLE `sites` ADD `forecast_feed_interval_ms` integer DEFAULT 1800000 NOT NULL;--> statement-breakpoint
ALTER TABLE `sites` ADD `forecast_feed_unit` text;--> statement-breakpoint
ALTER TABLE `sites` ADD `forecast_feed_height_m` real DEFAULT 10 NOT NULL;