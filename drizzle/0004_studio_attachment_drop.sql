DROP TABLE `attachment`;--> statement-breakpoint
ALTER TABLE `scenario_version` ADD `ladder_draft` text;