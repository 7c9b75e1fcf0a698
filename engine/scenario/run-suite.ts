import type { Bench, BenchInput, LoadedBench } from "../bench";
import { runScenario, type RunScenarioOptions } from "./run-scenario";
import { suiteResult, type ScenarioResult, type SuiteResult } from "./scenario-result";
import type { Scenario } from "./scenario-schema";

/** One scenario of a suite, ready to run, or the reason it could not be prepared (bad file, missing bench). */
export type SuiteEntry =
  | {
      readonly source: string;
      readonly scenario: Scenario;
      readonly bench: LoadedBench | Bench | BenchInput;
    }
  | { readonly source: string; readonly name?: string; readonly error: string };

export interface RunSuiteOptions extends Omit<RunScenarioOptions, "source"> {
  /** Called after each scenario, for progress output. */
  readonly onResult?: (result: ScenarioResult, position: number, total: number) => void;
}

/** The result for an entry that could not run: an error outcome carrying the reason. */
export function entryErrorResult(
  source: string,
  name: string,
  message: string,
  seed = 0,
): ScenarioResult {
  return {
    name,
    source,
    seed,
    expectedToFail: false,
    outcome: "error",
    ok: false,
    steps: [],
    totals: { pass: 0, fail: 0, error: 0, skipped: 0 },
    virtualTimeUs: 0,
    wallMs: 0,
    message,
  };
}

/** Runs every entry in order, each on its own fresh simulation, and aggregates the results. */
export function runSuite(
  name: string,
  entries: readonly SuiteEntry[],
  options: RunSuiteOptions = {},
): SuiteResult {
  const startMs = options.now ? options.now() : 0;
  const results: ScenarioResult[] = [];
  entries.forEach((entry, index) => {
    const result =
      "error" in entry
        ? entryErrorResult(entry.source, entry.name ?? entry.source, entry.error)
        : runScenario(entry.scenario, entry.bench, { ...options, source: entry.source });
    results.push(result);
    options.onResult?.(result, index + 1, entries.length);
  });
  return suiteResult(name, results, options.now ? options.now() - startMs : 0);
}
