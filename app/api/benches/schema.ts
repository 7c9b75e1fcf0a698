import { z } from "zod";
import { nameSchema } from "@/app/_lib/names";

export const benchNameSchema = nameSchema("a bench name", "give the bench a name");
export const benchDescriptionSchema = z
  .string()
  .max(2000, "a description has at most 2000 characters");

/**
 * POST /api/benches: a new bench from an engine bench document. The name
 * defaults to the document's. An apprentice's bench is always a private sandbox.
 */
export const createBenchBodySchema = z.strictObject({
  name: benchNameSchema.optional(),
  description: benchDescriptionSchema.optional(),
  /** Engine bench JSON; checked by the engine's loader. */
  document: z.unknown().refine((value) => value !== undefined, "give the bench document"),
});
export type CreateBenchBody = z.infer<typeof createBenchBodySchema>;
