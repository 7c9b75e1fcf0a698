import { asc, desc, eq, sql } from "drizzle-orm";
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

/** A workspace's mail, newest first, for the Outbox page. */
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
    .where(eq(emailOutbox.workspaceId, workspaceId))
    .orderBy(desc(emailOutbox.createdAt))
    .limit(limit)
    .all();
}

export function markMailSent({ db = getDb(), mailId }: { db?: Db; mailId: string }) {
  return db
    .update(emailOutbox)
    .set({ status: "sent", sentAt: new Date(), attempts: sql`${emailOutbox.attempts} + 1` })
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
