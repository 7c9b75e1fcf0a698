PRAGMA foreign_keys=OFF;--> statement-breakpoint
CREATE TABLE `__new_uploads` (
	`id` text PRIMARY KEY NOT NULL,
	`workspace_id` text NOT NULL,
	`uploaded_by` text,
	`bench_id` text,
	`purpose` text,
	`file_name` text NOT NULL,
	`content_type` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`sha256` text NOT NULL,
	`content` blob NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`workspace_id`) REFERENCES `workspaces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`uploaded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`bench_id`) REFERENCES `benches`(`id`) ON UPDATE no action ON DELETE cascade,
	CONSTRAINT "uploads_purpose_check" CHECK(purpose in ('floor-plan')),
	CONSTRAINT "uploads_purpose_bench_check" CHECK(purpose is null or bench_id is not null)
);
--> statement-breakpoint
-- Edited after generation, before it was first committed: the generated copy selected
-- bench_id and purpose from the old table, which has neither. Floor plans were kept
-- as file_name 'floor-plan:<benchId>'; they move to bench_id + purpose here, and one
-- whose bench no longer exists is dropped (nothing could reach it).
INSERT INTO `__new_uploads`("id", "workspace_id", "uploaded_by", "bench_id", "purpose", "file_name", "content_type", "size_bytes", "sha256", "content", "created_at") SELECT "id", "workspace_id", "uploaded_by", CASE WHEN "file_name" LIKE 'floor-plan:%' THEN substr("file_name", 12) END, CASE WHEN "file_name" LIKE 'floor-plan:%' THEN 'floor-plan' END, CASE WHEN "file_name" NOT LIKE 'floor-plan:%' THEN "file_name" WHEN "content_type" = 'image/png' THEN 'floor-plan.png' WHEN "content_type" = 'image/jpeg' THEN 'floor-plan.jpg' WHEN "content_type" = 'image/svg+xml' THEN 'floor-plan.svg' ELSE 'floor-plan' END, "content_type", "size_bytes", "sha256", "content", "created_at" FROM `uploads` WHERE "file_name" NOT LIKE 'floor-plan:%' OR substr("file_name", 12) IN (SELECT "id" FROM `benches` WHERE `benches`."workspace_id" = `uploads`."workspace_id");--> statement-breakpoint
DROP TABLE `uploads`;--> statement-breakpoint
ALTER TABLE `__new_uploads` RENAME TO `uploads`;--> statement-breakpoint
PRAGMA foreign_keys=ON;--> statement-breakpoint
CREATE INDEX `uploads_workspace_idx` ON `uploads` (`workspace_id`);--> statement-breakpoint
CREATE INDEX `uploads_bench_idx` ON `uploads` (`bench_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `uploads_bench_floor_plan_unique` ON `uploads` (`bench_id`) WHERE purpose = 'floor-plan';