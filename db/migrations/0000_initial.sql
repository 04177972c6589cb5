CREATE TABLE `alerts` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`site_id` integer NOT NULL,
	`kind` text NOT NULL,
	`structure_id` integer,
	`sensor_id` integer,
	`level` integer,
	`label` text NOT NULL,
	`action_text` text DEFAULT '' NOT NULL,
	`raised_at_ms` integer NOT NULL,
	`gust_mps` real,
	`utilization` real,
	`acknowledged_at_ms` integer,
	`acknowledged_by` text,
	`acknowledge_note` text,
	`cleared_at_ms` integer
);
--> statement-breakpoint
CREATE INDEX `alerts_raised_at` ON `alerts` (`raised_at_ms`);--> statement-breakpoint
CREATE TABLE `audit` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`at_ms` integer NOT NULL,
	`actor` text NOT NULL,
	`entity` text NOT NULL,
	`entity_id` text NOT NULL,
	`action` text NOT NULL,
	`before_json` text,
	`after_json` text
);
--> statement-breakpoint
CREATE INDEX `audit_at` ON `audit` (`at_ms`);--> statement-breakpoint
CREATE TABLE `gateway_sensors` (
	`gateway_id` integer NOT NULL,
	`sensor_id` integer NOT NULL,
	PRIMARY KEY(`gateway_id`, `sensor_id`),
	FOREIGN KEY (`gateway_id`) REFERENCES `gateways`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`sensor_id`) REFERENCES `sensors`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `gateways` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`site_id` integer NOT NULL,
	`name` text NOT NULL,
	`username` text NOT NULL,
	`password_hash` text NOT NULL,
	`created_at_ms` integer NOT NULL,
	`revoked_at_ms` integer,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `gateways_username_unique` ON `gateways` (`username`);--> statement-breakpoint
CREATE TABLE `level_changes` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`structure_id` integer NOT NULL,
	`at_ms` integer NOT NULL,
	`from_level` integer NOT NULL,
	`to_level` integer NOT NULL,
	`gust_mps` real,
	`utilization` real,
	`no_data` integer DEFAULT false NOT NULL
);
--> statement-breakpoint
CREATE INDEX `level_changes_structure_at` ON `level_changes` (`structure_id`,`at_ms`);--> statement-breakpoint
CREATE INDEX `level_changes_at` ON `level_changes` (`at_ms`);--> statement-breakpoint
CREATE TABLE `meta` (
	`key` text PRIMARY KEY NOT NULL,
	`value` text NOT NULL,
	`updated_at_ms` integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
CREATE TABLE `readings` (
	`sensor_id` integer NOT NULL,
	`ts_ms` integer NOT NULL,
	`speed_cmps` integer NOT NULL,
	`gust_cmps` integer,
	`dir_deg` integer,
	`temp_deci_c` integer,
	`pressure_pa` integer,
	`rh_pct` integer,
	`flags` integer DEFAULT 0 NOT NULL,
	PRIMARY KEY(`sensor_id`, `ts_ms`)
) WITHOUT ROWID;
--> statement-breakpoint
CREATE TABLE `rejections` (
	`sensor_key` text NOT NULL,
	`reason` text NOT NULL,
	`count` integer NOT NULL,
	`first_at_ms` integer NOT NULL,
	`last_at_ms` integer NOT NULL,
	`last_detail` text NOT NULL,
	PRIMARY KEY(`sensor_key`, `reason`)
);
--> statement-breakpoint
CREATE TABLE `sensors` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`site_id` integer NOT NULL,
	`key` text NOT NULL,
	`name` text NOT NULL,
	`height_m` real NOT NULL,
	`location` text DEFAULT '' NOT NULL,
	`lat_deg` real,
	`lon_deg` real,
	`unit` text DEFAULT 'm/s' NOT NULL,
	`mode` text DEFAULT 'samples' NOT NULL,
	`silence_timeout_ms` integer DEFAULT 30000 NOT NULL,
	`created_at_ms` integer NOT NULL,
	`retired_at_ms` integer,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `sensors_key_unique` ON `sensors` (`key`);--> statement-breakpoint
CREATE TABLE `sites` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`altitude_m` real DEFAULT 0 NOT NULL,
	`terrain_category` text DEFAULT 'II' NOT NULL,
	`time_zone` text DEFAULT 'UTC' NOT NULL,
	`air_density_mode` text DEFAULT 'isa' NOT NULL,
	`fixed_air_density_kg_m3` real,
	`height_reduction_enabled` integer DEFAULT false NOT NULL,
	`directional_enabled` integer DEFAULT false NOT NULL,
	`dead_band_fraction` real DEFAULT 0.1 NOT NULL,
	`hold_time_ms` integer DEFAULT 900000 NOT NULL,
	`default_levels_json` text NOT NULL,
	`created_at_ms` integer NOT NULL,
	`updated_at_ms` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `structure_minutes` (
	`structure_id` integer NOT NULL,
	`minute_ms` integer NOT NULL,
	`max_gust_cmps` integer NOT NULL,
	`max_utilization_e4` integer NOT NULL,
	`max_level` integer NOT NULL,
	PRIMARY KEY(`structure_id`, `minute_ms`)
) WITHOUT ROWID;
--> statement-breakpoint
CREATE TABLE `structures` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`site_id` integer NOT NULL,
	`name` text NOT NULL,
	`kind` text NOT NULL,
	`record_json` text NOT NULL,
	`orientation_deg` real DEFAULT 0 NOT NULL,
	`location` text DEFAULT '' NOT NULL,
	`lat_deg` real,
	`lon_deg` real,
	`reference_height_m` real,
	`mobile` integer DEFAULT false NOT NULL,
	`sensor_keys_json` text,
	`levels_json` text,
	`created_at_ms` integer NOT NULL,
	`updated_at_ms` integer NOT NULL,
	`retired_at_ms` integer,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `wind_minutes` (
	`sensor_id` integer NOT NULL,
	`minute_ms` integer NOT NULL,
	`sample_count` integer NOT NULL,
	`speed_sum_cmps` integer NOT NULL,
	`max_gust_cmps` integer NOT NULL,
	`dir_sin_sum` real DEFAULT 0 NOT NULL,
	`dir_cos_sum` real DEFAULT 0 NOT NULL,
	`dir_count` integer DEFAULT 0 NOT NULL,
	PRIMARY KEY(`sensor_id`, `minute_ms`)
) WITHOUT ROWID;
