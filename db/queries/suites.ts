import { and, asc, eq } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { wrapDriverError } from "../db-error";
import { scenarios, suites, suiteScenarios } from "../schema";

export type SuiteRow = typeof suites.$inferSelect;

export function listSuites({ db = getDb(), workspaceId }: { db?: Db; workspaceId: string }) {
  return db
    .select()
    .from(suites)
    .where(eq(suites.workspaceId, workspaceId))
    .orderBy(asc(suites.name))
    .all();
}

export function findSuite({
  db = getDb(),
  workspaceId,
  suiteId,
}: {
  db?: Db;
  workspaceId: string;
  suiteId: string;
}) {
  return db
    .select()
    .from(suites)
    .where(and(eq(suites.id, suiteId), eq(suites.workspaceId, workspaceId)))
    .get();
}

/** The suite's scenarios in order. */
export function listSuiteScenarios({ db = getDb(), suiteId }: { db?: Db; suiteId: string }) {
  return db
    .select({ scenario: scenarios, position: suiteScenarios.position })
    .from(suiteScenarios)
    .innerJoin(scenarios, eq(suiteScenarios.scenarioId, scenarios.id))
    .where(eq(suiteScenarios.suiteId, suiteId))
    .orderBy(asc(suiteScenarios.position))
    .all();
}

/** Create a suite with its ordered scenarios in one transaction. */
export function createSuite({
  db = getDb(),
  values,
  scenarioIds,
}: {
  db?: Db;
  values: typeof suites.$inferInsert;
  scenarioIds: readonly string[];
}) {
  try {
    return db.transaction((tx) => {
      const suite = tx.insert(suites).values(values).returning().get();
      scenarioIds.forEach((scenarioId, position) => {
        tx.insert(suiteScenarios).values({ suiteId: suite.id, scenarioId, position }).run();
      });
      return suite;
    });
  } catch (error) {
    wrapDriverError(error, `suite "${values.name}"`);
  }
}

/** Change a suite's details and (when given) replace its scenario list, in one transaction. */
export function updateSuite({
  db = getDb(),
  workspaceId,
  suiteId,
  values,
  scenarioIds,
}: {
  db?: Db;
  workspaceId: string;
  suiteId: string;
  values: { name?: string; description?: string };
  scenarioIds?: readonly string[];
}) {
  try {
    return db.transaction((tx) => {
      const suite =
        Object.keys(values).length > 0
          ? tx
              .update(suites)
              .set(values)
              .where(and(eq(suites.id, suiteId), eq(suites.workspaceId, workspaceId)))
              .returning()
              .get()
          : tx
              .select()
              .from(suites)
              .where(and(eq(suites.id, suiteId), eq(suites.workspaceId, workspaceId)))
              .get();
      if (suite && scenarioIds) {
        tx.delete(suiteScenarios).where(eq(suiteScenarios.suiteId, suiteId)).run();
        scenarioIds.forEach((scenarioId, position) => {
          tx.insert(suiteScenarios).values({ suiteId, scenarioId, position }).run();
        });
      }
      return suite;
    });
  } catch (error) {
    wrapDriverError(error, "suite");
  }
}

export function deleteSuite({
  db = getDb(),
  workspaceId,
  suiteId,
}: {
  db?: Db;
  workspaceId: string;
  suiteId: string;
}) {
  return db
    .delete(suites)
    .where(and(eq(suites.id, suiteId), eq(suites.workspaceId, workspaceId)))
    .run();
}
