import type { Run, RunSummary } from "@/db/queries/runs";

/** A run for the API; `results` (a single run's page) needs the full row. */
export function runJson(
  run: RunSummary & Partial<Pick<Run, "results">>,
  options: { results?: boolean } = {},
) {
  return {
    id: run.id,
    scenarioId: run.scenarioId,
    suiteId: run.suiteId,
    benchRevisionId: run.benchRevisionId,
    seed: run.seed,
    status: run.status,
    verdict: run.verdict,
    stepsPassed: run.stepsPassed,
    stepsFailed: run.stepsFailed,
    stepsTotal: run.stepsTotal,
    /** Why the run ended early (a cap, a runner error, an interruption), or null. */
    errorMessage: run.errorMessage,
    startedBy: run.startedBy,
    createdAt: run.createdAt.toISOString(),
    startedAt: run.startedAt?.toISOString() ?? null,
    finishedAt: run.finishedAt?.toISOString() ?? null,
    ...(options.results
      ? { results: run.results ? (JSON.parse(run.results) as unknown) : null }
      : {}),
  };
}
