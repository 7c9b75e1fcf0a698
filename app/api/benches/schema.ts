import { z } from "zod";

export const benchNameSchema = z
  .string({ error: "give the bench a name" })
  .trim()
  .min(1, "give the bench a name")
  .max(120, "a bench name has at most 120 characters");
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
