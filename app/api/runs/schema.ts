import { z } from "zod";
import { resourceIdSchema } from "@/app/_lib/resources";

/**
 * POST /api/runs: queue a replay of one scenario or one suite. The bench
 * revision defaults to the latest revision of the (first) scenario's bench;
 * give `benchRevisionId` to run against another, e.g. an apprentice's copy.
 */
export const createRunBodySchema = z
  .strictObject({
    scenarioId: resourceIdSchema.optional(),
    suiteId: resourceIdSchema.optional(),
    benchRevisionId: resourceIdSchema.optional(),
    /** Seed of the engine's generator; same inputs and seed give the same trace. */
    seed: z
      .number()
      .int()
      .min(0)
      .max(2 ** 31 - 1)
      .optional(),
  })
  .refine((body) => (body.scenarioId === undefined) !== (body.suiteId === undefined), {
    message: "give exactly one of scenarioId or suiteId",
    path: ["scenarioId"],
  });
export type CreateRunBody = z.infer<typeof createRunBodySchema>;

/** GET /api/runs?limit=...: newest first, at most `limit` (default 50). */
export const listRunsQuerySchema = z.strictObject({
  limit: z.coerce.number().int().min(1).max(200).optional(),
});
