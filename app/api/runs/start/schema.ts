import { z } from "zod";

const idSchema = z.string().min(1, "expected an id").max(100, "an id has at most 100 characters");

/** POST /api/runs/start: replay one scenario or one suite. */
export const startRunSchema = z
  .object({
    scenarioId: idSchema.optional(),
    suiteId: idSchema.optional(),
    /** Run against this revision; default: the latest revision of each scenario's bench. */
    benchRevisionId: idSchema.optional(),
    /** Seed of the engine's generator; default: each scenario document's own seed. */
    seed: z
      .number({ error: "seed must be a whole number" })
      .int("seed must be a whole number")
      .min(0, "seed must be 0 or more")
      .max(2 ** 32 - 1, "seed must fit in 32 bits")
      .optional(),
  })
  .strict()
  .superRefine((body, ctx) => {
    if ((body.scenarioId === undefined) === (body.suiteId === undefined)) {
      ctx.addIssue({
        code: "custom",
        path: ["scenarioId"],
        message: "give exactly one of scenarioId or suiteId",
      });
    }
  });
export type StartRunBody = z.infer<typeof startRunSchema>;
