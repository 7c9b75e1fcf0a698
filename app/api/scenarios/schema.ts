import { z } from "zod";
import { nameSchema } from "@/app/_lib/names";
import { resourceIdSchema } from "@/app/_lib/resources";

export const scenarioNameSchema = nameSchema("a scenario name", "give the scenario a name");

/** GET /api/scenarios?benchId=...: optionally only one bench's scenarios. */
export const listScenariosQuerySchema = z.strictObject({
  benchId: resourceIdSchema.optional(),
});

/**
 * POST /api/scenarios: a scenario (engine scenario JSON) for a bench of the
 * workspace. The name defaults to the document's.
 */
export const createScenarioBodySchema = z.strictObject({
  benchId: resourceIdSchema,
  name: scenarioNameSchema.optional(),
  document: z.unknown().refine((value) => value !== undefined, "give the scenario document"),
});
export type CreateScenarioBody = z.infer<typeof createScenarioBodySchema>;
