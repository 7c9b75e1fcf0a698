CREATE TABLE `suite_runs` (
	`id` text PRIMARY KEY NOT NULL,
	`workspace_id` text NOT NULL,
	`suite_id` text,
	`suite_name` text NOT NULL,
	`bench_revision_id` text,
	`seed` integer,
	`status` text DEFAULT 'queued' NOT NULL,
	`verdict` text,
	`scenarios_total` integer DEFAULT 0 NOT NULL,
	`scenarios_done` integer DEFAULT 0 NOT NULL,
	`scenarios_ok` integer DEFAULT 0 NOT NULL,
	`started_by` text,
	`created_at` integer NOT NULL,
	`started_at` integer,
	`finished_at` integer,
	`duration_ms` integer,
	FOREIGN KEY (`workspace_id`) REFERENCES `workspaces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`suite_id`) REFERENCES `suites`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`bench_revision_id`) REFERENCES `bench_revisions`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`started_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "suite_runs_status_check" CHECK(status in ('queued', 'running', 'finished', 'errored'))
);
--> statement-breakpoint
CREATE INDEX `suite_runs_workspace_time_idx` ON `suite_runs` (`workspace_id`,`created_at`);--> statement-breakpoint
ALTER TABLE `labs` ADD `hidden_faults` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
ALTER TABLE `runs` ADD `suite_run_id` text REFERENCES suite_runs(id) ON DELETE cascade;--> statement-breakpoint
ALTER TABLE `runs` ADD `position` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `runs` ADD `scenario_name` text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE `runs` ADD `scenario_document` text;--> statement-breakpoint
ALTER TABLE `runs` ADD `duration_ms` integer;--> statement-breakpoint
ALTER TABLE `runs` ADD `error_message` text;--> statement-breakpoint
CREATE INDEX `runs_suite_run_idx` ON `runs` (`suite_run_id`);