import { eq, sql } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { wrapDriverError } from "../db-error";
import { preparedPer } from "../prepared";
import { users } from "../schema";

export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;

/** E-mail addresses are compared lower-cased and trimmed everywhere. */
export function normalizeEmail(email: string): string {
  return email.trim().toLowerCase();
}

export function findUserByEmail({ db = getDb(), email }: { db?: Db; email: string }) {
  return db
    .select()
    .from(users)
    .where(eq(users.email, normalizeEmail(email)))
    .get();
}

const userById = preparedPer((db) =>
  db
    .select()
    .from(users)
    .where(eq(users.id, sql.placeholder("userId")))
    .prepare(),
);

/** Read on every request by the session check, so prepared once. */
export function findUserById({ db = getDb(), userId }: { db?: Db; userId: string }) {
  return userById(db).get({ userId });
}

export function createUser({ db = getDb(), values }: { db?: Db; values: NewUser }) {
  try {
    return db
      .insert(users)
      .values({ ...values, email: normalizeEmail(values.email) })
      .returning()
      .get();
  } catch (error) {
    wrapDriverError(error, `user "${values.email}"`);
  }
}

/** Invalidate every session of the user (password change, sign out everywhere, disable). */
export function bumpSessionVersion({ db = getDb(), userId }: { db?: Db; userId: string }) {
  return db
    .update(users)
    .set({ sessionVersion: sql`${users.sessionVersion} + 1` })
    .where(eq(users.id, userId))
    .returning({ sessionVersion: users.sessionVersion })
    .get();
}

/** Store a new password hash and end every existing session of the user, in one statement. */
export function setPasswordHash({
  db = getDb(),
  userId,
  passwordHash,
}: {
  db?: Db;
  userId: string;
  passwordHash: string;
}) {
  return db
    .update(users)
    .set({ passwordHash, sessionVersion: sql`${users.sessionVersion} + 1` })
    .where(eq(users.id, userId))
    .returning()
    .get();
}

/** Disable (or re-enable) an account; disabling ends its sessions at once. */
export function setUserDisabled({
  db = getDb(),
  userId,
  disabled,
}: {
  db?: Db;
  userId: string;
  disabled: boolean;
}) {
  return db
    .update(users)
    .set(
      disabled
        ? { disabledAt: new Date(), sessionVersion: sql`${users.sessionVersion} + 1` }
        : { disabledAt: null },
    )
    .where(eq(users.id, userId))
    .returning()
    .get();
}
