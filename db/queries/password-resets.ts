import { and, eq, gt, isNull } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { passwordResets } from "../schema";

export type PasswordReset = typeof passwordResets.$inferSelect;

export function createPasswordReset({
  db = getDb(),
  userId,
  tokenHash,
  expiresAt,
}: {
  db?: Db;
  userId: string;
  tokenHash: string;
  expiresAt: Date;
}) {
  return db.insert(passwordResets).values({ userId, tokenHash, expiresAt }).returning().get();
}

/** Use a reset token once: marks it used only if it is unused and unexpired. */
export function consumePasswordReset({
  db = getDb(),
  tokenHash,
  now = new Date(),
}: {
  db?: Db;
  tokenHash: string;
  now?: Date;
}) {
  return db
    .update(passwordResets)
    .set({ usedAt: now })
    .where(
      and(
        eq(passwordResets.tokenHash, tokenHash),
        isNull(passwordResets.usedAt),
        gt(passwordResets.expiresAt, now),
      ),
    )
    .returning()
    .get();
}

/**
 * End every reset token of the account that is still open: once one link has
 * set a new password (or the password changed otherwise), older links sitting
 * in a mailbox must not set another.
 */
export function endOutstandingPasswordResets({
  db = getDb(),
  userId,
  now = new Date(),
}: {
  db?: Db;
  userId: string;
  now?: Date;
}) {
  return db
    .update(passwordResets)
    .set({ usedAt: now })
    .where(and(eq(passwordResets.userId, userId), isNull(passwordResets.usedAt)))
    .run();
}
