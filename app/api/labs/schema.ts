import { z } from "zod";
import { nameSchema } from "@/app/_lib/names";
import { resourceIdSchema } from "@/app/_lib/resources";
import { hiddenFaultsSchema } from "@/app/_lib/labs/hidden-faults";

/** POST /api/labs: a lab from a shared bench and a grading scenario on it. */
export const createLabSchema = z.strictObject({
  title: nameSchema("a title", "give the lab a title"),
  brief: z.string().max(4000, "a brief has at most 4000 characters").default(""),
  benchId: resourceIdSchema,
  gradingScenarioId: resourceIdSchema,
  hiddenFaults: hiddenFaultsSchema.default([]),
});
