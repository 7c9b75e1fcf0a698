import { err, ok, type Result } from "../core/result";
import { documentIssues, issuesText, type DocumentIssue } from "./document-issues";
import { scenarioSchema, type Scenario } from "./scenario-schema";

/** Why a scenario document was refused; `issues` point at the step and field. */
export interface ScenarioError {
  readonly kind: "scenario.invalid" | "scenario.not-json";
  readonly issues: readonly DocumentIssue[];
  /** All issues, one "path: message" per line. */
  readonly message: string;
}

/** Validates a parsed JSON value as a scenario, filling defaults (seed 1, not expected to fail). */
export function parseScenario(input: unknown): Result<Scenario, ScenarioError> {
  const parsed = scenarioSchema.safeParse(input);
  if (parsed.success) return ok(parsed.data);
  const issues = documentIssues(parsed.error, input);
  return err({ kind: "scenario.invalid", issues, message: issuesText(issues) });
}

/** Parses scenario JSON text; bad JSON is an issue at the document level. */
export function parseScenarioText(text: string): Result<Scenario, ScenarioError> {
  let input: unknown;
  try {
    input = JSON.parse(text);
  } catch (cause) {
    const issues = [{ path: "(document)", message: `not valid JSON: ${(cause as Error).message}` }];
    return err({ kind: "scenario.not-json", issues, message: issuesText(issues) });
  }
  return parseScenario(input);
}
