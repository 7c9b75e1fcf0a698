import { and, asc, eq } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { DbError, wrapDriverError } from "../db-error";
import { scenarios } from "../schema";

export type ScenarioRow = typeof scenarios.$inferSelect;
export type NewScenarioRow = typeof scenarios.$inferInsert;

/** Scenarios of a workspace by name, optionally of one bench. */
export function listScenarios({
  db = getDb(),
  workspaceId,
  benchId,
}: {
  db?: Db;
  workspaceId: string;
  benchId?: string;
}) {
  return db
    .select()
    .from(scenarios)
    .where(
      and(
        eq(scenarios.workspaceId, workspaceId),
        benchId === undefined ? undefined : eq(scenarios.benchId, benchId),
      ),
    )
    .orderBy(asc(scenarios.name))
    .all();
}

/** One scenario, only if it belongs to the workspace. */
export function findScenario({
  db = getDb(),
  workspaceId,
  scenarioId,
}: {
  db?: Db;
  workspaceId: string;
  scenarioId: string;
}) {
  return db
    .select()
    .from(scenarios)
    .where(and(eq(scenarios.id, scenarioId), eq(scenarios.workspaceId, workspaceId)))
    .get();
}

export function createScenario({ db = getDb(), values }: { db?: Db; values: NewScenarioRow }) {
  try {
    return db.insert(scenarios).values(values).returning().get();
  } catch (error) {
    wrapDriverError(error, `scenario "${values.name}"`);
  }
}

export function updateScenario({
  db = getDb(),
  workspaceId,
  scenarioId,
  values,
}: {
  db?: Db;
  workspaceId: string;
  scenarioId: string;
  values: { name?: string; document?: string };
}) {
  return db
    .update(scenarios)
    .set({ ...values, updatedAt: new Date() })
    .where(and(eq(scenarios.id, scenarioId), eq(scenarios.workspaceId, workspaceId)))
    .returning()
    .get();
}

/** Delete a scenario; fails with a DbError conflict when a lab grades with it. */
export function deleteScenario({
  db = getDb(),
  workspaceId,
  scenarioId,
}: {
  db?: Db;
  workspaceId: string;
  scenarioId: string;
}) {
  try {
    return db
      .delete(scenarios)
      .where(and(eq(scenarios.id, scenarioId), eq(scenarios.workspaceId, workspaceId)))
      .run();
  } catch (error) {
    // A lab grading with it (or a run) still points here: deleting would break them.
    if ((error as { code?: unknown } | null)?.code === "SQLITE_CONSTRAINT_FOREIGNKEY") {
      throw new DbError("conflict:database", "scenario: still used by a lab", { cause: error });
    }
    wrapDriverError(error, "scenario");
  }
}
