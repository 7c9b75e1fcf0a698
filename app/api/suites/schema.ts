import { z } from "zod";
import { nameSchema } from "@/app/_lib/names";
import { resourceIdSchema } from "@/app/_lib/resources";

export const suiteNameSchema = nameSchema("a suite name", "give the suite a name");

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
