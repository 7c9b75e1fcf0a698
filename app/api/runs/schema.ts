import { z } from "zod";
import { resourceIdSchema } from "@/app/_lib/resources";

/**
 * POST /api/runs: replay one scenario or one suite on the server. The bench
 * revision defaults to the latest revision of each scenario's bench; give
 * `benchRevisionId` to run against another, e.g. an apprentice's copy.
 */
export const startRunBodySchema = z
  .strictObject({
    scenarioId: resourceIdSchema.optional(),
    suiteId: resourceIdSchema.optional(),
    benchRevisionId: resourceIdSchema.optional(),
    /** Seed of the engine's generator; default: each scenario document's own seed. */
    seed: z
      .number({ error: "seed must be a whole number" })
      .int("seed must be a whole number")
      .min(0, "seed must be 0 or more")
      .max(2 ** 32 - 1, "seed must fit in 32 bits")
      .optional(),
  })
  .refine((body) => (body.scenarioId === undefined) !== (body.suiteId === undefined), {
    message: "give exactly one of scenarioId or suiteId",
    path: ["scenarioId"],
  });
export type StartRunBody = z.infer<typeof startRunBodySchema>;

/** GET /api/runs?limit=...: newest first, at most `limit` (default 50). */
export const listRunsQuerySchema = z.strictObject({
  limit: z.coerce.number().int().min(1).max(200).optional(),
});
