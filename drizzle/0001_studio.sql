CREATE TABLE `attachment` (
	`id` text PRIMARY KEY NOT NULL,
	`version_id` text NOT NULL,
	`team_id` text,
	`filename` text NOT NULL,
	`content_type` text NOT NULL,
	`size` integer NOT NULL,
	`sha256` text NOT NULL,
	`uploaded_by` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`version_id`) REFERENCES `scenario_version`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`uploaded_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `attachment_version_idx` ON `attachment` (`version_id`);--> statement-breakpoint
CREATE INDEX `attachment_sha_idx` ON `attachment` (`sha256`);--> statement-breakpoint
CREATE TABLE `scenario_change` (
	`id` text PRIMARY KEY NOT NULL,
	`version_id` text NOT NULL,
	`user_id` text NOT NULL,
	`summary` text NOT NULL,
	`paths` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`version_id`) REFERENCES `scenario_version`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `scenario_change_version_idx` ON `scenario_change` (`version_id`,`created_at`);--> statement-breakpoint
ALTER TABLE `scenario` ADD `summary` text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE `scenario_version` ADD `revision` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `scenario_version` ADD `based_on_id` text;