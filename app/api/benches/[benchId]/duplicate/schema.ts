import { z } from "zod";
import { benchNameSchema } from "../../schema";

/**
 * POST /api/benches/:benchId/duplicate: copy the latest revision into a new
 * bench. `private: true` makes a private copy; an apprentice's copy is always
 * private (their sandbox).
 */
export const duplicateBenchBodySchema = z.strictObject({
  name: benchNameSchema.optional(),
  private: z.boolean().optional(),
});
export type DuplicateBenchBody = z.infer<typeof duplicateBenchBodySchema>;
