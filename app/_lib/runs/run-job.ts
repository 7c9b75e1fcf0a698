import type { ScenarioResult } from "@/engine";
import type { Scenario } from "@/engine";

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
  /**
   * Grade every step as written: a lab's grading scenario may be a shipped
   * fault-finding exercise marked expectedToFail, but an apprentice's fixed bench
   * passes only when every check passes.
   */
  readonly gradeAsWritten?: boolean;
}

/** What comes back from a worker for one job. */
export type RunJobOutcome =
  | { readonly runId: string; readonly ok: true; readonly result: ScenarioResult }
  | { readonly runId: string; readonly ok: false; readonly message: string };
