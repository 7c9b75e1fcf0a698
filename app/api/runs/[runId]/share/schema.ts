import { z } from "zod";
import { emailSchema } from "@/app/_lib/auth";

/** POST /api/runs/:runId/share: e-mail the report's link to a member of the workspace. */
export const shareRunSchema = z.strictObject({
  to: emailSchema,
  note: z.string().max(1000, "a note has at most 1000 characters").optional(),
});
