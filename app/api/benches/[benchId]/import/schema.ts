import { z } from "zod";

/**
 * POST /api/benches/:benchId/import: a bench or scenario file in Benchline's
 * own JSON format, as read by the editor. A bench becomes the bench's next
 * revision; a scenario is stored on this bench. Nothing is stored when the
 * document does not validate.
 */
export const importBodySchema = z.strictObject({
  kind: z.enum(["bench", "scenario"], { error: 'kind is "bench" or "scenario"' }),
  fileName: z
    .string()
    .trim()
    .min(1, "give the file name")
    .max(200, "a file name has at most 200 characters"),
  document: z.unknown().refine((value) => value !== undefined, "give the document"),
});
export type ImportBody = z.infer<typeof importBodySchema>;
