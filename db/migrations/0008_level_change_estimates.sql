ALTER TABLE `level_changes` ADD `estimate_level` integer;--> statement-breakpoint
ALTER TABLE `level_changes` ADD `estimate_chance_10` real;--> statement-breakpoint
ALTER TABLE `level_changes` ADD `estimate_chance_30` real;