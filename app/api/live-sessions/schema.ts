import { z } from "zod";
import { resourceIdSchema } from "@/app/_lib/resources";

/** POST /api/live-sessions: start a server-hosted live session of a bench's latest revision, or of `revision`. */
export const startLiveSessionBodySchema = z.strictObject({
  benchId: resourceIdSchema,
  revision: z
    .number({ error: "revision must be a whole number" })
    .int("revision must be a whole number")
    .min(1, "revision must be 1 or more")
    .optional(),
});
export type StartLiveSessionBody = z.infer<typeof startLiveSessionBodySchema>;
