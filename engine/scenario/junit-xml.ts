import type { TraceEvent } from "../core/trace";
import { describeTraceEvent } from "./describe-trace-event";
import { formatVirtualTime } from "../core/virtual-time";
import { formatDuration } from "./duration";
import type { ScenarioResult, StepResult, SuiteResult } from "./scenario-result";

/** Options for the JUnit report. */
export interface JunitOptions {
  /** Renders one trace event as a line; `describeTraceEvent` when absent. */
  readonly describeEvent?: (event: TraceEvent) => string;
}

// XML 1.0 allows tab, newline, carriage return and printable characters; anything else is dropped.
const INVALID_XML_CHARS = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]/g;

/** Escapes text for an XML attribute value or element content. */
export function escapeXml(text: string): string {
  return text
    .replace(INVALID_XML_CHARS, "")
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&apos;");
}

const seconds = (ms: number) => (Math.max(0, ms) / 1000).toFixed(3);

/** One readable line for a step: "#3 expect-value status 1/1/1 = true: fail, expected ..., got ...". */
export function describeStepResult(step: StepResult): string {
  const at = `@${formatVirtualTime(step.startUs)}`;
  const head = `#${step.index} ${step.label} ${at}: ${step.status}`;
  if (step.status === "fail")
    return `${head}; expected ${step.expected ?? "?"}, got ${step.actual ?? "?"}`;
  if (step.status === "error") return `${head}; ${step.message ?? "error"}`;
  return head;
}

function scenarioBody(
  result: ScenarioResult,
  describeEvent: (event: TraceEvent) => string,
): string {
  const lines: string[] = [];
  if (result.message) lines.push(result.message);
  lines.push(
    `seed ${result.seed}, virtual time ${formatDuration(result.virtualTimeUs)}, outcome ${result.outcome}`,
  );
  for (const step of result.steps) {
    lines.push(describeStepResult(step));
    if (step.status === "fail" || step.status === "error") {
      for (const event of step.trace) lines.push(`    ${describeEvent(event)}`);
    }
  }
  return lines.join("\n");
}

function firstProblem(result: ScenarioResult): StepResult | undefined {
  return result.steps.find((step) => step.status === "error" || step.status === "fail");
}

function testcase(
  result: ScenarioResult,
  classname: string,
  describeEvent: (event: TraceEvent) => string,
): string {
  const attributes = `name="${escapeXml(result.name)}" classname="${escapeXml(classname)}" time="${seconds(result.wallMs)}"`;
  const body = escapeXml(scenarioBody(result, describeEvent));
  const problem = firstProblem(result);
  let verdict = "";
  if (result.outcome === "error") {
    const message = problem ? describeStepResult(problem) : (result.message ?? "error");
    verdict = `<error message="${escapeXml(message)}" type="scenario.error">${body}</error>`;
  } else if (result.outcome === "failed") {
    const message = problem ? describeStepResult(problem) : "failed";
    verdict = `<failure message="${escapeXml(message)}" type="${escapeXml(problem?.kind ?? "scenario")}">${body}</failure>`;
  } else if (result.outcome === "unexpected-pass") {
    verdict = `<failure message="marked expectedToFail, but every step passed" type="scenario.unexpected-pass">${body}</failure>`;
  }
  const out = `<system-out>${body}</system-out>`;
  return `    <testcase ${attributes}>\n      ${verdict ? `${verdict}\n      ` : ""}${out}\n    </testcase>`;
}

/**
 * Writes suite results as JUnit XML, the report format CI systems read: one
 * <testsuite> per suite and one <testcase> per scenario. A failing scenario gets
 * <failure> with the first failing step as its message and every step (with the
 * trace slice of the failing ones) as its text; a scenario that could not run
 * gets <error>. An expected-to-fail scenario that failed is a passing testcase.
 */
export function junitXml(suites: readonly SuiteResult[], options: JunitOptions = {}): string {
  const describeEvent = options.describeEvent ?? describeTraceEvent;
  const all = suites.flatMap((suite) => suite.scenarios);
  const failures = (results: readonly ScenarioResult[]) =>
    results.filter((r) => r.outcome === "failed" || r.outcome === "unexpected-pass").length;
  const errors = (results: readonly ScenarioResult[]) =>
    results.filter((r) => r.outcome === "error").length;
  const totalMs = suites.reduce((sum, suite) => sum + suite.wallMs, 0);
  const lines = [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<testsuites name="benchline scenarios" tests="${all.length}" failures="${failures(all)}" errors="${errors(all)}" skipped="0" time="${seconds(totalMs)}">`,
  ];
  for (const suite of suites) {
    lines.push(
      `  <testsuite name="${escapeXml(suite.name)}" tests="${suite.scenarios.length}" failures="${failures(suite.scenarios)}" errors="${errors(suite.scenarios)}" skipped="0" time="${seconds(suite.wallMs)}">`,
    );
    for (const result of suite.scenarios) {
      lines.push(testcase(result, result.source ?? suite.name, describeEvent));
    }
    lines.push(`  </testsuite>`);
  }
  lines.push(`</testsuites>`, "");
  return lines.join("\n");
}
