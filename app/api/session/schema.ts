import { z } from "zod";
import { emailSchema, passwordInputSchema } from "@/app/_lib/auth";

/** POST /api/session: sign in. */
export const signInBodySchema = z.strictObject({
  email: emailSchema,
  password: passwordInputSchema,
});
export type SignInBody = z.infer<typeof signInBodySchema>;

/** PATCH /api/session: switch the active workspace. */
export const switchWorkspaceBodySchema = z.strictObject({
  workspaceId: z.string({ error: "give the workspace id" }).min(1).max(100),
});
export type SwitchWorkspaceBody = z.infer<typeof switchWorkspaceBodySchema>;
