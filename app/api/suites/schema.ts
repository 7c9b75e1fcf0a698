import { z } from "zod";
import { resourceIdSchema } from "@/app/_lib/resources";

export const suiteNameSchema = z
  .string({ error: "give the suite a name" })
  .trim()
  .min(1, "give the suite a name")
  .max(120, "a suite name has at most 120 characters");

export const suiteScenarioIdsSchema = z
  .array(resourceIdSchema)
  .max(500, "a suite has at most 500 scenarios")
  .refine((ids) => new Set(ids).size === ids.length, "a scenario appears twice");

/** POST /api/suites: a named, ordered list of the workspace's scenarios. */
export const createSuiteBodySchema = z.strictObject({
  name: suiteNameSchema,
  description: z.string().max(2000).optional(),
  scenarioIds: suiteScenarioIdsSchema,
});
export type CreateSuiteBody = z.infer<typeof createSuiteBodySchema>;
