import { performance } from "node:perf_hooks";
import { runScenario } from "@/engine";
import type { RunJob, RunJobOutcome } from "./run-job";
import { resultForStorage } from "./stored-result";

/** Wall-clock budget of one scenario on the server, milliseconds. */
export const SERVER_SCENARIO_BUDGET_MS = 20_000;

/**
 * Replays one scenario exactly as the CLI does (engine/cli/main.ts): the same
 * runScenario on a fresh simulation with the same seed, so a verdict never
 * depends on which path ran it. Runs in a worker thread or inline.
 */
export function executeRunJob(job: RunJob): RunJobOutcome {
  try {
    const scenario = job.gradeAsWritten ? { ...job.scenario, expectedToFail: false } : job.scenario;
    const result = runScenario(scenario, job.bench as Parameters<typeof runScenario>[1], {
      seed: job.seed,
      now: () => performance.now(),
      budgetMs: SERVER_SCENARIO_BUDGET_MS,
    });
    // Trimmed here, in the worker, so only failing steps' trace slices cross to the main thread.
    return { runId: job.runId, ok: true, result: resultForStorage(result) };
  } catch (error) {
    // A throw is an engine bug; the run is marked errored with the reason instead of hanging.
    return {
      runId: job.runId,
      ok: false,
      message: `the runner failed: ${error instanceof Error ? error.message : String(error)}`,
    };
  }
}
