import { and, asc, desc, eq, isNull, or, sql } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { wrapDriverError } from "../db-error";
import { preparedPer } from "../prepared";
import { benches, benchRevisions, users } from "../schema";

/**
 * Bench queries beyond the basics in benches.ts: revision history, archiving,
 * duplicating and the listing trainers and admins see (with private copies).
 */

/**
 * Every revision of a bench, newest first, without the documents; the author's
 * name is null once their account is gone.
 */
export function listRevisions({ db = getDb(), benchId }: { db?: Db; benchId: string }) {
  return db
    .select({
      id: benchRevisions.id,
      number: benchRevisions.number,
      authorId: benchRevisions.authorId,
      authorName: users.name,
      summary: benchRevisions.summary,
      createdAt: benchRevisions.createdAt,
    })
    .from(benchRevisions)
    .leftJoin(users, eq(benchRevisions.authorId, users.id))
    .where(eq(benchRevisions.benchId, benchId))
    .orderBy(desc(benchRevisions.number))
    .all();
}

/** One revision by its number. */
export function findRevision({
  db = getDb(),
  benchId,
  number,
}: {
  db?: Db;
  benchId: string;
  number: number;
}) {
  return db
    .select()
    .from(benchRevisions)
    .where(and(eq(benchRevisions.benchId, benchId), eq(benchRevisions.number, number)))
    .get();
}

/** One revision by id, only if its bench belongs to the workspace. */
export function findRevisionInWorkspace({
  db = getDb(),
  workspaceId,
  revisionId,
}: {
  db?: Db;
  workspaceId: string;
  revisionId: string;
}) {
  return db
    .select({ revision: benchRevisions, bench: benches })
    .from(benchRevisions)
    .innerJoin(benches, eq(benchRevisions.benchId, benches.id))
    .where(and(eq(benchRevisions.id, revisionId), eq(benches.workspaceId, workspaceId)))
    .get();
}

// The bench list is read on every page and list request, so both forms are prepared once.
const allVisibleBenches = preparedPer((db) =>
  db
    .select()
    .from(benches)
    .where(and(eq(benches.workspaceId, sql.placeholder("workspaceId")), isNull(benches.archivedAt)))
    .orderBy(asc(benches.name))
    .prepare(),
);
const sharedAndOwnBenches = preparedPer((db) =>
  db
    .select()
    .from(benches)
    .where(
      and(
        eq(benches.workspaceId, sql.placeholder("workspaceId")),
        isNull(benches.archivedAt),
        or(isNull(benches.privateOwnerId), eq(benches.privateOwnerId, sql.placeholder("userId"))),
      ),
    )
    .orderBy(asc(benches.name))
    .prepare(),
);

/**
 * Benches of a workspace that are not archived: shared ones, the user's own
 * private copies, and with `includeAllPrivate` everyone's (trainers reviewing).
 */
export function listVisibleBenches({
  db = getDb(),
  workspaceId,
  userId,
  includeAllPrivate,
}: {
  db?: Db;
  workspaceId: string;
  userId: string;
  includeAllPrivate: boolean;
}) {
  return includeAllPrivate
    ? allVisibleBenches(db).all({ workspaceId })
    : sharedAndOwnBenches(db).all({ workspaceId, userId });
}

/** Rename or re-describe a bench. */
export function updateBenchDetails({
  db = getDb(),
  workspaceId,
  benchId,
  values,
}: {
  db?: Db;
  workspaceId: string;
  benchId: string;
  values: { name?: string; description?: string };
}) {
  return db
    .update(benches)
    .set({ ...values, updatedAt: new Date() })
    .where(and(eq(benches.id, benchId), eq(benches.workspaceId, workspaceId)))
    .returning()
    .get();
}

/**
 * Archive a bench: it leaves every list and answers 404, while its revisions
 * stay, because runs and lab attempts point at them.
 */
export function archiveBench({
  db = getDb(),
  workspaceId,
  benchId,
}: {
  db?: Db;
  workspaceId: string;
  benchId: string;
}) {
  return db
    .update(benches)
    .set({ archivedAt: new Date() })
    .where(and(eq(benches.id, benchId), eq(benches.workspaceId, workspaceId)))
    .returning()
    .get();
}

/** Copy a bench's latest document into a new bench with one revision, in one transaction. */
export function duplicateBench({
  db = getDb(),
  source,
  document,
  name,
  createdBy,
  privateOwnerId,
  summary = `Copied from "${source.name}"`,
}: {
  db?: Db;
  source: typeof benches.$inferSelect;
  document: string;
  name: string;
  createdBy: string;
  privateOwnerId: string | null;
  /** The first revision's summary; names the source unless told otherwise. */
  summary?: string;
}) {
  try {
    return db.transaction((tx) => {
      const bench = tx
        .insert(benches)
        .values({
          workspaceId: source.workspaceId,
          name,
          description: source.description,
          createdBy,
          privateOwnerId,
          copiedFromBenchId: source.id,
        })
        .returning()
        .get();
      const revision = tx
        .insert(benchRevisions)
        .values({
          benchId: bench.id,
          number: 1,
          document,
          authorId: createdBy,
          summary,
        })
        .returning()
        .get();
      return { bench, revision };
    });
  } catch (error) {
    wrapDriverError(error, `bench "${name}"`);
  }
}
