import { z } from "zod";
import { benchDescriptionSchema, benchNameSchema } from "../schema";

/**
 * PATCH /api/benches/:benchId: rename, re-describe and/or save a new revision.
 * `baseRevision` is the revision number the editor started from; when the bench
 * has moved on since, the save is refused with 409 instead of overwriting.
 */
export const updateBenchBodySchema = z
  .strictObject({
    name: benchNameSchema.optional(),
    description: benchDescriptionSchema.optional(),
    document: z.unknown().optional(),
    summary: z.string().max(200, "a summary has at most 200 characters").optional(),
    baseRevision: z.number().int().positive().optional(),
  })
  .refine(
    (body) =>
      body.name !== undefined || body.description !== undefined || body.document !== undefined,
    { message: "give at least one of name, description or document" },
  );
export type UpdateBenchBody = z.infer<typeof updateBenchBodySchema>;
