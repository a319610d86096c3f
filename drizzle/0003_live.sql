CREATE TABLE `exercise_draft` (
	`exercise_id` text NOT NULL,
	`team_id` text NOT NULL,
	`turn` integer NOT NULL,
	`label` text,
	`proposal` text,
	`rationale` text DEFAULT '' NOT NULL,
	`confidence` integer,
	`updated_by` text,
	`updated_by_name` text NOT NULL,
	`updated_at` integer NOT NULL,
	PRIMARY KEY(`exercise_id`, `team_id`),
	FOREIGN KEY (`exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`updated_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `exercise_event` (
	`id` text PRIMARY KEY NOT NULL,
	`exercise_id` text NOT NULL,
	`seq` integer NOT NULL,
	`kind` text NOT NULL,
	`actor_id` text,
	`actor_name` text NOT NULL,
	`intent_key` text,
	`summary` text NOT NULL,
	`data` text NOT NULL,
	`sections` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`actor_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `exercise_event_seq_idx` ON `exercise_event` (`exercise_id`,`seq`);--> statement-breakpoint
CREATE UNIQUE INDEX `exercise_event_intent_idx` ON `exercise_event` (`exercise_id`,`intent_key`);--> statement-breakpoint
CREATE TABLE `exercise_inject` (
	`id` text PRIMARY KEY NOT NULL,
	`exercise_id` text NOT NULL,
	`turn` integer NOT NULL,
	`node_id` text NOT NULL,
	`authored_id` text,
	`title` text NOT NULL,
	`body` text NOT NULL,
	`audience` text NOT NULL,
	`attachment_ids` text NOT NULL,
	`sent_by` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`sent_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `exercise_inject_idx` ON `exercise_inject` (`exercise_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `exercise_move` (
	`id` text PRIMARY KEY NOT NULL,
	`exercise_id` text NOT NULL,
	`turn` integer NOT NULL,
	`stage_node_id` text NOT NULL,
	`node_id` text,
	`team_id` text,
	`label` text,
	`kind` text NOT NULL,
	`status` text NOT NULL,
	`proposal` text,
	`reason` text,
	`rationale` text,
	`confidence` integer,
	`draw_seed` text,
	`draw_value` real,
	`outcome_node_id` text,
	`submitted_by` text,
	`submitted_by_name` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`revealed_at` integer,
	`undone_at` integer,
	`undo_reason` text,
	FOREIGN KEY (`exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`submitted_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `exercise_move_turn_idx` ON `exercise_move` (`exercise_id`,`turn`);--> statement-breakpoint
CREATE TABLE `exercise_note` (
	`id` text PRIMARY KEY NOT NULL,
	`exercise_id` text NOT NULL,
	`turn` integer,
	`move_id` text,
	`tags` text NOT NULL,
	`text` text NOT NULL,
	`author_id` text NOT NULL,
	`author_name` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`move_id`) REFERENCES `exercise_move`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`author_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `exercise_note_idx` ON `exercise_note` (`exercise_id`,`created_at`);--> statement-breakpoint
ALTER TABLE `exercise` ADD `node_id` text;--> statement-breakpoint
ALTER TABLE `exercise` ADD `turn` integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE `exercise` ADD `seq` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `exercise` ADD `chance_seed` text;--> statement-breakpoint
ALTER TABLE `exercise` ADD `draws` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `exercise` ADD `clock` text;