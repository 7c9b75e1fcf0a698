import { z } from "zod";
import { scenarioNameSchema } from "../schema";

/** PATCH /api/scenarios/:scenarioId: rename and/or replace the document. */
export const updateScenarioBodySchema = z
  .strictObject({
    name: scenarioNameSchema.optional(),
    document: z.unknown().optional(),
  })
  .refine((body) => body.name !== undefined || body.document !== undefined, {
    message: "give at least one of name or document",
  });
export type UpdateScenarioBody = z.infer<typeof updateScenarioBodySchema>;
