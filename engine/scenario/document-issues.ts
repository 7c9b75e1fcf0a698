import type { z } from "zod";

/** One problem in a document, with a path a person can follow ("steps[3].within"). */
export interface DocumentIssue {
  readonly path: string;
  readonly message: string;
}

/** Formats a zod path as `steps[3].within`; the empty path is the document itself. */
export function formatIssuePath(path: readonly PropertyKey[]): string {
  let text = "";
  for (const segment of path) {
    if (typeof segment === "number") text += `[${segment}]`;
    else text += text.length === 0 ? String(segment) : `.${String(segment)}`;
  }
  return text.length === 0 ? "(document)" : text;
}

function valueAt(input: unknown, path: readonly PropertyKey[]): unknown {
  let current = input;
  for (const segment of path) {
    if (current === null || typeof current !== "object") return undefined;
    current = (current as Record<PropertyKey, unknown>)[segment];
  }
  return current;
}

function describeValue(value: unknown): string {
  if (value === undefined) return "nothing";
  if (Array.isArray(value)) return "a list";
  if (value === null) return "null";
  if (typeof value === "object") return "an object";
  return JSON.stringify(value);
}

/**
 * Turns zod issues into pointed messages. Zod's generic wording is replaced
 * where a person editing JSON by hand needs more: missing fields, unknown
 * fields (each named), and an unknown step kind with the kinds that exist.
 */
export function documentIssues(error: z.ZodError, input: unknown): DocumentIssue[] {
  const issues: DocumentIssue[] = [];
  for (const issue of error.issues) {
    const path = issue.path;
    if (issue.code === "unrecognized_keys") {
      for (const key of issue.keys) {
        issues.push({ path: formatIssuePath([...path, key]), message: "unknown field" });
      }
      continue;
    }
    const actual = valueAt(input, path);
    // Zod's own wording starts with "Invalid input"; messages our schemas set are kept as written.
    const generic = issue.message.startsWith("Invalid input");
    let message = issue.message;
    if (issue.code === "invalid_union" && "discriminator" in issue && "options" in issue) {
      const options = (issue.options as readonly unknown[]).map(String).join(", ");
      const what = issue.discriminator === "kind" ? "step kind" : String(issue.discriminator);
      message =
        actual === undefined
          ? `missing ${what}; expected one of ${options}`
          : `unknown ${what} ${describeValue(actual)}; expected one of ${options}`;
    } else if (
      actual === undefined &&
      (issue.code === "invalid_type" || issue.code === "invalid_union")
    ) {
      message = generic
        ? "required field is missing"
        : `required field is missing; ${issue.message}`;
    } else if (actual === undefined && issue.code === "invalid_value") {
      message = `required field is missing; ${issue.message}`;
    } else if (generic && issue.code === "invalid_type") {
      message = `expected ${issue.expected}, got ${describeValue(actual)}`;
    } else if (generic) {
      message = `not accepted: ${describeValue(actual)}`;
    }
    issues.push({ path: formatIssuePath(path), message });
  }
  return issues;
}

/** One line per issue, "path: message". */
export function issuesText(issues: readonly DocumentIssue[]): string {
  return issues.map((issue) => `${issue.path}: ${issue.message}`).join("\n");
}
