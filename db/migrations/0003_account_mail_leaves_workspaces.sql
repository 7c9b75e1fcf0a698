PRAGMA foreign_keys=OFF;--> statement-breakpoint
CREATE TABLE `__new_email_outbox` (
	`id` text PRIMARY KEY NOT NULL,
	`workspace_id` text,
	`audience` text DEFAULT 'workspace' NOT NULL,
	`to_address` text NOT NULL,
	`subject` text NOT NULL,
	`text_body` text NOT NULL,
	`html_body` text,
	`purpose` text NOT NULL,
	`status` text DEFAULT 'pending' NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`last_error` text,
	`created_at` integer NOT NULL,
	`sent_at` integer,
	FOREIGN KEY (`workspace_id`) REFERENCES `workspaces`(`id`) ON UPDATE no action ON DELETE cascade,
	CONSTRAINT "email_outbox_status_check" CHECK(status in ('pending', 'sent', 'failed')),
	CONSTRAINT "email_outbox_audience_check" CHECK(audience in ('workspace', 'account')),
	CONSTRAINT "email_outbox_audience_workspace_check" CHECK((audience = 'account' and workspace_id is null) or (audience = 'workspace' and workspace_id is not null))
);
--> statement-breakpoint
INSERT INTO `__new_email_outbox`("id", "workspace_id", "audience", "to_address", "subject", "text_body", "html_body", "purpose", "status", "attempts", "last_error", "created_at", "sent_at") SELECT "id",
	-- Account mail (password resets, and anything filed without a workspace) leaves every workspace's outbox;
	-- invitations, run reports and lab assignments stay where they were.
	CASE WHEN "purpose" IN ('password-reset', 'sign-in-notice') OR "workspace_id" IS NULL THEN NULL ELSE "workspace_id" END,
	CASE WHEN "purpose" IN ('password-reset', 'sign-in-notice') OR "workspace_id" IS NULL THEN 'account' ELSE 'workspace' END,
	"to_address", "subject",
	-- A delivered account mail's body (its one-time link) is not kept.
	CASE WHEN ("purpose" IN ('password-reset', 'sign-in-notice') OR "workspace_id" IS NULL) AND "status" = 'sent' THEN '(account mail: the body is not kept once delivered)' ELSE "text_body" END,
	CASE WHEN ("purpose" IN ('password-reset', 'sign-in-notice') OR "workspace_id" IS NULL) AND "status" = 'sent' THEN NULL ELSE "html_body" END,
	"purpose", "status", "attempts", "last_error", "created_at", "sent_at" FROM `email_outbox`;--> statement-breakpoint
DROP TABLE `email_outbox`;--> statement-breakpoint
ALTER TABLE `__new_email_outbox` RENAME TO `email_outbox`;--> statement-breakpoint
PRAGMA foreign_keys=ON;--> statement-breakpoint
CREATE INDEX `email_outbox_status_idx` ON `email_outbox` (`status`,`created_at`);