import { and, desc, eq, isNull, max, or, sql } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { wrapDriverError } from "../db-error";
import { preparedPer } from "../prepared";
import { benches, benchRevisions } from "../schema";

export type Bench = typeof benches.$inferSelect;
export type NewBench = typeof benches.$inferInsert;
export type BenchRevision = typeof benchRevisions.$inferSelect;

/**
 * Benches a user may list in a workspace: the shared ones plus their own private
 * copies. (Trainers and admins reviewing apprentices' copies use findBench.)
 */
export function listBenches({
  db = getDb(),
  workspaceId,
  userId,
}: {
  db?: Db;
  workspaceId: string;
  userId: string;
}) {
  return db
    .select()
    .from(benches)
    .where(
      and(
        eq(benches.workspaceId, workspaceId),
        isNull(benches.archivedAt),
        or(isNull(benches.privateOwnerId), eq(benches.privateOwnerId, userId)),
      ),
    )
    .orderBy(benches.name)
    .all();
}

/** One bench, only if it belongs to the workspace. */
// Loaded by every bench request (and for a copy's source), so prepared once.
const benchInWorkspace = preparedPer((db) =>
  db
    .select()
    .from(benches)
    .where(
      and(
        eq(benches.id, sql.placeholder("benchId")),
        eq(benches.workspaceId, sql.placeholder("workspaceId")),
      ),
    )
    .prepare(),
);
const newestRevision = preparedPer((db) =>
  db
    .select()
    .from(benchRevisions)
    .where(eq(benchRevisions.benchId, sql.placeholder("benchId")))
    .orderBy(desc(benchRevisions.number))
    .limit(1)
    .prepare(),
);

export function findBench({
  db = getDb(),
  workspaceId,
  benchId,
}: {
  db?: Db;
  workspaceId: string;
  benchId: string;
}) {
  return benchInWorkspace(db).get({ benchId, workspaceId });
}

export function latestRevision({ db = getDb(), benchId }: { db?: Db; benchId: string }) {
  return newestRevision(db).get({ benchId });
}

/** Create a bench with its first revision, in one transaction. */
export function createBench({
  db = getDb(),
  values,
  document,
  summary = "Created",
}: {
  db?: Db;
  values: NewBench;
  /** The bench document as JSON text. */
  document: string;
  summary?: string;
}) {
  try {
    return db.transaction((tx) => {
      const bench = tx.insert(benches).values(values).returning().get();
      const revision = tx
        .insert(benchRevisions)
        .values({ benchId: bench.id, number: 1, document, authorId: values.createdBy, summary })
        .returning()
        .get();
      return { bench, revision };
    });
  } catch (error) {
    wrapDriverError(error, `bench "${values.name}"`);
  }
}

/** Save a new revision (number = previous + 1) and touch the bench's updatedAt. */
export function saveRevision({
  db = getDb(),
  benchId,
  document,
  authorId,
  summary,
}: {
  db?: Db;
  benchId: string;
  document: string;
  authorId: string;
  summary: string;
}) {
  try {
    return db.transaction((tx) => {
      const previous = tx
        .select({ number: max(benchRevisions.number) })
        .from(benchRevisions)
        .where(eq(benchRevisions.benchId, benchId))
        .get();
      const revision = tx
        .insert(benchRevisions)
        .values({ benchId, number: (previous?.number ?? 0) + 1, document, authorId, summary })
        .returning()
        .get();
      tx.update(benches).set({ updatedAt: new Date() }).where(eq(benches.id, benchId)).run();
      return revision;
    });
  } catch (error) {
    wrapDriverError(error, "bench revision");
  }
}
