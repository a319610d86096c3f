CREATE TABLE `attachment` (
	`id` text PRIMARY KEY NOT NULL,
	`scenario_id` text NOT NULL,
	`team_id` text,
	`filename` text NOT NULL,
	`content_type` text NOT NULL,
	`size` integer NOT NULL,
	`sha256` text NOT NULL,
	`uploaded_by` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`scenario_id`) REFERENCES `scenario`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`uploaded_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `attachment_scenario_idx` ON `attachment` (`scenario_id`);--> statement-breakpoint
CREATE INDEX `attachment_sha_idx` ON `attachment` (`sha256`);