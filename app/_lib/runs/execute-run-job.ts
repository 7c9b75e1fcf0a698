import { performance } from "node:perf_hooks";
import { runScenario } from "@/engine";
import type { RunCaps, RunJob, RunJobOutcome } from "./run-job";
import { resultForStorage } from "./stored-result";
import { worstCaseVirtualTimeUs } from "./worst-case-virtual-time";

/** "20 s", "1.5 s": caps are configured in seconds, so they are named in seconds. */
function seconds(ms: number): string {
  return `${Number((ms / 1000).toFixed(3))} s`;
}

/** "1 min", "8.7 min": the virtual-time cap is configured in minutes. */
function minutes(us: number): string {
  return `${Number((us / 60_000_000).toFixed(1))} min`;
}

export function wallTimeCapMessage(caps: RunCaps): string {
  return `stopped by the wall-time cap: one scenario may run for at most ${seconds(caps.wallTimeMs)} on the server (RUN_WALL_TIME_CAP_SECONDS)`;
}

function virtualTimeCapMessage(caps: RunCaps, worstUs: number): string {
  return `stopped by the virtual-time cap: this scenario can reach ${minutes(worstUs)} of virtual time, and one scenario may cover at most ${minutes(caps.virtualTimeUs)} on the server (RUN_VIRTUAL_TIME_CAP_MINUTES)`;
}

/**
 * Replays one scenario exactly as the CLI does (engine/cli/main.ts): the same
 * runScenario on a fresh simulation with the same seed, so a verdict never
 * depends on which path ran it. Runs in a worker thread or inline.
 *
 * The server's caps apply here: a scenario whose worst-case virtual time is
 * over the cap does not run at all, and one that overruns the wall-time cap is
 * stopped by the runner's own budget; both come back as "capped" (a failed
 * verdict naming the cap). `now` is injectable so tests drive the clock.
 */
export function executeRunJob(
  job: RunJob,
  now: () => number = () => performance.now(),
): RunJobOutcome {
  try {
    const worstUs = worstCaseVirtualTimeUs(job.scenario);
    if (worstUs > job.caps.virtualTimeUs) {
      return {
        runId: job.runId,
        kind: "capped",
        cap: "virtual-time",
        message: virtualTimeCapMessage(job.caps, worstUs),
      };
    }
    const scenario = job.gradeAsWritten ? { ...job.scenario, expectedToFail: false } : job.scenario;
    const result = runScenario(scenario, job.bench as Parameters<typeof runScenario>[1], {
      seed: job.seed,
      now,
      budgetMs: job.caps.wallTimeMs,
    });
    // Trimmed here, in the worker, so only failing steps' trace slices cross to the main thread.
    const stored = resultForStorage(result);
    // The runner ends a scenario that outlives its budget as an error; on the server that is the cap.
    if (result.outcome === "error" && result.wallMs > job.caps.wallTimeMs) {
      const message = wallTimeCapMessage(job.caps);
      return {
        runId: job.runId,
        kind: "capped",
        cap: "wall-time",
        message,
        result: { ...stored, message },
      };
    }
    return { runId: job.runId, kind: "result", result: stored };
  } catch (error) {
    // A throw is an engine bug; the run is marked errored with the reason instead of hanging.
    return {
      runId: job.runId,
      kind: "error",
      message: `the runner failed: ${error instanceof Error ? error.message : String(error)}`,
    };
  }
}
