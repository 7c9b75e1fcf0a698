import { and, desc, eq } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { runs } from "../schema";

export type Run = typeof runs.$inferSelect;
export type NewRun = typeof runs.$inferInsert;

/**
 * Run history of a workspace, newest first. Pass `startedBy` to restrict it to
 * one user's runs (apprentices see only their own).
 */
export function listRuns({
  db = getDb(),
  workspaceId,
  startedBy,
  limit = 50,
}: {
  db?: Db;
  workspaceId: string;
  startedBy?: string;
  limit?: number;
}) {
  return db
    .select()
    .from(runs)
    .where(
      and(
        eq(runs.workspaceId, workspaceId),
        startedBy === undefined ? undefined : eq(runs.startedBy, startedBy),
      ),
    )
    .orderBy(desc(runs.createdAt))
    .limit(limit)
    .all();
}

export function findRun({
  db = getDb(),
  workspaceId,
  runId,
}: {
  db?: Db;
  workspaceId: string;
  runId: string;
}) {
  return db
    .select()
    .from(runs)
    .where(and(eq(runs.id, runId), eq(runs.workspaceId, workspaceId)))
    .get();
}

export function createRun({ db = getDb(), values }: { db?: Db; values: NewRun }) {
  return db.insert(runs).values(values).returning().get();
}

/** Record a finished run: verdict, step totals and the per-step results JSON. */
export function finishRun({
  db = getDb(),
  runId,
  result,
}: {
  db?: Db;
  runId: string;
  result: Pick<NewRun, "verdict" | "stepsPassed" | "stepsFailed" | "stepsTotal" | "results">;
}) {
  return db
    .update(runs)
    .set({ ...result, status: "finished", finishedAt: new Date() })
    .where(eq(runs.id, runId))
    .returning()
    .get();
}
