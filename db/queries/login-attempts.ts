import { and, count, desc, eq, gt, isNull, lt } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { loginAttempts } from "../schema";

export type LoginAttempt = typeof loginAttempts.$inferSelect;

/** Record one sign-in attempt (the e-mail as typed, normalised by the caller). */
export function recordLoginAttempt({
  db = getDb(),
  email,
  clientAddress,
  succeeded,
  at = new Date(),
}: {
  db?: Db;
  email: string;
  clientAddress: string | null;
  succeeded: boolean;
  at?: Date;
}) {
  return db
    .insert(loginAttempts)
    .values({ email, clientAddress, succeeded, createdAt: at })
    .returning()
    .get();
}

/**
 * Failed attempts for an e-mail address since `since`, counting only those
 * after its latest success in that window (a correct password resets the count).
 */
export function countRecentAccountFailures({
  db = getDb(),
  email,
  since,
}: {
  db?: Db;
  email: string;
  since: Date;
}): number {
  const lastSuccess = db
    .select({ createdAt: loginAttempts.createdAt })
    .from(loginAttempts)
    .where(
      and(
        eq(loginAttempts.email, email),
        eq(loginAttempts.succeeded, true),
        gt(loginAttempts.createdAt, since),
      ),
    )
    .orderBy(desc(loginAttempts.createdAt))
    .limit(1)
    .get();
  const from = lastSuccess && lastSuccess.createdAt > since ? lastSuccess.createdAt : since;
  const row = db
    .select({ failures: count() })
    .from(loginAttempts)
    .where(
      and(
        eq(loginAttempts.email, email),
        eq(loginAttempts.succeeded, false),
        gt(loginAttempts.createdAt, from),
      ),
    )
    .get();
  return row?.failures ?? 0;
}

/**
 * Failed attempts on one account from one client address since `since`,
 * counting only those after the latest success of that same pair. Counting per
 * pair means failures from one place never lock the account's owner out
 * elsewhere: the right password from another address still works.
 */
export function countRecentPairFailures({
  db = getDb(),
  email,
  clientAddress,
  since,
}: {
  db?: Db;
  email: string;
  clientAddress: string | null;
  since: Date;
}): number {
  const pair = and(
    eq(loginAttempts.email, email),
    clientAddress === null
      ? isNull(loginAttempts.clientAddress)
      : eq(loginAttempts.clientAddress, clientAddress),
  );
  const lastSuccess = db
    .select({ createdAt: loginAttempts.createdAt })
    .from(loginAttempts)
    .where(and(pair, eq(loginAttempts.succeeded, true), gt(loginAttempts.createdAt, since)))
    .orderBy(desc(loginAttempts.createdAt))
    .limit(1)
    .get();
  const from = lastSuccess && lastSuccess.createdAt > since ? lastSuccess.createdAt : since;
  const row = db
    .select({ failures: count() })
    .from(loginAttempts)
    .where(and(pair, eq(loginAttempts.succeeded, false), gt(loginAttempts.createdAt, from)))
    .get();
  return row?.failures ?? 0;
}

/** Failed attempts from one client address since `since`, whatever the account. */
export function countRecentAddressFailures({
  db = getDb(),
  clientAddress,
  since,
}: {
  db?: Db;
  clientAddress: string;
  since: Date;
}): number {
  const row = db
    .select({ failures: count() })
    .from(loginAttempts)
    .where(
      and(
        eq(loginAttempts.clientAddress, clientAddress),
        eq(loginAttempts.succeeded, false),
        gt(loginAttempts.createdAt, since),
      ),
    )
    .get();
  return row?.failures ?? 0;
}

/** Drop attempts older than `before`; they no longer count towards any limit. */
export function pruneLoginAttempts({ db = getDb(), before }: { db?: Db; before: Date }) {
  return db.delete(loginAttempts).where(lt(loginAttempts.createdAt, before)).run();
}
