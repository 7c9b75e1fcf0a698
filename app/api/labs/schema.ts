import { z } from "zod";
import { resourceIdSchema } from "@/app/_lib/resources";
import { hiddenFaultsSchema } from "@/app/_lib/labs/hidden-faults";

/** POST /api/labs: a lab from a shared bench and a grading scenario on it. */
export const createLabSchema = z.strictObject({
  title: z
    .string({ error: "give the lab a title" })
    .trim()
    .min(1, "give the lab a title")
    .max(120, "a title has at most 120 characters"),
  brief: z.string().max(4000, "a brief has at most 4000 characters").default(""),
  benchId: resourceIdSchema,
  gradingScenarioId: resourceIdSchema,
  hiddenFaults: hiddenFaultsSchema.default([]),
});
