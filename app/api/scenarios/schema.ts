import { z } from "zod";
import { resourceIdSchema } from "@/app/_lib/resources";

export const scenarioNameSchema = z
  .string({ error: "give the scenario a name" })
  .trim()
  .min(1, "give the scenario a name")
  .max(120, "a scenario name has at most 120 characters");

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
