import { z } from "zod";
import { err, ok, type Result } from "../core/result";
import { documentIssues, issuesText, type DocumentIssue } from "./document-issues";

/**
 * A suite: a named list of scenario files, `format: 1`. Paths are relative to the
 * suite file. Order is kept: the CLI runs and shards scenarios in this order.
 */
export const suiteSchema = z
  .object({
    format: z.literal(1, { error: "expected format 1 (the only suite format so far)" }),
    name: z.string().min(1, "a suite needs a name"),
    description: z.string().optional(),
    scenarios: z
      .array(z.string().min(1, "expected a scenario file path"))
      .min(1, "a suite lists at least one scenario"),
  })
  .strict()
  .superRefine((suite, ctx) => {
    const seen = new Set<string>();
    suite.scenarios.forEach((path, index) => {
      if (seen.has(path))
        ctx.addIssue({
          code: "custom",
          path: ["scenarios", index],
          message: `${path} is listed twice`,
        });
      seen.add(path);
    });
  });
export type Suite = z.infer<typeof suiteSchema>;

export interface SuiteError {
  readonly kind: "suite.invalid";
  readonly issues: readonly DocumentIssue[];
  readonly message: string;
}

/** Validates a parsed JSON value as a suite. */
export function parseSuite(input: unknown): Result<Suite, SuiteError> {
  const parsed = suiteSchema.safeParse(input);
  if (parsed.success) return ok(parsed.data);
  const issues = documentIssues(parsed.error, input);
  return err({ kind: "suite.invalid", issues, message: issuesText(issues) });
}
