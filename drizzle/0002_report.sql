CREATE TABLE `report_comment` (
	`id` text PRIMARY KEY NOT NULL,
	`exercise_id` text NOT NULL,
	`author_id` text NOT NULL,
	`author_name` text NOT NULL,
	`quote` text,
	`body` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`resolved_at` integer,
	FOREIGN KEY (`exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`author_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `report_comment_exercise_idx` ON `report_comment` (`exercise_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `report_dispatch` (
	`id` text PRIMARY KEY NOT NULL,
	`version_id` text NOT NULL,
	`sent_by` text NOT NULL,
	`sent_by_name` text NOT NULL,
	`recipients` text NOT NULL,
	`note` text NOT NULL,
	`message_id` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`version_id`) REFERENCES `report_version`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`sent_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `report_dispatch_version_idx` ON `report_dispatch` (`version_id`);--> statement-breakpoint
CREATE TABLE `report_update` (
	`seq` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`exercise_id` text NOT NULL,
	`update` blob NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `report_update_exercise_idx` ON `report_update` (`exercise_id`,`seq`);--> statement-breakpoint
CREATE TABLE `report_version` (
	`id` text PRIMARY KEY NOT NULL,
	`exercise_id` text NOT NULL,
	`number` integer NOT NULL,
	`title` text NOT NULL,
	`content` text NOT NULL,
	`issued_by` text NOT NULL,
	`issued_by_name` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`issued_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `report_version_number_idx` ON `report_version` (`exercise_id`,`number`);