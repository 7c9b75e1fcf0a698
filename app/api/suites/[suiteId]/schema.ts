import { z } from "zod";
import { suiteNameSchema, suiteScenarioIdsSchema } from "../schema";

/** PATCH /api/suites/:suiteId: rename, re-describe and/or replace the scenario list. */
export const updateSuiteBodySchema = z
  .strictObject({
    name: suiteNameSchema.optional(),
    description: z.string().max(2000).optional(),
    scenarioIds: suiteScenarioIdsSchema.optional(),
  })
  .refine(
    (body) =>
      body.name !== undefined || body.description !== undefined || body.scenarioIds !== undefined,
    { message: "give at least one of name, description or scenarioIds" },
  );
export type UpdateSuiteBody = z.infer<typeof updateSuiteBodySchema>;
