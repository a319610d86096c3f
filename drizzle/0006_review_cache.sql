CREATE TABLE `review_cache` (
	`exercise_id` text PRIMARY KEY NOT NULL,
	`fingerprint` text NOT NULL,
	`review` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`exercise_id`) REFERENCES `exercise`(`id`) ON UPDATE no action ON DELETE cascade
);
