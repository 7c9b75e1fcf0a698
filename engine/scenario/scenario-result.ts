import type { TraceEvent } from "../core/trace";
import type { StepKind } from "./scenario-schema";

/**
 * What the runner says about one step.
 * - pass: the action ran, or the expectation held;
 * - fail: the expectation did not hold (`expected` and `actual` say how);
 * - error: the step could not run (unknown device, bad value, budget exceeded);
 * - skipped: an earlier error stopped the scenario before this step.
 */
export type StepStatus = "pass" | "fail" | "error" | "skipped";

export interface StepResult {
  /** Index in the scenario's `steps`, from 0. */
  readonly index: number;
  readonly kind: StepKind;
  /** The step's label, or a generated one ("write 1/0/1 = true"). */
  readonly label: string;
  readonly status: StepStatus;
  /** Virtual time the step started and finished, integer µs. */
  readonly startUs: number;
  readonly endUs: number;
  /** For fail: the expectation in words, and what was seen. */
  readonly expected?: string;
  readonly actual?: string;
  /** For error: why the step could not run. */
  readonly message?: string;
  /** The trace events that explain the verdict (the window the step looked at). */
  readonly trace: readonly TraceEvent[];
}

/**
 * How a scenario ended, with its `expectedToFail` flag applied:
 * - passed: every step passed;
 * - failed: an expectation failed;
 * - expected-failure: an expectation failed in a scenario marked expectedToFail (counts as passing);
 * - unexpected-pass: every step passed in a scenario marked expectedToFail (counts as failing);
 * - error: a step could not run, the bench did not load, or the wall-clock budget ran out.
 */
export type ScenarioOutcome =
  "passed" | "failed" | "expected-failure" | "unexpected-pass" | "error";

export interface StepTotals {
  readonly pass: number;
  readonly fail: number;
  readonly error: number;
  readonly skipped: number;
}

export interface ScenarioResult {
  readonly name: string;
  /** Where the scenario came from (file path), when it came from a file. */
  readonly source?: string;
  readonly seed: number;
  readonly expectedToFail: boolean;
  readonly outcome: ScenarioOutcome;
  /** Whether the outcome counts as a pass for a suite and for CI. */
  readonly ok: boolean;
  readonly steps: readonly StepResult[];
  readonly totals: StepTotals;
  /** Virtual time at the end of the run, integer µs. */
  readonly virtualTimeUs: number;
  /** Wall-clock milliseconds, measured with the caller's clock. */
  readonly wallMs: number;
  /** For an error before any step ran (bench missing, invalid document). */
  readonly message?: string;
}

export interface SuiteTotals {
  readonly scenarios: number;
  readonly ok: number;
  readonly failed: number;
  readonly errors: number;
  readonly expectedFailures: number;
  readonly unexpectedPasses: number;
}

export interface SuiteResult {
  readonly name: string;
  readonly scenarios: readonly ScenarioResult[];
  readonly totals: SuiteTotals;
  readonly ok: boolean;
  readonly wallMs: number;
}

/** Decides a scenario's outcome from its step statuses and its expectedToFail flag. */
export function scenarioOutcome(
  steps: readonly StepResult[],
  expectedToFail: boolean,
): ScenarioOutcome {
  if (steps.some((step) => step.status === "error")) return "error";
  const failed = steps.some((step) => step.status === "fail");
  if (expectedToFail) return failed ? "expected-failure" : "unexpected-pass";
  return failed ? "failed" : "passed";
}

export function outcomeIsOk(outcome: ScenarioOutcome): boolean {
  return outcome === "passed" || outcome === "expected-failure";
}

export function stepTotals(steps: readonly StepResult[]): StepTotals {
  const totals = { pass: 0, fail: 0, error: 0, skipped: 0 };
  for (const step of steps) totals[step.status] += 1;
  return totals;
}

/** Aggregates scenario results into a suite result. */
export function suiteResult(
  name: string,
  scenarios: readonly ScenarioResult[],
  wallMs: number,
): SuiteResult {
  const count = (outcome: ScenarioOutcome) => scenarios.filter((s) => s.outcome === outcome).length;
  const okCount = scenarios.filter((s) => s.ok).length;
  const totals: SuiteTotals = {
    scenarios: scenarios.length,
    ok: okCount,
    failed: count("failed") + count("unexpected-pass"),
    errors: count("error"),
    expectedFailures: count("expected-failure"),
    unexpectedPasses: count("unexpected-pass"),
  };
  return { name, scenarios, totals, ok: okCount === scenarios.length, wallMs };
}
