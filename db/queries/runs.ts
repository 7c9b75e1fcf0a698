import { and, asc, desc, eq, getTableColumns, inArray, isNull, sql } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { wrapDriverError } from "../db-error";
import { preparedPer } from "../prepared";
import { benches, benchRevisions, runs, scenarios, suiteRuns, users } from "../schema";

export type Run = typeof runs.$inferSelect;
export type NewRun = typeof runs.$inferInsert;

// A run as lists show it: everything but the two JSON documents (per-step
// results with trace slices, the scenario that ran), which only a single run's
// page needs and which made up most of the bytes a 50-run list read.
const runColumns = getTableColumns(runs);
const listedOnlyInFull = new Set(["results", "scenarioDocument"]);
const runSummaryColumns = Object.fromEntries(
  Object.entries(runColumns).filter(([name]) => !listedOnlyInFull.has(name)),
) as Omit<typeof runColumns, "results" | "scenarioDocument">;
export type RunSummary = Omit<Run, "results" | "scenarioDocument">;
export type SuiteRun = typeof suiteRuns.$inferSelect;
export type NewSuiteRun = typeof suiteRuns.$inferInsert;

/**
 * Run history of a workspace, newest first. Pass `startedBy` to restrict it to
 * one user's runs (apprentices see only their own).
 */
// The run history is read on every runs page and list request, so both forms are prepared once.
const workspaceRuns = preparedPer((db) =>
  db
    .select(runSummaryColumns)
    .from(runs)
    .where(eq(runs.workspaceId, sql.placeholder("workspaceId")))
    .orderBy(desc(runs.createdAt))
    .limit(sql.placeholder("limit"))
    .prepare(),
);
const ownRuns = preparedPer((db) =>
  db
    .select(runSummaryColumns)
    .from(runs)
    .where(
      and(
        eq(runs.workspaceId, sql.placeholder("workspaceId")),
        eq(runs.startedBy, sql.placeholder("startedBy")),
      ),
    )
    .orderBy(desc(runs.createdAt))
    .limit(sql.placeholder("limit"))
    .prepare(),
);

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
  return startedBy === undefined
    ? workspaceRuns(db).all({ workspaceId, limit })
    : ownRuns(db).all({ workspaceId, startedBy, limit });
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
  try {
    return db.insert(runs).values(values).returning().get();
  } catch (error) {
    wrapDriverError(error, "run");
  }
}

/** Record a finished run: verdict, step totals and the per-step results JSON (and why a cap stopped it). */
export function finishRun({
  db = getDb(),
  runId,
  result,
}: {
  db?: Db;
  runId: string;
  result: Pick<
    NewRun,
    "verdict" | "stepsPassed" | "stepsFailed" | "stepsTotal" | "results" | "durationMs"
  > &
    Partial<Pick<NewRun, "errorMessage">>;
}) {
  return db
    .update(runs)
    .set({ ...result, status: "finished", finishedAt: new Date() })
    .where(eq(runs.id, runId))
    .returning()
    .get();
}

/** A worker picked the run up. */
export function markRunStarted({ db = getDb(), runId }: { db?: Db; runId: string }) {
  return db
    .update(runs)
    .set({ status: "running", startedAt: new Date() })
    .where(eq(runs.id, runId))
    .run();
}

/** The run could not finish; `message` says why. */
export function markRunErrored({
  db = getDb(),
  runId,
  message,
}: {
  db?: Db;
  runId: string;
  message: string;
}) {
  return db
    .update(runs)
    .set({ status: "errored", verdict: "error", errorMessage: message, finishedAt: new Date() })
    .where(eq(runs.id, runId))
    .returning()
    .get();
}

/** A suite run and its scenario runs (in order), in one transaction. */
export function createSuiteRun({
  db = getDb(),
  values,
  scenarioRuns,
}: {
  db?: Db;
  values: NewSuiteRun;
  scenarioRuns: readonly Omit<NewRun, "suiteRunId" | "position">[];
}) {
  try {
    return db.transaction((tx) => {
      const suiteRun = tx
        .insert(suiteRuns)
        .values({ ...values, scenariosTotal: scenarioRuns.length })
        .returning()
        .get();
      const created = scenarioRuns.map((run, position) =>
        tx
          .insert(runs)
          .values({ ...run, suiteRunId: suiteRun.id, position })
          .returning()
          .get(),
      );
      return { suiteRun, runs: created };
    });
  } catch (error) {
    wrapDriverError(error, "suite run");
  }
}

export function findSuiteRun({
  db = getDb(),
  workspaceId,
  suiteRunId,
}: {
  db?: Db;
  workspaceId: string;
  suiteRunId: string;
}) {
  return db
    .select()
    .from(suiteRuns)
    .where(and(eq(suiteRuns.id, suiteRunId), eq(suiteRuns.workspaceId, workspaceId)))
    .get();
}

/** The scenario runs of a suite run, in suite order. */
export function listSuiteRunRuns({ db = getDb(), suiteRunId }: { db?: Db; suiteRunId: string }) {
  return db
    .select()
    .from(runs)
    .where(eq(runs.suiteRunId, suiteRunId))
    .orderBy(asc(runs.position))
    .all();
}

export function markSuiteRunStarted({ db = getDb(), suiteRunId }: { db?: Db; suiteRunId: string }) {
  return db
    .update(suiteRuns)
    .set({ status: "running", startedAt: new Date() })
    .where(and(eq(suiteRuns.id, suiteRunId), eq(suiteRuns.status, "queued")))
    .run();
}

/** Count one more scenario done (and ok when it passed); returns the updated row. */
export function recordSuiteRunScenario({
  db = getDb(),
  suiteRunId,
  ok,
}: {
  db?: Db;
  suiteRunId: string;
  ok: boolean;
}) {
  return db
    .update(suiteRuns)
    .set({
      scenariosDone: sql`${suiteRuns.scenariosDone} + 1`,
      scenariosOk: ok ? sql`${suiteRuns.scenariosOk} + 1` : suiteRuns.scenariosOk,
    })
    .where(eq(suiteRuns.id, suiteRunId))
    .returning()
    .get();
}

export function finishSuiteRun({
  db = getDb(),
  suiteRunId,
  values,
}: {
  db?: Db;
  suiteRunId: string;
  values: Pick<NewSuiteRun, "verdict" | "durationMs" | "status">;
}) {
  return db
    .update(suiteRuns)
    .set({ ...values, finishedAt: new Date() })
    .where(eq(suiteRuns.id, suiteRunId))
    .returning()
    .get();
}

/** Suite runs of a workspace, newest first (own only, when `startedBy` is given). */
export function listSuiteRuns({
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
    .select({ suiteRun: suiteRuns, startedByName: users.name })
    .from(suiteRuns)
    .leftJoin(users, eq(suiteRuns.startedBy, users.id))
    .where(
      and(
        eq(suiteRuns.workspaceId, workspaceId),
        startedBy === undefined ? undefined : eq(suiteRuns.startedBy, startedBy),
      ),
    )
    .orderBy(desc(suiteRuns.createdAt))
    .limit(limit)
    .all();
}

/** Fields a run history row shows, without the results JSON. */
const historyColumns = {
  id: runs.id,
  scenarioId: runs.scenarioId,
  scenarioName: runs.scenarioName,
  suiteId: runs.suiteId,
  suiteRunId: runs.suiteRunId,
  position: runs.position,
  benchRevisionId: runs.benchRevisionId,
  revisionNumber: benchRevisions.number,
  benchId: benches.id,
  benchName: benches.name,
  seed: runs.seed,
  status: runs.status,
  verdict: runs.verdict,
  stepsPassed: runs.stepsPassed,
  stepsFailed: runs.stepsFailed,
  stepsTotal: runs.stepsTotal,
  durationMs: runs.durationMs,
  startedBy: runs.startedBy,
  startedByName: users.name,
  createdAt: runs.createdAt,
  finishedAt: runs.finishedAt,
};

/**
 * Scenario runs with their bench, revision and who ran them, newest first.
 * Filters: one scenario, one suite run, one person (apprentices: themselves).
 */
export function listRunHistory({
  db = getDb(),
  workspaceId,
  startedBy,
  scenarioId,
  suiteRunId,
  limit = 500,
}: {
  db?: Db;
  workspaceId: string;
  startedBy?: string;
  scenarioId?: string;
  suiteRunId?: string;
  limit?: number;
}) {
  return db
    .select(historyColumns)
    .from(runs)
    .innerJoin(benchRevisions, eq(runs.benchRevisionId, benchRevisions.id))
    .innerJoin(benches, eq(benchRevisions.benchId, benches.id))
    .leftJoin(users, eq(runs.startedBy, users.id))
    .where(
      and(
        eq(runs.workspaceId, workspaceId),
        startedBy === undefined ? undefined : eq(runs.startedBy, startedBy),
        scenarioId === undefined ? undefined : eq(runs.scenarioId, scenarioId),
        suiteRunId === undefined ? undefined : eq(runs.suiteRunId, suiteRunId),
      ),
    )
    .orderBy(desc(runs.createdAt), asc(runs.position))
    .limit(limit)
    .all();
}

export type RunHistoryRow = ReturnType<typeof listRunHistory>[number];

/** One run with its bench, revision, scenario and the person, for the report page. */
export function findRunReport({
  db = getDb(),
  workspaceId,
  runId,
}: {
  db?: Db;
  workspaceId: string;
  runId: string;
}) {
  return db
    .select({
      run: runs,
      revisionNumber: benchRevisions.number,
      revisionCreatedAt: benchRevisions.createdAt,
      benchId: benches.id,
      benchName: benches.name,
      startedByName: users.name,
    })
    .from(runs)
    .innerJoin(benchRevisions, eq(runs.benchRevisionId, benchRevisions.id))
    .innerJoin(benches, eq(benchRevisions.benchId, benches.id))
    .leftJoin(users, eq(runs.startedBy, users.id))
    .where(and(eq(runs.id, runId), eq(runs.workspaceId, workspaceId)))
    .get();
}

/** The newest finished run of each of these scenarios, keyed by scenario id. */
export function latestRunsByScenario({
  db = getDb(),
  workspaceId,
  scenarioIds,
  startedBy,
}: {
  db?: Db;
  workspaceId: string;
  scenarioIds: readonly string[];
  startedBy?: string;
}): Map<string, RunHistoryRow> {
  const latest = new Map<string, RunHistoryRow>();
  if (scenarioIds.length === 0) return latest;
  const rows = db
    .select(historyColumns)
    .from(runs)
    .innerJoin(benchRevisions, eq(runs.benchRevisionId, benchRevisions.id))
    .innerJoin(benches, eq(benchRevisions.benchId, benches.id))
    .leftJoin(users, eq(runs.startedBy, users.id))
    .where(
      and(
        eq(runs.workspaceId, workspaceId),
        inArray(runs.scenarioId, [...scenarioIds]),
        inArray(runs.status, ["finished", "errored"]),
        startedBy === undefined ? undefined : eq(runs.startedBy, startedBy),
      ),
    )
    .orderBy(desc(runs.createdAt))
    .all();
  for (const row of rows) {
    if (row.scenarioId && !latest.has(row.scenarioId)) latest.set(row.scenarioId, row);
  }
  return latest;
}

/** Scenario names for a workspace, for joining into lists. */
export function scenarioNames({ db = getDb(), workspaceId }: { db?: Db; workspaceId: string }) {
  return db
    .select({ id: scenarios.id, name: scenarios.name, benchId: scenarios.benchId })
    .from(scenarios)
    .where(eq(scenarios.workspaceId, workspaceId))
    .all();
}

const activeStatuses = ["queued", "running"] as const;

/**
 * Server runs not yet ended, counted the way the run limits count them: a
 * scenario run on its own is one, a suite run is one however many scenarios it
 * holds. Restrict to one member with `startedBy`.
 */
export function countActiveRuns({
  db = getDb(),
  workspaceId,
  startedBy,
}: {
  db?: Db;
  workspaceId: string;
  startedBy?: string;
}): number {
  const single = db
    .select({ count: sql<number>`count(*)` })
    .from(runs)
    .where(
      and(
        eq(runs.workspaceId, workspaceId),
        isNull(runs.suiteRunId),
        inArray(runs.status, [...activeStatuses]),
        startedBy === undefined ? undefined : eq(runs.startedBy, startedBy),
      ),
    )
    .get();
  const suites = db
    .select({ count: sql<number>`count(*)` })
    .from(suiteRuns)
    .where(
      and(
        eq(suiteRuns.workspaceId, workspaceId),
        inArray(suiteRuns.status, [...activeStatuses]),
        startedBy === undefined ? undefined : eq(suiteRuns.startedBy, startedBy),
      ),
    )
    .get();
  return (single?.count ?? 0) + (suites?.count ?? 0);
}

/** What an interrupted run says: stored in errorMessage, so no column was added for it. */
export const interruptedRunMessage =
  "interrupted: the server stopped before this run finished; start it again";

/**
 * Every run and suite run still queued or running when a server process
 * starts belonged to a process that is gone (the run pool lives in memory), so
 * it can never finish: end it as errored, saying it was interrupted. Call only
 * at server start-up, never from a script that may run beside a live server.
 */
export function markInterruptedRuns({ db = getDb() }: { db?: Db } = {}) {
  return db.transaction((tx) => {
    const finishedAt = new Date();
    const endedRuns = tx
      .update(runs)
      .set({ status: "errored", verdict: "error", errorMessage: interruptedRunMessage, finishedAt })
      .where(inArray(runs.status, [...activeStatuses]))
      .run().changes;
    const endedSuiteRuns = tx
      .update(suiteRuns)
      .set({ status: "errored", verdict: "error", finishedAt })
      .where(inArray(suiteRuns.status, [...activeStatuses]))
      .run().changes;
    return { runs: endedRuns, suiteRuns: endedSuiteRuns };
  });
}
