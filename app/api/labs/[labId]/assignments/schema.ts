import { z } from "zod";
import { resourceIdSchema } from "@/app/_lib/resources";

/** POST /api/labs/:labId/assignments: hand the lab to apprentices, optionally with a due date. */
export const assignLabSchema = z.strictObject({
  apprenticeIds: z.array(resourceIdSchema).min(1, "choose at least one apprentice").max(200),
  /** A calendar day (YYYY-MM-DD, the end of that day UTC) or a full ISO time. */
  dueAt: z
    .union([z.iso.date(), z.iso.datetime({ offset: true })], {
      error: "dueAt: give a date like 2026-12-31",
    })
    .optional(),
});
