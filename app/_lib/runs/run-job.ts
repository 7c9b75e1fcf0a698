import type { ScenarioResult } from "@/engine";
import type { Scenario } from "@/engine";

/** The server's caps on one scenario replay (see runLimits() in app/_lib/config.ts). */
export interface RunCaps {
  /** Wall-clock milliseconds one scenario may take. */
  readonly wallTimeMs: number;
  /** Virtual microseconds one scenario may reach at worst. */
  readonly virtualTimeUs: number;
}

/**
 * One scenario to replay, as it crosses to a worker thread: plain JSON only
 * (structured clone), so the worker needs no database and no session.
 */
export interface RunJob {
  /** The runs row this job fills in. */
  readonly runId: string;
  /** The parsed scenario document (defaults filled). */
  readonly scenario: Scenario;
  /** The bench revision's document, parsed from JSON but not yet loaded. */
  readonly bench: unknown;
  /** Seed of the engine's generator for this replay. */
  readonly seed: number;
  /** Carried in the job so the worker applies the same caps the server was configured with. */
  readonly caps: RunCaps;
  /**
   * Grade every step as written: a lab's grading scenario may be a shipped
   * fault-finding exercise marked expectedToFail, but an apprentice's fixed bench
   * passes only when every check passes.
   */
  readonly gradeAsWritten?: boolean;
}

/** Which server cap stopped a run. */
export type RunCapKind = "virtual-time" | "wall-time";

/**
 * What comes back from a worker for one job: a result; a run stopped by a cap
 * (a failed verdict whose message names the cap, with the partial result when
 * there is one); or an error of the runner itself.
 */
export type RunJobOutcome =
  | { readonly runId: string; readonly kind: "result"; readonly result: ScenarioResult }
  | {
      readonly runId: string;
      readonly kind: "capped";
      readonly cap: RunCapKind;
      readonly message: string;
      readonly result?: ScenarioResult;
    }
  | { readonly runId: string; readonly kind: "error"; readonly message: string };
