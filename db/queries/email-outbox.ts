import { and, asc, desc, eq, sql } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { emailOutbox } from "../schema";

export type OutboxMail = typeof emailOutbox.$inferSelect;
export type NewOutboxMail = typeof emailOutbox.$inferInsert;

/** Queue a mail; call inside the transaction of the change that causes it. */
export function enqueueMail({ db = getDb(), values }: { db?: Db; values: NewOutboxMail }) {
  return db.insert(emailOutbox).values(values).returning().get();
}

/** Oldest pending mails first, for the sender. */
export function listPendingMail({ db = getDb(), limit = 20 }: { db?: Db; limit?: number }) {
  return db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.status, "pending"))
    .orderBy(asc(emailOutbox.createdAt))
    .limit(limit)
    .all();
}

/**
 * A workspace's own mail, newest first, for the Outbox page: never account mail
 * (password resets, sign-in notices), which belongs to no workspace.
 */
export function listWorkspaceMail({
  db = getDb(),
  workspaceId,
  limit = 100,
}: {
  db?: Db;
  workspaceId: string;
  limit?: number;
}) {
  return db
    .select()
    .from(emailOutbox)
    .where(and(eq(emailOutbox.workspaceId, workspaceId), eq(emailOutbox.audience, "workspace")))
    .orderBy(desc(emailOutbox.createdAt))
    .limit(limit)
    .all();
}

/** The text an account mail's body is replaced with once delivered. */
export const forgottenMailBody = "(account mail: the body is not kept once delivered)";

/**
 * Mark a mail sent. With `forgetBody` (account mail) the body, which carries a
 * one-time link, is blanked: the delivered copy is the addressee's alone.
 */
export function markMailSent({
  db = getDb(),
  mailId,
  forgetBody = false,
}: {
  db?: Db;
  mailId: string;
  forgetBody?: boolean;
}) {
  return db
    .update(emailOutbox)
    .set({
      status: "sent",
      sentAt: new Date(),
      attempts: sql`${emailOutbox.attempts} + 1`,
      ...(forgetBody ? { textBody: forgottenMailBody, htmlBody: null } : {}),
    })
    .where(eq(emailOutbox.id, mailId))
    .run();
}

/** Record a failed attempt; after `maxAttempts` the mail is given up as failed. */
export function markMailFailed({
  db = getDb(),
  mailId,
  error,
  maxAttempts = 5,
}: {
  db?: Db;
  mailId: string;
  error: string;
  maxAttempts?: number;
}) {
  return db
    .update(emailOutbox)
    .set({
      attempts: sql`${emailOutbox.attempts} + 1`,
      lastError: error,
      status: sql`case when ${emailOutbox.attempts} + 1 >= ${maxAttempts} then 'failed' else 'pending' end`,
    })
    .where(eq(emailOutbox.id, mailId))
    .run();
}
