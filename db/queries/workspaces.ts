import { asc, eq } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { wrapDriverError } from "../db-error";
import { memberships, workspaces } from "../schema";

export type Workspace = typeof workspaces.$inferSelect;
export type NewWorkspace = typeof workspaces.$inferInsert;

export function findWorkspaceBySlug({ db = getDb(), slug }: { db?: Db; slug: string }) {
  return db.select().from(workspaces).where(eq(workspaces.slug, slug)).get();
}

export function findWorkspaceById({ db = getDb(), workspaceId }: { db?: Db; workspaceId: string }) {
  return db.select().from(workspaces).where(eq(workspaces.id, workspaceId)).get();
}

/** The workspaces a user belongs to, with the role held in each, by name. */
export function listWorkspacesForUser({ db = getDb(), userId }: { db?: Db; userId: string }) {
  return db
    .select({ workspace: workspaces, role: memberships.role })
    .from(memberships)
    .innerJoin(workspaces, eq(memberships.workspaceId, workspaces.id))
    .where(eq(memberships.userId, userId))
    .orderBy(asc(workspaces.name))
    .all();
}

export function createWorkspace({ db = getDb(), values }: { db?: Db; values: NewWorkspace }) {
  try {
    return db.insert(workspaces).values(values).returning().get();
  } catch (error) {
    wrapDriverError(error, `workspace "${values.slug}"`);
  }
}
