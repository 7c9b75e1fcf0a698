import type { Db } from "@/db/client";
import { getDb, withNormalSync } from "@/db/client";
import type { BenchRevision } from "@/db/queries/benches";
import {
  countActiveRuns,
  createRun,
  createSuiteRun,
  finishRun,
  finishSuiteRun,
  markRunErrored,
  markRunStarted,
  markSuiteRunStarted,
  recordSuiteRunScenario,
  type Run,
  type SuiteRun,
} from "@/db/queries/runs";
import type { ScenarioRow } from "@/db/queries/scenarios";
import { parseScenarioText } from "@/engine";
import type { Scenario } from "@/engine";
import { runLimits } from "../config";
import { AppError } from "../errors";
import { publishRunEvent } from "./run-events";
import type { RunCaps, RunJob, RunJobOutcome } from "./run-job";
import { getRunPool, type RunPool } from "./run-pool";
import { resultForStorage, verdictOf } from "./stored-result";

/**
 * Starting runs: rows are written as "queued" before anything runs, the pool
 * replays outside the request, and each outcome is stored and announced on the
 * run's event channel. The caller answers at once with the run id.
 */

interface Services {
  readonly db?: Db;
  readonly pool?: RunPool;
}

/** A scenario row's document, parsed; a stored document that no longer parses names the scenario. */
export function scenarioDocumentOf(row: Pick<ScenarioRow, "document" | "name">): Scenario {
  const parsed = parseScenarioText(row.document);
  if (!parsed.ok) {
    throw new AppError(
      "invalid_input",
      `scenario "${row.name}" does not parse: ${parsed.error.message}`,
      { field: "scenarioId" },
    );
  }
  return parsed.value;
}

function benchDocumentOf(revision: Pick<BenchRevision, "document" | "number">): unknown {
  try {
    return JSON.parse(revision.document);
  } catch {
    throw new AppError("invalid_input", `bench revision ${revision.number} is not valid JSON`, {
      field: "benchRevisionId",
    });
  }
}

/**
 * A suite's bookkeeping for one scenario (run and suite rows together) as one
 * commit instead of two: these writes come at machine pace, on the event loop
 * that also answers requests. Without fsync, see withNormalSync.
 */
function inOneCommit<T>(db: Db, write: () => T): T {
  return withNormalSync(db, () => db.$client.transaction(write)());
}

/** Store one job's outcome on its run row and return the row. */
function storeOutcome(db: Db, outcome: RunJobOutcome): Run | undefined {
  if (outcome.kind === "error") {
    return markRunErrored({ db, runId: outcome.runId, message: outcome.message });
  }
  const result = outcome.result;
  // A run stopped by a cap is a failed verdict, not a runner error: the scenario asked for too much.
  const capped = outcome.kind === "capped";
  return finishRun({
    db,
    runId: outcome.runId,
    result: {
      verdict: capped ? "fail" : verdictOf(result!),
      stepsPassed: result?.totals.pass ?? 0,
      stepsFailed: result ? result.totals.fail + result.totals.error : 0,
      stepsTotal: result?.steps.length ?? 0,
      results: result ? JSON.stringify(resultForStorage(result)) : null,
      durationMs: result ? Math.round(result.wallMs) : 0,
      ...(capped ? { errorMessage: outcome.message } : {}),
    },
  });
}

/** The scenario outcome a suite's progress event names. */
function outcomeName(outcome: RunJobOutcome): string {
  if (outcome.kind === "result") return outcome.result.outcome;
  return outcome.kind === "capped" ? `capped-${outcome.cap}` : "error";
}

/**
 * Refuse a new run when the member or the workspace already has as many runs
 * queued or running as allowed. Counted from the rows (the one source of
 * truth) just before the new rows are written, with no await in between, so
 * two requests cannot both slip under the limit.
 */
function assertRunCapacity(db: Db, workspaceId: string, startedBy: string): RunCaps {
  const limits = runLimits();
  const mine = countActiveRuns({ db, workspaceId, startedBy });
  if (mine >= limits.perMember) {
    throw new AppError(
      "rate_limited",
      `you already have ${mine} runs queued or running, the most one member may have (RUN_LIMIT_PER_MEMBER = ${limits.perMember}); start this one when one of them has finished`,
    );
  }
  const workspace = countActiveRuns({ db, workspaceId });
  if (workspace >= limits.perWorkspace) {
    throw new AppError(
      "rate_limited",
      `this workspace already has ${workspace} runs queued or running, the most one workspace may have (RUN_LIMIT_PER_WORKSPACE = ${limits.perWorkspace}); start this one when one of them has finished`,
    );
  }
  return { wallTimeMs: limits.wallTimeMs, virtualTimeUs: limits.virtualTimeUs };
}

export interface ScenarioRunRequest {
  readonly workspaceId: string;
  readonly startedBy: string;
  readonly scenario: Pick<ScenarioRow, "id" | "name" | "document">;
  readonly revision: Pick<BenchRevision, "id" | "number" | "document">;
  /** Overrides the scenario's own seed. */
  readonly seed?: number;
  readonly gradeAsWritten?: boolean;
}

/** Queue one scenario; `done` settles with the stored row once it has run. */
export function startScenarioRun(
  request: ScenarioRunRequest,
  services: Services = {},
): { run: Run; done: Promise<Run> } {
  const db = services.db ?? getDb();
  const pool = services.pool ?? getRunPool();
  const scenario = scenarioDocumentOf(request.scenario);
  const bench = benchDocumentOf(request.revision);
  const seed = request.seed ?? scenario.seed;
  const caps = assertRunCapacity(db, request.workspaceId, request.startedBy);
  const run = createRun({
    db,
    values: {
      workspaceId: request.workspaceId,
      scenarioId: request.scenario.id,
      scenarioName: scenario.name,
      scenarioDocument: request.scenario.document,
      benchRevisionId: request.revision.id,
      seed,
      startedBy: request.startedBy,
    },
  });
  const job: RunJob = {
    runId: run.id,
    scenario,
    bench,
    seed,
    caps,
    gradeAsWritten: request.gradeAsWritten,
  };
  const done = pool
    .run(job, {
      member: request.startedBy,
      onStart: () => {
        withNormalSync(db, () => markRunStarted({ db, runId: run.id }));
        publishRunEvent(run.id, { kind: "run.started", status: "running", done: 0, total: 1 });
      },
    })
    .then((outcome) => {
      const stored = withNormalSync(db, () => storeOutcome(db, outcome)) ?? run;
      publishRunEvent(run.id, {
        kind: "run.finished",
        status: stored.status === "errored" ? "errored" : "finished",
        verdict: stored.verdict,
        done: 1,
        total: 1,
        durationMs: stored.durationMs,
        ...(stored.errorMessage ? { message: stored.errorMessage } : {}),
      });
      return stored;
    });
  return { run, done };
}

export interface SuiteRunEntry {
  readonly scenario: Pick<ScenarioRow, "id" | "name" | "document">;
  readonly revision: Pick<BenchRevision, "id" | "number" | "document">;
}

export interface SuiteRunRequest {
  readonly workspaceId: string;
  readonly startedBy: string;
  readonly suite: { readonly id: string; readonly name: string };
  readonly entries: readonly SuiteRunEntry[];
  /** The revision forced on every scenario, when the person chose one. */
  readonly benchRevisionId?: string;
  /** Seed forced on every scenario; otherwise each uses its own. */
  readonly seed?: number;
}

/**
 * Queue every scenario of a suite, in order, as one suite run. Each scenario
 * is its own job, so several suites share the pool fairly scenario by scenario.
 */
export function startSuiteRun(
  request: SuiteRunRequest,
  services: Services = {},
): { suiteRun: SuiteRun; runs: Run[]; done: Promise<SuiteRun> } {
  const db = services.db ?? getDb();
  const pool = services.pool ?? getRunPool();
  const prepared = request.entries.map((entry) => {
    const scenario = scenarioDocumentOf(entry.scenario);
    return {
      entry,
      scenario,
      bench: benchDocumentOf(entry.revision),
      seed: request.seed ?? scenario.seed,
    };
  });
  const caps = assertRunCapacity(db, request.workspaceId, request.startedBy);
  const created = createSuiteRun({
    db,
    values: {
      workspaceId: request.workspaceId,
      suiteId: request.suite.id,
      suiteName: request.suite.name,
      benchRevisionId: request.benchRevisionId ?? null,
      seed: request.seed ?? null,
      startedBy: request.startedBy,
    },
    scenarioRuns: prepared.map(({ entry, scenario, seed }) => ({
      workspaceId: request.workspaceId,
      scenarioId: entry.scenario.id,
      suiteId: request.suite.id,
      scenarioName: scenario.name,
      scenarioDocument: entry.scenario.document,
      benchRevisionId: entry.revision.id,
      seed,
      startedBy: request.startedBy,
    })),
  });
  const { suiteRun } = created;
  const total = created.runs.length;
  const startedAtMs = Date.now();

  const jobs = created.runs.map((run, position) => {
    const { scenario, bench, seed } = prepared[position]!;
    return pool
      .run(
        { runId: run.id, scenario, bench, seed, caps },
        {
          member: request.startedBy,
          onStart: () => {
            const suiteStarted = inOneCommit(db, () => {
              markRunStarted({ db, runId: run.id });
              return markSuiteRunStarted({ db, suiteRunId: suiteRun.id }).changes > 0;
            });
            if (suiteStarted) {
              publishRunEvent(suiteRun.id, {
                kind: "run.started",
                status: "running",
                done: 0,
                total,
              });
            }
            publishRunEvent(run.id, { kind: "run.started", status: "running", done: 0, total: 1 });
          },
        },
      )
      .then((outcome) => {
        const { stored, progress } = inOneCommit(db, () => {
          const stored = storeOutcome(db, outcome) ?? run;
          const progress = recordSuiteRunScenario({
            db,
            suiteRunId: suiteRun.id,
            ok: stored.verdict === "pass",
          });
          return { stored, progress };
        });
        publishRunEvent(run.id, {
          kind: "run.finished",
          status: stored.status === "errored" ? "errored" : "finished",
          verdict: stored.verdict,
          done: 1,
          total: 1,
          durationMs: stored.durationMs,
          ...(stored.errorMessage ? { message: stored.errorMessage } : {}),
        });
        publishRunEvent(suiteRun.id, {
          kind: "scenario.finished",
          runId: run.id,
          scenarioName: stored.scenarioName,
          verdict: stored.verdict ?? "error",
          outcome: outcomeName(outcome),
          done: progress?.scenariosDone ?? position + 1,
          total,
        });
        return stored;
      });
  });

  const done = Promise.all(jobs).then((finished) => {
    const verdict = finished.some((run) => run.verdict === "error")
      ? "error"
      : finished.every((run) => run.verdict === "pass")
        ? "pass"
        : "fail";
    const stored =
      withNormalSync(db, () =>
        finishSuiteRun({
          db,
          suiteRunId: suiteRun.id,
          values: { status: "finished", verdict, durationMs: Date.now() - startedAtMs },
        }),
      ) ?? suiteRun;
    publishRunEvent(suiteRun.id, {
      kind: "run.finished",
      status: "finished",
      verdict: stored.verdict,
      done: total,
      total,
      durationMs: stored.durationMs,
    });
    return stored;
  });
  return { suiteRun, runs: created.runs, done };
}
