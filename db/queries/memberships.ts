import { and, asc, eq, sql } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { wrapDriverError } from "../db-error";
import { preparedPer } from "../prepared";
import { memberships, type Role, users } from "../schema";

export type Membership = typeof memberships.$inferSelect;
export type NewMembership = typeof memberships.$inferInsert;

/** The user's membership of one workspace, or undefined when they are not a member. */
const membershipOf = preparedPer((db) =>
  db
    .select()
    .from(memberships)
    .where(
      and(
        eq(memberships.userId, sql.placeholder("userId")),
        eq(memberships.workspaceId, sql.placeholder("workspaceId")),
      ),
    )
    .prepare(),
);

/** Read on every request by the session check, so prepared once. */
export function findMembership({
  db = getDb(),
  userId,
  workspaceId,
}: {
  db?: Db;
  userId: string;
  workspaceId: string;
}) {
  return membershipOf(db).get({ userId, workspaceId });
}

/** Members of a workspace with their user rows, by name. */
export function listMembers({ db = getDb(), workspaceId }: { db?: Db; workspaceId: string }) {
  return db
    .select({ membership: memberships, user: users })
    .from(memberships)
    .innerJoin(users, eq(memberships.userId, users.id))
    .where(eq(memberships.workspaceId, workspaceId))
    .orderBy(asc(users.name))
    .all();
}

export function createMembership({ db = getDb(), values }: { db?: Db; values: NewMembership }) {
  try {
    return db.insert(memberships).values(values).returning().get();
  } catch (error) {
    wrapDriverError(error, "membership");
  }
}

export function changeRole({
  db = getDb(),
  membershipId,
  workspaceId,
  role,
}: {
  db?: Db;
  membershipId: string;
  workspaceId: string;
  role: Role;
}) {
  return db
    .update(memberships)
    .set({ role })
    .where(and(eq(memberships.id, membershipId), eq(memberships.workspaceId, workspaceId)))
    .returning()
    .get();
}

/** One membership by id, only within the workspace. */
export function findMembershipById({
  db = getDb(),
  membershipId,
  workspaceId,
}: {
  db?: Db;
  membershipId: string;
  workspaceId: string;
}) {
  return db
    .select()
    .from(memberships)
    .where(and(eq(memberships.id, membershipId), eq(memberships.workspaceId, workspaceId)))
    .get();
}

/** How many admins a workspace has (the last one may not be demoted or removed). */
export function countAdmins({ db = getDb(), workspaceId }: { db?: Db; workspaceId: string }) {
  return db
    .select({ id: memberships.id })
    .from(memberships)
    .where(and(eq(memberships.workspaceId, workspaceId), eq(memberships.role, "admin")))
    .all().length;
}

export function deleteMembership({
  db = getDb(),
  membershipId,
  workspaceId,
}: {
  db?: Db;
  membershipId: string;
  workspaceId: string;
}) {
  return db
    .delete(memberships)
    .where(and(eq(memberships.id, membershipId), eq(memberships.workspaceId, workspaceId)))
    .returning()
    .get();
}
