import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { afterAll, describe, expect, it } from "vitest";
import { openDatabase } from "./client";

/*
 * Migration 0003 takes account mail out of every workspace's outbox. A
 * database built by the migrations before it, holding the rows the old code
 * wrote (a password reset filed under the person's first workspace, an
 * invitation, a lab assignment), is migrated: the reset belongs to no workspace
 * and, once sent, no longer holds its link; every workspace mail row is kept.
 */

const dir = mkdtempSync(path.join(tmpdir(), "benchline-mail-migration-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A copy of db/migrations whose journal stops before migration `upTo`. */
function migrationsBefore(upTo: number): string {
  const folder = path.join(dir, "migrations-before");
  cpSync("db/migrations", folder, { recursive: true });
  const journalPath = path.join(folder, "meta", "_journal.json");
  const journal = JSON.parse(readFileSync(journalPath, "utf8")) as { entries: { idx: number }[] };
  journal.entries = journal.entries.filter((entry) => entry.idx < upTo);
  writeFileSync(journalPath, JSON.stringify(journal));
  return folder;
}

describe("migration 0003 moves account mail out of workspace visibility", () => {
  it("keeps invitations and lab mail in their workspace and files resets under none", () => {
    const file = path.join(dir, "old.db");
    const old = openDatabase(file, { migrate: false });
    migrate(old, { migrationsFolder: migrationsBefore(3) });
    const sqlite = old.$client;
    sqlite.exec(`
      insert into workspaces (id, slug, name, created_at) values ('ws', 'ws', 'Workspace', 0);
      insert into email_outbox (id, workspace_id, to_address, subject, text_body, purpose, status, created_at)
      values
        ('reset-sent', 'ws', 'two@ws.example', 'Reset', 'https://x.example/reset-password/SECRET1', 'password-reset', 'sent', 1),
        ('reset-pending', 'ws', 'two@ws.example', 'Reset', 'https://x.example/reset-password/SECRET2', 'password-reset', 'pending', 2),
        ('invite', 'ws', 'new@ws.example', 'Join', 'https://x.example/join/TOKEN', 'invitation', 'sent', 3),
        ('lab', 'ws', 'app@ws.example', 'New lab', 'Open it', 'lab-assignment', 'pending', 4);
    `);
    sqlite.close();

    const migrated = openDatabase(file);
    const rows = migrated.$client
      .prepare(
        "select id, workspace_id, audience, text_body, status from email_outbox order by created_at",
      )
      .all();
    migrated.$client.close();
    expect(rows).toEqual([
      {
        id: "reset-sent",
        workspace_id: null,
        audience: "account",
        text_body: "(account mail: the body is not kept once delivered)",
        status: "sent",
      },
      // Not sent yet: it keeps its body so the next delivery pass can send it.
      {
        id: "reset-pending",
        workspace_id: null,
        audience: "account",
        text_body: "https://x.example/reset-password/SECRET2",
        status: "pending",
      },
      {
        id: "invite",
        workspace_id: "ws",
        audience: "workspace",
        text_body: "https://x.example/join/TOKEN",
        status: "sent",
      },
      {
        id: "lab",
        workspace_id: "ws",
        audience: "workspace",
        text_body: "Open it",
        status: "pending",
      },
    ]);
  });
});
